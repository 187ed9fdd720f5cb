using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging.Morphology;
using Serimetry.Engine.Reports;
using Serimetry.Engine.Reports.Html;
using Serimetry.Engine.Reports.Pictures;

namespace Serimetry.Engine.Compare;

/// <summary>
/// Writes a comparison's files: change.json, measures.csv, changes.csv, report.html and its PNGs, radiomics CSVs,
/// DICOM SEG <c>seg-&lt;visit&gt;.dcm</c> per visit and the TID 1500 SR <c>sr.dcm</c> (docs/dicom-out.md).
/// </summary>
public static class CompareOutputs
{
    /// <summary>Writes everything into <paramref name="outDir"/> (created when missing) and returns the file names written.</summary>
    public static IReadOnlyList<string> Write(CompareResult result, string outDir)
    {
        Directory.CreateDirectory(outDir);
        var written = new List<string>();
        var pictures = new List<ReportPicture>();
        foreach (var v in result.Visits)
            pictures.AddRange(WritePictures(v, outDir));
        written.AddRange(pictures.Select(p => p.FileName));
        var adc = result.Visits.Select(v => new VisitAdcSamples(v.Index,
            v.Exam.Date.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture), LesionAdc(v))).ToList();
        WriteAtomically(Path.Combine(outDir, "report.html"), HtmlReport.Render(result.Report, pictures, adc));
        TidyCsv.WriteAll(result.Report, outDir);
        foreach (var v in result.Visits.Where(v => v.ToBaseline?.Deformation is not null))
        {
            var name = ComparePipeline.DeformationFileName(v.Index);
            Registration.TransformFile.Write(Path.Combine(outDir, name), v.ToBaseline!);
            written.Add(name);
        }
        if (result.RadiomicsScreen is { } screen) written.AddRange(VisitRadiomics.Write(new VisitRadiomicsResult(result.Radiomics, screen), outDir));
        var segs = Reports.Dicom.VisitSegOutputs.WriteWithIds(result.Visits, result.ExamPaths, outDir);
        written.AddRange(segs.Select(s => $"seg-{s.VisitIndex}.dcm"));
        if (result.Visits.Count > 0) written.Add(Reports.Dicom.VisitSegOutputs.WriteSr(result.Report, result.Visits, segs, outDir));
        // change.json last: its presence means every other file is complete.
        WriteAtomically(Path.Combine(outDir, "change.json"), ChangeReportJson.Serialize(result.Report) + "\n");
        written.AddRange(["report.html", "measures.csv", "changes.csv", "change.json"]);
        return written;
    }

    /// <summary>The lesion's ADC samples exactly as the ADC measures take them (native ADC grid, no interpolation).</summary>
    private static IReadOnlyList<double> LesionAdc(VisitImages v)
    {
        var mask = v.Lesion?.Mask ?? v.PropagatedLesion;
        return mask is null ? [] : Measures.LesionAdcSamples.Gather(v.AdcInT2wFrame, mask).Values.Select(x => (double)x).ToList();
    }

    private static IEnumerable<ReportPicture> WritePictures(VisitImages v, string outDir)
    {
        var focus = v.Lesion?.Mask ?? v.PropagatedLesion ?? v.Gland;
        if (focus is null || MaskOps.Count(focus) == 0) yield break;
        int k = BestSlice(focus);
        var region = Region(v.Gland ?? focus, marginMm: 12);
        int scale = Math.Clamp(320 / Math.Max(region.Width, region.Height), 1, 8);
        var layers = new List<OutlineLayer>();
        if (v.Gland is not null) layers.Add(new OutlineLayer(v.Gland, 0x30, 0xC0, 0xFF));
        if (v.PropagatedLesion is not null) layers.Add(new OutlineLayer(v.PropagatedLesion, 0xE8, 0xC0, 0x00));
        if (v.Lesion is { Refitted: true } l) layers.Add(new OutlineLayer(l.Mask, 0xFF, 0x30, 0x30));
        string date = v.Exam.Date.ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture);
        foreach (var (name, image) in new[] { ("t2w", v.Exam.T2w), ("adc", v.AdcOnT2w) })
        {
            var file = $"visit-{v.Index}-{name}.png";
            File.WriteAllBytes(Path.Combine(outDir, file), SliceRenderer.Render(image, k, layers, scale, region).ToPng());
            yield return new ReportPicture(v.Index, file, $"visit {v.Index} ({date}) {(name == "t2w" ? "T2w" : "ADC")}, slice {k}");
        }
    }

    private static int BestSlice(Volume<byte> mask)
    {
        int best = 0;
        long bestCount = -1;
        for (int k = 0; k < mask.Size.Z; k++)
        {
            long c = 0;
            foreach (var b in mask.Slice(k)) if (b != 0) c++;
            if (c > bestCount) (best, bestCount) = (k, c);
        }
        return best;
    }

    private static SliceRegion Region(Volume<byte> mask, double marginMm)
    {
        var s = mask.Size;
        int i0 = s.X, i1 = -1, j0 = s.Y, j1 = -1;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    if (mask.Voxels[mask.LinearIndex(i, j, k)] == 0) continue;
                    i0 = Math.Min(i0, i); i1 = Math.Max(i1, i); j0 = Math.Min(j0, j); j1 = Math.Max(j1, j);
                }
        if (i1 < 0) return SliceRegion.Whole(s);
        int mi = (int)Math.Ceiling(marginMm / mask.Geometry.SpacingMm.X), mj = (int)Math.Ceiling(marginMm / mask.Geometry.SpacingMm.Y);
        i0 = Math.Max(0, i0 - mi); j0 = Math.Max(0, j0 - mj);
        i1 = Math.Min(s.X - 1, i1 + mi); j1 = Math.Min(s.Y - 1, j1 + mj);
        return new SliceRegion(i0, j0, i1 - i0 + 1, j1 - j0 + 1);
    }

    private static void WriteAtomically(string path, string text)
    {
        var tmp = path + ".tmp";
        File.WriteAllText(tmp, text);
        File.Move(tmp, path, overwrite: true);
    }
}
