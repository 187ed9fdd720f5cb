namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Magnitude (Rician) noise: |S + σ·(n₁ + i·n₂)| with independent standard normal n₁, n₂, the noise of
/// magnitude MR images (Gudbjartsson &amp; Patz, MRM 1995). Seeded and sequential, so results repeat exactly.
/// </summary>
internal sealed class RicianNoise(int seed)
{
    private readonly Random _rng = new(seed);

    /// <summary>A standard normal deviate (Box-Muller).</summary>
    internal double Normal()
    {
        double u1 = 1.0 - _rng.NextDouble(), u2 = _rng.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2.0 * Math.PI * u2);
    }

    /// <summary>Replaces each value by its Rician-noisy magnitude (σ = 0 leaves the data unchanged).</summary>
    internal void Apply(Span<float> data, double sigma)
    {
        if (sigma <= 0) return;
        for (int i = 0; i < data.Length; i++)
        {
            double re = data[i] + sigma * Normal(), im = sigma * Normal();
            data[i] = (float)Math.Sqrt(re * re + im * im);
        }
    }
}
