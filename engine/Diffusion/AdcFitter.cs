using Serimetry.Engine.Core;

namespace Serimetry.Engine.Diffusion;

/// <summary>
/// Computes an ADC map (10⁻⁶ mm²/s) from multi-b-value DWI volumes on one grid (docs/qa.md). Per voxel:
/// signals ≤ 0 are dropped (ln undefined; magnitude data are never negative, so such values are artefacts);
/// in the log fits, when σ is known, signals below FloorFactor·σ are dropped and the rest corrected to √(M² − σ²);
/// a voxel with fewer than two
/// points at distinct b-values is left at 0 and counted as failed. Results are the same for any thread count.
/// </summary>
public static class AdcFitter
{
    /// <summary>Fits the map inside <paramref name="mask"/> (non-zero voxels; null = every voxel).</summary>
    public static AdcMapResult Fit(IReadOnlyList<DwiImage> dwi, Volume<byte>? mask = null, AdcFitOptions? options = null)
    {
        options ??= new AdcFitOptions();
        options.Validate();
        var selected = Select(dwi, options);
        var geometry = selected[0].Image.Geometry;
        mask?.Geometry.RequireCongruent(geometry, "DWI images and mask");
        var adc = new Volume<float>(geometry);
        var s0Map = new Volume<float>(geometry);
        var r2Map = new Volume<float>(geometry);
        int count = checked((int)geometry.VoxelCount);
        int parts = ParallelRange.PartitionCount(count, 4096);
        var fitted = new long[Math.Max(parts, 1)];
        var failed = new long[Math.Max(parts, 1)];
        var clamped = new long[Math.Max(parts, 1)];
        var bs = selected.Select(x => x.BValue).ToArray();
        var images = selected.Select(x => x.Image.Voxels).ToArray();
        ParallelRange.For(count, 4096, (p, start, end) =>
        {
            var worker = new VoxelWorker(bs, images, options);
            for (int v = start; v < end; v++)
            {
                if (mask is not null && mask.Voxels[v] == 0) continue;
                var status = worker.FitVoxel(v, out double s0, out double adcValue, out double r2);
                if (status == VoxelStatus.Failed) { failed[p]++; continue; }
                if (status == VoxelStatus.Clamped) clamped[p]++;
                fitted[p]++;
                adc.Voxels[v] = (float)adcValue;
                s0Map.Voxels[v] = (float)s0;
                r2Map.Voxels[v] = (float)r2;
            }
        }, options.MaxDegreeOfParallelism);
        var used = bs.Distinct().Order().ToArray();
        return new AdcMapResult(adc, s0Map, r2Map, used, options, fitted.Sum(), failed.Sum(), clamped.Sum());
    }

    /// <summary>The images the options select, validated (same grid, finite b ≥ 0, ≥ 2 distinct b-values).</summary>
    internal static IReadOnlyList<DwiImage> Select(IReadOnlyList<DwiImage> dwi, AdcFitOptions options)
    {
        ArgumentNullException.ThrowIfNull(dwi);
        if (dwi.Count == 0)
            throw new InvalidParameterException("no DWI images given", "DWI series", "supply images at two or more b-values");
        foreach (var d in dwi)
        {
            if (!double.IsFinite(d.BValue) || d.BValue < 0)
                throw new InputFormatException($"b-value {d.BValue} is not a finite non-negative number", "DWI series", "check the Diffusion b-value (0018,9087) of each image");
            d.Image.Geometry.RequireCongruent(dwi[0].Image.Geometry, "DWI images of different b-values");
        }
        string available = string.Join(", ", dwi.Select(d => d.BValue).Distinct().Order());
        List<DwiImage> chosen;
        if (options.BValues is { Count: > 0 } wanted)
        {
            chosen = [];
            foreach (var b in wanted)
            {
                var match = dwi.Where(d => Math.Abs(d.BValue - b) < 0.5).ToList();
                if (match.Count == 0)
                    throw new InvalidParameterException($"b-value {b} was requested but the series has only b = {available} s/mm²", "--b-values",
                        "choose b-values present in the series");
                chosen.AddRange(match);
            }
        }
        else chosen = dwi.Where(d => d.BValue >= options.MinBValue).ToList();
        if (chosen.Select(d => d.BValue).Distinct().Count() < 2)
            throw new InvalidParameterException(
                $"an ADC fit needs at least two distinct b-values; after selection (b ≥ {options.MinBValue} s/mm² or the requested list) the series offers b = {available} s/mm²",
                "DWI series", "supply more b-values, or lower the minimum b-value / choose b-values explicitly");
        return chosen.OrderBy(d => d.BValue).ToList();
    }

    internal enum VoxelStatus { Ok, Clamped, Failed }

    /// <summary>Per-partition scratch and the fit of one voxel.</summary>
    internal sealed class VoxelWorker(double[] bValues, float[][] images, AdcFitOptions options)
    {
        private readonly double[] _b = new double[bValues.Length];
        private readonly double[] _s = new double[bValues.Length];
        private readonly double[] _w = new double[bValues.Length];
        private readonly double[] _allB = new double[bValues.Length];
        private readonly double[] _allS = new double[bValues.Length];

        internal VoxelStatus FitVoxel(int v, out double s0, out double adc, out double r2)
        {
            s0 = adc = r2 = 0;
            double sigma = options.NoiseSigma, floor = options.FloorFactor * sigma;
            int n = 0, all = 0;
            for (int i = 0; i < bValues.Length; i++)
            {
                double s = images[i][v];
                if (!(s > 0) || !double.IsFinite(s)) continue;
                _allB[all] = bValues[i]; _allS[all] = s; all++;
                if (sigma > 0 && s < floor) continue;
                // Known σ: first-order Rician bias correction A ≈ √(M² − σ²) (Gudbjartsson & Patz, MRM 1995;34:910).
                double corrected = sigma > 0 ? Math.Sqrt(s * s - sigma * sigma) : s;
                _b[n] = bValues[i]; _s[n] = corrected; _w[n] = options.Method == AdcFitMethod.LogLinear ? 1 : corrected * corrected; n++;
            }
            // Fewer than two points above the noise floor: no measurable signal decay (counted as failed).
            if (!MonoExponentialFit.LogLinear(_b, _s, _w, n, out s0, out double d)) return VoxelStatus.Failed;
            double fitSigma = 0;
            if (options.Method == AdcFitMethod.NonLinear)
            {
                fitSigma = sigma;
                if (!MonoExponentialFit.NonLinear(_allB, _allS, all, sigma, ref s0, ref d)) return VoxelStatus.Failed;
                r2 = MonoExponentialFit.RSquared(_allB, _allS, all, s0, d, fitSigma);
            }
            else r2 = MonoExponentialFit.RSquared(_b, _s, n, s0, d, 0);
            adc = d * 1e6;
            if (adc < 0 || adc > options.MaxAdcUm2PerS)
            {
                adc = Math.Clamp(adc, 0, options.MaxAdcUm2PerS);
                return VoxelStatus.Clamped;
            }
            return VoxelStatus.Ok;
        }
    }
}
