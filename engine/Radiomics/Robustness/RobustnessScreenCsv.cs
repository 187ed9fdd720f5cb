namespace Serimetry.Engine.Radiomics.Robustness;

/// <summary>Writes a <see cref="RobustnessScreen"/> as two tidy CSV tables (decisions; acquisition correlations).</summary>
public static class RobustnessScreenCsv
{
    public const string DecisionHeader = "region,image,family,feature,ibsiCode,aggregationCode,icc,kept,reason";
    public const string CorrelationHeader = "region,image,family,feature,ibsiCode,aggregationCode,parameter,spearmanRho,exams,strong,usedForScreening";

    /// <summary>One row per feature of each region and image: kept or dropped, and why.</summary>
    public static void WriteDecisions(TextWriter writer, RobustnessScreen screen)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(screen);
        writer.Write(DecisionHeader + "\n");
        foreach (var d in screen.Decisions)
        {
            writer.Write(string.Join(',', RadiomicsCsv.Field(d.Region), RadiomicsCsv.Field(d.Image), RadiomicsCsv.Field(d.Family),
                RadiomicsCsv.Field(d.Feature), RadiomicsCsv.Field(d.IbsiCode), RadiomicsCsv.Field(d.AggregationCode),
                RadiomicsCsv.Number(d.Icc ?? double.NaN), d.Kept ? "true" : "false", RadiomicsCsv.Field(d.Reason)));
            writer.Write('\n');
        }
    }

    /// <summary>One row per feature and acquisition parameter that varies across the visits (finite ρ only).</summary>
    public static void WriteCorrelations(TextWriter writer, RobustnessScreen screen)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(screen);
        writer.Write(CorrelationHeader + "\n");
        foreach (var s in screen.Correlations)
        {
            var c = s.Correlation;
            writer.Write(string.Join(',', RadiomicsCsv.Field(s.Region), RadiomicsCsv.Field(s.Image), RadiomicsCsv.Field(c.Family),
                RadiomicsCsv.Field(c.Feature), RadiomicsCsv.Field(c.IbsiCode), RadiomicsCsv.Field(c.AggregationCode), RadiomicsCsv.Field(c.Parameter),
                RadiomicsCsv.Number(c.SpearmanRho), c.Exams.ToString(System.Globalization.CultureInfo.InvariantCulture),
                c.Strong ? "true" : "false", s.UsedForScreening ? "true" : "false"));
            writer.Write('\n');
        }
    }
}
