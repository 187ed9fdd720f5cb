using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Radiomics;
using Serimetry.Engine.Radiomics.Robustness;
using Serimetry.Engine.Radiomics.Series;

namespace Serimetry.Engine.Compare;

/// <summary>Per-visit features of a comparison and the robustness screen that decides which of them feed the deltas.</summary>
public sealed record VisitRadiomicsResult(IReadOnlyList<VisitFeatures> Features, RobustnessScreen Screen);

/// <summary>
/// IBSI chapter 1 features per visit (docs/radiomics.md) on the re-fitted lesion and on the whole gland, in
/// T2w (on its own grid) and in ADC (the scanner's samples, outline carried onto the ADC grid by nearest
/// neighbour). Regions are <c>lesion</c> and <c>gland</c>, images <c>t2w</c> and <c>adc</c>; the gland regions matter for
/// men whose cancer is not visible. A region that cannot be computed (empty, one voxel) is left out with a note.
/// Deltas are built only from the features the robustness screen keeps (<see cref="RobustnessScreening"/>).
/// </summary>
internal static class VisitRadiomics
{
    public static VisitRadiomicsResult Extract(IReadOnlyList<VisitImages> visits, RadiomicsSettings settings, RobustnessReference? robustness,
        List<string> notes)
    {
        var result = new List<VisitFeatures>();
        var acquisition = new Dictionary<(string, string), IReadOnlyDictionary<string, double>>();
        foreach (var v in visits)
        {
            string id = v.Index.ToString(CultureInfo.InvariantCulture);
            acquisition[(id, "t2w")] = AcquisitionParameters(v.Exam.T2wAcquisition, v.Exam.T2w.Geometry, null);
            acquisition[(id, "adc")] = AcquisitionParameters(v.Exam.AdcAcquisition, v.Exam.Adc.Geometry, v.Exam.BValues);
            foreach (var (region, image, features, error) in Regions(v.Exam.T2w, v.AdcInT2wFrame, v.Lesion?.Mask ?? v.PropagatedLesion, v.Gland, settings))
            {
                if (features is not null) result.Add(new VisitFeatures(id, v.Exam.Date, region, features, image));
                else notes.Add($"visit {v.Index}: radiomics of {region} on {image} skipped: {error}");
            }
        }
        var screen = RobustnessScreening.Screen(result, f => acquisition[(f.VisitId, f.Image)], robustness);
        return new VisitRadiomicsResult(result, screen);
    }

    /// <summary>
    /// The features of each region (lesion, gland) in each image (T2w, ADC in the T2w frame); a region whose mask is
    /// missing is left out, one that cannot be computed comes back with the error instead of features.
    /// Non-finite ADC samples (outside the field of view) leave the intensity mask.
    /// </summary>
    internal static IEnumerable<(string Region, string Image, IReadOnlyList<FeatureValue>? Features, string? Error)> Regions(
        Volume<float> t2w, Volume<float> adc, Volume<byte>? lesion, Volume<byte>? gland, RadiomicsSettings settings)
    {
        foreach (var (region, image, volume, mask) in new (string, string, Volume<float>, Volume<byte>?)[]
                 {
                     ("lesion", "t2w", t2w, lesion), ("gland", "t2w", t2w, gland),
                     ("lesion", "adc", adc, lesion), ("gland", "adc", adc, gland),
                 })
        {
            if (mask is null) continue;
            IReadOnlyList<FeatureValue>? features = null;
            string? error = null;
            try
            {
                var onGrid = MaskGrid.OnGrid(mask, volume.Geometry);
                features = RadiomicsExtractor.Extract(volume, onGrid, settings with { NonFiniteIntensities = NonFinitePolicy.Exclude });
            }
            catch (InputException e)
            {
                error = e.Message;
            }
            yield return (region, image, features, error);
        }
    }

    /// <summary>Acquisition parameters a feature could track across exams (those recorded for the series).</summary>
    private static Dictionary<string, double> AcquisitionParameters(AcquisitionInfo a, Geometry g, IReadOnlyList<double>? bValues)
    {
        var p = new Dictionary<string, double>(StringComparer.Ordinal)
        {
            ["PixelSpacingMm"] = Math.Sqrt(g.SpacingMm.X * g.SpacingMm.Y),
            ["SliceSpacingMm"] = g.SpacingMm.Z,
        };
        if (a.FieldStrengthT is double b0) p["FieldStrengthT"] = b0;
        if (a.RepetitionTimeMs is double tr) p["RepetitionTimeMs"] = tr;
        if (a.EchoTimeMs is double te) p["EchoTimeMs"] = te;
        if (a.SliceThicknessMm is double st) p["SliceThicknessMm"] = st;
        if (bValues is { Count: > 0 }) p["MaxBValueSPerMm2"] = bValues.Max();
        return p;
    }

    /// <summary>
    /// Writes <c>radiomics.csv</c> (long format over visits with the robust flag), <c>radiomics-robustness.csv</c>
    /// (kept or dropped, and why), <c>radiomics-acquisition.csv</c> (correlations with acquisition parameters) and
    /// <c>radiomics-deltas-visit-K.csv</c> per follow-up from the kept features only.
    /// </summary>
    public static IReadOnlyList<string> Write(VisitRadiomicsResult radiomics, string outDir)
    {
        var (features, screen) = (radiomics.Features, radiomics.Screen);
        WriteFile(outDir, "radiomics.csv", w => RadiomicsTimeSeries.WriteLong(w, features, screen.IsRobust));
        WriteFile(outDir, "radiomics-robustness.csv", w => RobustnessScreenCsv.WriteDecisions(w, screen));
        WriteFile(outDir, "radiomics-acquisition.csv", w => RobustnessScreenCsv.WriteCorrelations(w, screen));
        var written = new List<string> { "radiomics.csv", "radiomics-robustness.csv", "radiomics-acquisition.csv" };
        foreach (var followup in features.Select(f => f.VisitId).Distinct().Where(id => id != "0"))
        {
            var deltas = features.Where(f => f.VisitId == followup)
                .SelectMany(f => features.Where(b => b.VisitId == "0" && b.Region == f.Region && b.Image == f.Image)
                    .SelectMany(b => RadiomicsTimeSeries.Deltas(b, f, screen.Kept(f.Region, f.Image))))
                .ToList();
            var name = $"radiomics-deltas-visit-{followup}.csv";
            WriteFile(outDir, name, w => RadiomicsTimeSeries.WriteDeltas(w, deltas));
            written.Add(name);
        }
        return written;
    }

    private static void WriteFile(string outDir, string name, Action<TextWriter> write)
    {
        using var w = new StreamWriter(Path.Combine(outDir, name));
        write(w);
    }
}
