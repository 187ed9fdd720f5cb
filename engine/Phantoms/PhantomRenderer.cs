using Serimetry.Engine.Core;

namespace Serimetry.Engine.Phantoms;

/// <summary>Evaluates the analytic anatomy at voxel centres of one visit (before noise).</summary>
internal sealed class PhantomRenderer(PhantomSpec spec, PhantomAnatomy anatomy, AffineTransform visitToBaseline)
{
    private readonly TissueProperties[] _props =
    [
        new(0, 0, 0), spec.Fat, spec.Muscle, spec.Urine, spec.RectalWall, spec.RectalGas,
        spec.PeripheralZone, spec.TransitionZone, spec.Lesion,
    ];

    /// <summary>T2w image and masks on <paramref name="geometry"/>.</summary>
    internal Volume<float> RenderT2(Geometry geometry, out Volume<byte> gland, out Volume<byte> zones, out Volume<byte> lesion, int maxDegree)
    {
        var image = new Volume<float>(geometry);
        var g = new Volume<byte>(geometry);
        var z = new Volume<byte>(geometry);
        var l = new Volume<byte>(geometry);
        var centre = geometry.CenterMm;
        int nx = geometry.Size.X, nxy = nx * geometry.Size.Y;
        ParallelRange.For(image.Voxels.Length, 8192, (_, start, end) =>
        {
            for (int v = start; v < end; v++)
            {
                var q = geometry.IndexToPhysical(v % nx, v / nx % geometry.Size.Y, v / nxy);
                var p = visitToBaseline.TransformPoint(q);
                var tissue = anatomy.Classify(p);
                double signal = _props[(int)tissue].T2Signal * Bias(q - centre);
                if (tissue is PhantomTissue.PeripheralZone or PhantomTissue.TransitionZone or PhantomTissue.Lesion)
                {
                    signal *= anatomy.Texture(p);
                    g.Voxels[v] = 1;
                    z.Voxels[v] = anatomy.Zone(p);
                    if (tissue == PhantomTissue.Lesion) l.Voxels[v] = 1;
                }
                image.Voxels[v] = (float)signal;
            }
        }, maxDegree);
        gland = g; zones = z; lesion = l;
        return image;
    }

    /// <summary>Noise-free DWI signal S0·exp(−b·ADC) on <paramref name="geometry"/>.</summary>
    internal Volume<float> RenderDwi(Geometry geometry, double b, int maxDegree)
    {
        var image = new Volume<float>(geometry);
        var centre = geometry.CenterMm;
        int nx = geometry.Size.X, nxy = nx * geometry.Size.Y;
        ParallelRange.For(image.Voxels.Length, 8192, (_, start, end) =>
        {
            for (int v = start; v < end; v++)
            {
                var q = geometry.IndexToPhysical(v % nx, v / nx % geometry.Size.Y, v / nxy);
                var props = _props[(int)anatomy.Classify(visitToBaseline.TransformPoint(q))];
                image.Voxels[v] = (float)(props.DwiS0 * Math.Exp(-b * props.AdcUm2PerS * 1e-6) * Bias(q - centre));
            }
        }, maxDegree);
        return image;
    }

    /// <summary>Smooth receive-coil bias 1 + A·(0.7·x/100 − 0.5·(y/100)²), x, y in mm from the grid centre (fixed to the scanner).</summary>
    private double Bias(Vec3 d) => 1 + spec.BiasFieldAmplitude * (0.7 * d.X / 100 - 0.5 * (d.Y / 100) * (d.Y / 100));
}
