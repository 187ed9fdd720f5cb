using Serimetry.Engine.Core;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Evaluates the analytic anatomy of one visit (before noise). Masks are sampled at voxel centres. Signals of
/// voxels on a tissue boundary (a 6-neighbour's centre has another tissue) are averaged over 2×2 in-plane ×
/// 3 through-plane sub-samples (the slice profile of a thick slice), so edges carry partial volume like acquired
/// images; interior voxels use their centre (a boundary clipping only a voxel corner can be missed — documented).
/// </summary>
internal sealed class PhantomRenderer(PhantomSpec spec, PhantomAnatomy anatomy, PhantomMotion motion)
{
    private const int TissueCount = 9;
    private static readonly double[] ThroughPlane = [-1.0 / 3, 0, 1.0 / 3];
    private static readonly double[] InPlane = [-0.25, 0.25];
    private static readonly int Samples = ThroughPlane.Length * InPlane.Length * InPlane.Length;

    private readonly TissueProperties[] _props =
    [
        new(0, 0, 0), spec.Fat, spec.Muscle, spec.Urine, spec.RectalWall, spec.RectalGas,
        spec.PeripheralZone, spec.TransitionZone, spec.Lesion,
    ];

    private static bool IsGland(PhantomTissue t) => t is PhantomTissue.PeripheralZone or PhantomTissue.TransitionZone or PhantomTissue.Lesion;

    /// <summary>Tissue at every voxel centre.</summary>
    private byte[] CentreLabels(Geometry geometry, int maxDegree)
    {
        var labels = new byte[geometry.VoxelCount];
        int nx = geometry.Size.X, ny = geometry.Size.Y, nxy = nx * ny;
        ParallelRange.For(labels.Length, 8192, (_, start, end) =>
        {
            for (int v = start; v < end; v++)
                labels[v] = (byte)anatomy.Classify(motion.VisitToBaseline(geometry.IndexToPhysical(v % nx, v / nx % ny, v / nxy)));
        }, maxDegree);
        return labels;
    }

    private static bool IsInterior(byte[] labels, int v, Size3 size)
    {
        int nx = size.X, nxy = nx * size.Y, i = v % nx, j = v / nx % size.Y, k = v / nxy;
        byte c = labels[v];
        return (i == 0 || labels[v - 1] == c) && (i == nx - 1 || labels[v + 1] == c)
            && (j == 0 || labels[v - nx] == c) && (j == size.Y - 1 || labels[v + nx] == c)
            && (k == 0 || labels[v - nxy] == c) && (k == size.Z - 1 || labels[v + nxy] == c);
    }

    /// <summary>T2w image and masks on <paramref name="geometry"/>.</summary>
    internal Volume<float> RenderT2(Geometry geometry, out Volume<byte> gland, out Volume<byte> zones, out Volume<byte> lesion, int maxDegree)
    {
        var labels = CentreLabels(geometry, maxDegree);
        var image = new Volume<float>(geometry);
        var g = new Volume<byte>(geometry);
        var z = new Volume<byte>(geometry);
        var l = new Volume<byte>(geometry);
        var centre = geometry.CenterMm;
        var size = geometry.Size;
        ParallelRange.For(image.Voxels.Length, 8192, (_, start, end) =>
        {
            for (int v = start; v < end; v++)
            {
                var index = new Vec3(v % size.X, v / size.X % size.Y, v / (size.X * size.Y));
                var tc = (PhantomTissue)labels[v];
                double signal;
                if (IsGland(tc) || !IsInterior(labels, v, size))
                {
                    var pc = motion.VisitToBaseline(geometry.IndexToPhysical(index));
                    if (IsGland(tc))
                    {
                        g.Voxels[v] = 1;
                        z.Voxels[v] = anatomy.Zone(pc);
                        if (tc == PhantomTissue.Lesion) l.Voxels[v] = 1;
                    }
                    signal = IsInterior(labels, v, size) ? _props[(int)tc].T2Signal * anatomy.Texture(pc) : SubsampledT2(geometry, index);
                }
                else signal = _props[(int)tc].T2Signal;
                image.Voxels[v] = (float)(signal * Bias(geometry.IndexToPhysical(index) - centre));
            }
        }, maxDegree);
        gland = g; zones = z; lesion = l;
        return image;
    }

    private double SubsampledT2(Geometry geometry, Vec3 index)
    {
        double signal = 0;
        foreach (double dz in ThroughPlane)
            foreach (double dy in InPlane)
                foreach (double dx in InPlane)
                {
                    var p = motion.VisitToBaseline(geometry.IndexToPhysical(index + new Vec3(dx, dy, dz)));
                    var tissue = anatomy.Classify(p);
                    double s = _props[(int)tissue].T2Signal;
                    signal += IsGland(tissue) ? s * anatomy.Texture(p) : s;
                }
        return signal / Samples;
    }

    /// <summary>Noise-free DWI signals Σ fraction·S0·exp(−b·ADC) on <paramref name="geometry"/>, one volume per b-value.</summary>
    internal Volume<float>[] RenderDwi(Geometry geometry, IReadOnlyList<double> bValues, int maxDegree)
    {
        var labels = CentreLabels(geometry, maxDegree);
        var images = bValues.Select(_ => new Volume<float>(geometry)).ToArray();
        var centre = geometry.CenterMm;
        var size = geometry.Size;
        var decay = new double[bValues.Count, TissueCount];
        for (int b = 0; b < bValues.Count; b++)
            for (int t = 0; t < TissueCount; t++) decay[b, t] = _props[t].DwiS0 * Math.Exp(-bValues[b] * _props[t].AdcUm2PerS * 1e-6);
        ParallelRange.For(images[0].Voxels.Length, 4096, (_, start, end) =>
        {
            Span<int> counts = stackalloc int[TissueCount];
            for (int v = start; v < end; v++)
            {
                counts.Clear();
                var index = new Vec3(v % size.X, v / size.X % size.Y, v / (size.X * size.Y));
                if (IsInterior(labels, v, size)) counts[labels[v]] = Samples;
                else
                    foreach (double dz in ThroughPlane)
                        foreach (double dy in InPlane)
                            foreach (double dx in InPlane)
                                counts[(int)anatomy.Classify(motion.VisitToBaseline(geometry.IndexToPhysical(index + new Vec3(dx, dy, dz))))]++;
                double bias = Bias(geometry.IndexToPhysical(index) - centre);
                for (int b = 0; b < images.Length; b++)
                {
                    double s = 0;
                    for (int t = 0; t < TissueCount; t++) s += counts[t] * decay[b, t];
                    images[b].Voxels[v] = (float)(s / Samples * bias);
                }
            }
        }, maxDegree);
        return images;
    }

    /// <summary>Smooth receive-coil bias 1 + A·(0.7·x/100 − 0.5·(y/100)²), x, y in mm from the grid centre (fixed to the scanner).</summary>
    private double Bias(Vec3 d) => 1 + spec.BiasFieldAmplitude * (0.7 * d.X / 100 - 0.5 * (d.Y / 100) * (d.Y / 100));
}
