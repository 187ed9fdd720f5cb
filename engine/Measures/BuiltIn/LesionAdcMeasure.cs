using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>Which first-order statistic of the lesion's ADC samples a measure reports.</summary>
public enum AdcStatistic
{
    Mean,
    Median,
    P10,
    P25,
    Sd,
    Skewness,
    Kurtosis,
}

/// <summary>
/// <c>lesion.adc.*</c>: first-order statistics of the lesion's ADC samples (10^-6 mm²/s; skewness and
/// kurtosis unitless), with the definitions of <see cref="SampleStatistics"/> (IBSI moments, Hyndman–Fan
/// type 7 percentiles). Error model: log scale (wCV) for location statistics, absolute for shape.
/// </summary>
public sealed class LesionAdcMeasure(AdcStatistic statistic) : BuiltInMeasure
{
    public override string Id => "lesion.adc." + statistic switch
    {
        AdcStatistic.Mean => "mean",
        AdcStatistic.Median => "median",
        AdcStatistic.P10 => "p10",
        AdcStatistic.P25 => "p25",
        AdcStatistic.Sd => "sd",
        AdcStatistic.Skewness => "skewness",
        _ => "kurtosis",
    };

    public override string Unit => statistic is AdcStatistic.Skewness or AdcStatistic.Kurtosis ? "1" : "10^-6 mm2/s";

    public override string Description => statistic switch
    {
        AdcStatistic.Mean => "Mean lesion ADC.",
        AdcStatistic.Median => "Median lesion ADC (50th percentile, Hyndman-Fan type 7).",
        AdcStatistic.P10 => "10th percentile of lesion ADC (Hyndman-Fan type 7).",
        AdcStatistic.P25 => "25th percentile of lesion ADC (Hyndman-Fan type 7).",
        AdcStatistic.Sd => "Population standard deviation of lesion ADC (root of IBSI intensity variance).",
        AdcStatistic.Skewness => "Skewness of lesion ADC (IBSI).",
        _ => "Excess kurtosis of lesion ADC (IBSI).",
    };

    /// <summary>IBSI intensity-statistics codes (Src: IBSI reference values, shared/reference/ibsi).</summary>
    public override string? IbsiCode => statistic switch
    {
        AdcStatistic.Mean => "Q4LE",
        AdcStatistic.Median => "Y12H",
        AdcStatistic.P10 => "QG58",
        AdcStatistic.Skewness => "KE2A",
        AdcStatistic.Kurtosis => "IPH6",
        _ => null,
    };

    public override MeasureInputs Inputs => MeasureInputs.Adc | MeasureInputs.LesionMask;

    public override ErrorScale ErrorScale => statistic is AdcStatistic.Skewness or AdcStatistic.Kurtosis ? ErrorScale.Absolute : ErrorScale.Log;

    public override MeasureValue Measure(VisitContext context)
    {
        var samples = LesionAdcSamples.Collect(context, out var reason);
        if (samples is null) return MeasureValue.NotApplicable(this, reason!);
        ReadOnlySpan<float> x = samples.Values;
        double value = statistic switch
        {
            AdcStatistic.Mean => SampleStatistics.Mean(x),
            AdcStatistic.Median => SampleStatistics.Percentile(x, 0.5),
            AdcStatistic.P10 => SampleStatistics.Percentile(x, 0.10),
            AdcStatistic.P25 => SampleStatistics.Percentile(x, 0.25),
            AdcStatistic.Sd => SampleStatistics.PopulationSd(x),
            AdcStatistic.Skewness => SampleStatistics.Skewness(x),
            _ => SampleStatistics.ExcessKurtosis(x),
        };
        return MeasureValue.Ok(this, value, Provenance(("samples", x.Length), ("nonFiniteExcluded", samples.NonFiniteExcluded),
            ("grid", GridOf(context.Adc!.Geometry)), ("maskTransfer", "nearest-neighbour at ADC voxel centres")));
    }
}
