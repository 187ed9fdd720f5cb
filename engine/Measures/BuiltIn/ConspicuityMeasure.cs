using Serimetry.Engine.Core;
using Serimetry.Engine.Repeatability;

namespace Serimetry.Engine.Measures.BuiltIn;

/// <summary>Image on which conspicuity is measured.</summary>
public enum ConspicuityImage
{
    T2w,
    Adc,
}

/// <summary>
/// <c>lesion.conspicuity.t2w</c> / <c>.adc</c> and their <c>.cnr</c> forms: contrast of the lesion
/// against a peri-lesional shell inside the gland (shell = gland voxels outside the lesion within
/// <see cref="MeasureSettings.ShellDistanceMm"/> of it, built on the intensity image's own grid).
/// Ratio form (primary id): mean_lesion / mean_shell. CNR form (<c>….cnr</c>):
/// (mean_lesion − mean_shell) / sd_shell with the sample SD (n−1). Both are unitless and invariant to a
/// global intensity scale, which T2w signal needs across visits. Definitions in docs/measures.md.
/// </summary>
public sealed class ConspicuityMeasure(ConspicuityImage image, bool contrastToNoise) : BuiltInMeasure
{
    public override string Id => $"lesion.conspicuity.{(image == ConspicuityImage.T2w ? "t2w" : "adc")}{(contrastToNoise ? ".cnr" : "")}";
    public override string Unit => "1";
    public override string Description => contrastToNoise
        ? "Lesion contrast-to-noise against the peri-lesional gland shell: (mean_lesion − mean_shell) / sd_shell."
        : "Lesion-to-shell intensity ratio: mean_lesion / mean_shell (peri-lesional gland shell).";
    public override MeasureInputs Inputs => MeasureInputs.LesionMask | MeasureInputs.GlandMask |
        (image == ConspicuityImage.T2w ? MeasureInputs.T2w : MeasureInputs.Adc);
    public override ErrorScale ErrorScale => contrastToNoise ? ErrorScale.Absolute : ErrorScale.Log;

    public override MeasureValue Measure(VisitContext context)
    {
        Volume<float>? img = image == ConspicuityImage.T2w ? context.T2w : context.Adc;
        if (img is null) return MeasureValue.NotApplicable(this, "no ADC map was given for this visit");
        if (!TryMask(context.LesionMask, "lesion", out var lesion, out var skip)) return skip;
        if (!TryMask(context.GlandMask, "gland", out var gland, out skip)) return skip;
        double shellMm = context.Settings.ShellDistanceMm;
        var regions = context.Cached($"shell:{image}", () => Regions.Build(img, lesion, gland, shellMm));
        var prov = Provenance(("lesionSamples", regions.Lesion.Length), ("shellSamples", regions.Shell.Length),
            ("shellDistanceMm", shellMm), ("grid", GridOf(img.Geometry)));
        if (regions.Lesion.Length == 0) return MeasureValue.NotApplicable(this, "the lesion has no finite voxel on the image grid", prov);
        if (regions.Shell.Length < 2) return MeasureValue.NotApplicable(this, "the peri-lesional shell inside the gland is empty", prov);
        double ml = SampleStatistics.Mean(regions.Lesion), ms = SampleStatistics.Mean(regions.Shell);
        if (!contrastToNoise)
            return ms == 0 ? MeasureValue.NotApplicable(this, "the shell mean intensity is 0", prov) : MeasureValue.Ok(this, ml / ms, prov);
        double sd = SampleStatistics.SampleSd(regions.Shell);
        return sd == 0 ? MeasureValue.NotApplicable(this, "the shell intensity has no spread (SD 0)", prov) : MeasureValue.Ok(this, (ml - ms) / sd, prov);
    }

    /// <summary>Finite lesion and shell intensities on the image grid.</summary>
    internal sealed record Regions(float[] Lesion, float[] Shell)
    {
        public static Regions Build(Volume<float> img, Volume<byte> lesionMask, Volume<byte> glandMask, double shellMm)
        {
            var lesion = MaskGrid.OnGrid(lesionMask, img.Geometry);
            var gland = MaskGrid.OnGrid(glandMask, img.Geometry);
            var shell = PeriLesionalShell.Build(lesion, gland, shellMm);
            return new Regions(Finite(img.Voxels, lesion.Voxels), Finite(img.Voxels, shell));
        }

        private static float[] Finite(float[] v, byte[] mask)
        {
            var list = new List<float>();
            for (int o = 0; o < v.Length; o++)
                if (mask[o] != 0 && float.IsFinite(v[o])) list.Add(v[o]);
            return list.ToArray();
        }
    }
}
