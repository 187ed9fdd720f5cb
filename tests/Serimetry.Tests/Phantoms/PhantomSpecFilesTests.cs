using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Phantoms;

public sealed class PhantomSpecFilesTests
{
    /// <summary>The repository's phantoms/ folder, found by walking up from the test binaries.</summary>
    private static string PhantomsDir()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var candidate = Path.Combine(d.FullName, "phantoms");
            if (File.Exists(Path.Combine(candidate, "demo.json"))) return candidate;
        }
        throw new DirectoryNotFoundException("phantoms/ not found above the test binaries");
    }

    [Theory]
    [InlineData("demo.json", 3)]
    [InlineData("qa-reproducibility.json", 1)]
    public void ShippedSpecsLoadAndValidate(string file, int visits)
    {
        var spec = PhantomSpec.Load(Path.Combine(PhantomsDir(), file));
        Assert.Equal(visits, spec.Visits);
        Assert.StartsWith("NSC-", spec.SubjectId);
        Assert.True(new PhantomAnatomy(spec, PhantomGenerator.LesionRadius(spec, spec.Visits - 1)).LesionFitsInGland(PhantomGenerator.LesionRadius(spec, spec.Visits - 1)));
    }

    [Fact]
    public void DemoSpecEqualsTheBuiltInDefault()
    {
        // `serimetry phantom` without --spec must produce the same subject as phantoms/demo.json.
        Assert.Equal(new PhantomSpec().ToJson(), PhantomSpec.Load(Path.Combine(PhantomsDir(), "demo.json")).ToJson());
    }

    [Fact]
    public void ShippedDefaultProfileFileLoads()
    {
        var p = RepeatabilityProfile.Load(Path.Combine(PhantomsDir(), "repeatability-default.json"));
        Assert.Equal(RepeatabilityProfile.LoadDefault().Entries.Count, p.Entries.Count);
    }
}
