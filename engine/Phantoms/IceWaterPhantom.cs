using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// A simulated ice-water DWI phantom: vertical tubes of water at 0 °C (ADC 1099×10⁻⁶ mm²/s, facts.md §2) in
/// air, imaged at the given b-values with Rician noise (SNR = S0 / σ). Used to test the DWI phantom check.
/// </summary>
public static class IceWaterPhantom
{
    /// <summary>
    /// DWI volumes of <paramref name="tubes"/> tubes of radius <paramref name="tubeRadiusMm"/> on an axial grid
    /// of <paramref name="size"/> voxels with <paramref name="spacingMm"/>; voxel centres inside a tube get the
    /// water signal, others 0 (noise only).
    /// </summary>
    public static IReadOnlyList<DwiImage> Generate(Size3 size, Vec3 spacingMm, IReadOnlyList<double> bValues, double snr, int seed,
        int tubes = 1, double tubeRadiusMm = 12, double adcUm2PerS = DwiPhantomCheck.IceWaterAdcUm2PerS, double s0 = 1000)
    {
        if (!(snr > 0)) throw new InvalidParameterException($"SNR {snr} must be positive", "ice-water phantom");
        var geometry = Geometry.Axial(size, spacingMm, Vec3.Zero);
        var centre = geometry.CenterMm;
        var inside = new bool[geometry.VoxelCount];
        double spacing = 3 * tubeRadiusMm;
        for (int k = 0; k < size.Z; k++)
            for (int j = 0; j < size.Y; j++)
                for (int i = 0; i < size.X; i++)
                {
                    var p = geometry.IndexToPhysical(i, j, k) - centre;
                    for (int t = 0; t < tubes; t++)
                    {
                        double cx = (t - (tubes - 1) / 2.0) * spacing;
                        if ((p.X - cx) * (p.X - cx) + p.Y * p.Y <= tubeRadiusMm * tubeRadiusMm) inside[i + size.X * (j + size.Y * k)] = true;
                    }
                }
        var noise = new RicianNoise(seed);
        var result = new List<DwiImage>();
        foreach (var b in bValues)
        {
            var vol = new Volume<float>(geometry);
            float signal = (float)(s0 * Math.Exp(-b * adcUm2PerS * 1e-6));
            for (int v = 0; v < inside.Length; v++) vol.Voxels[v] = inside[v] ? signal : 0;
            noise.Apply(vol.Voxels, s0 / snr);
            result.Add(new DwiImage(b, vol));
        }
        return result;
    }
}
