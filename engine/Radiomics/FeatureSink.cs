namespace Serimetry.Engine.Radiomics;

/// <summary>Collects feature values in computation order (deterministic output order).</summary>
internal sealed class FeatureSink
{
    private readonly List<FeatureValue> _values = [];

    public IReadOnlyList<FeatureValue> Values => _values;

    public void Add(string family, string feature, string code, string aggregation, double value) =>
        _values.Add(new FeatureValue(family, feature, code, aggregation, value));
}
