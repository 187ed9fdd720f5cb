namespace Serimetry.Engine.Compare;

/// <summary>
/// Finds the background tissue classes around a lesion: k-means (Lloyd's algorithm, deterministic start at
/// T2 quantiles) in the two-channel space standardised by the lesion's own SDs, then the pooled within-class SD
/// per channel over the lesion and all classes. Classes holding under 5 % of the shell are dropped.
/// </summary>
internal static class TissueClasses
{
    public static (IReadOnlyList<ChannelPair> Centres, ChannelPair Scale) Fit(
        IReadOnlyList<ChannelPair> shell, IReadOnlyList<ChannelPair> lesion, ChannelPair lesionMean, int maxClasses)
    {
        var lesionSd = Sd(lesion, lesionMean);
        var scale = new ChannelPair(Math.Max(lesionSd.Adc, 1e-6), Math.Max(lesionSd.T2, 1e-9));
        var centres = InitialCentres(shell, Math.Clamp(maxClasses, 1, 8));
        var assignment = new int[shell.Count];
        for (int iteration = 0; iteration < 30; iteration++)
        {
            bool changed = Assign(shell, centres, scale, assignment);
            centres = Update(shell, centres, assignment);
            if (!changed && iteration > 0) break;
        }
        var counts = new int[centres.Count];
        foreach (var a in assignment) counts[a]++;
        var kept = new List<ChannelPair>();
        var keptIndex = new List<int>();
        for (int c = 0; c < centres.Count; c++)
            if (counts[c] >= 0.05 * shell.Count) { kept.Add(centres[c]); keptIndex.Add(c); }
        return (kept, PooledSd(shell, assignment, centres, keptIndex, lesion, lesionMean));
    }

    private static List<ChannelPair> InitialCentres(IReadOnlyList<ChannelPair> x, int k)
    {
        var sorted = x.OrderBy(p => p.T2).ToList();
        var centres = new List<ChannelPair>(k);
        for (int c = 0; c < k; c++) centres.Add(sorted[(int)((c + 0.5) / k * (sorted.Count - 1))]);
        return centres;
    }

    private static bool Assign(IReadOnlyList<ChannelPair> x, List<ChannelPair> centres, ChannelPair scale, int[] assignment)
    {
        bool changed = false;
        for (int n = 0; n < x.Count; n++)
        {
            int best = 0;
            double bestD = double.PositiveInfinity;
            for (int c = 0; c < centres.Count; c++)
            {
                double d = x[n].DistanceTo(centres[c], scale);
                if (d < bestD) (best, bestD) = (c, d);
            }
            if (assignment[n] != best) changed = true;
            assignment[n] = best;
        }
        return changed;
    }

    private static List<ChannelPair> Update(IReadOnlyList<ChannelPair> x, List<ChannelPair> centres, int[] assignment)
    {
        var sa = new double[centres.Count];
        var st = new double[centres.Count];
        var n = new int[centres.Count];
        for (int i = 0; i < x.Count; i++)
        {
            sa[assignment[i]] += x[i].Adc;
            st[assignment[i]] += x[i].T2;
            n[assignment[i]]++;
        }
        return centres.Select((c, i) => n[i] > 0 ? new ChannelPair(sa[i] / n[i], st[i] / n[i]) : c).ToList();
    }

    private static ChannelPair PooledSd(IReadOnlyList<ChannelPair> shell, int[] assignment, List<ChannelPair> centres, List<int> kept,
        IReadOnlyList<ChannelPair> lesion, ChannelPair lesionMean)
    {
        double sa = 0, st = 0;
        long n = 0;
        foreach (var p in lesion) { sa += Sq(p.Adc - lesionMean.Adc); st += Sq(p.T2 - lesionMean.T2); n++; }
        for (int i = 0; i < shell.Count; i++)
        {
            if (!kept.Contains(assignment[i])) continue;
            var c = centres[assignment[i]];
            sa += Sq(shell[i].Adc - c.Adc);
            st += Sq(shell[i].T2 - c.T2);
            n++;
        }
        int groups = 1 + kept.Count;
        double dof = Math.Max(1, n - groups);
        return new ChannelPair(Math.Max(Math.Sqrt(sa / dof), 1e-6), Math.Max(Math.Sqrt(st / dof), 1e-9));
    }

    private static ChannelPair Sd(IReadOnlyList<ChannelPair> x, ChannelPair mean)
    {
        double sa = 0, st = 0;
        foreach (var p in x) { sa += Sq(p.Adc - mean.Adc); st += Sq(p.T2 - mean.T2); }
        int dof = Math.Max(1, x.Count - 1);
        return new ChannelPair(Math.Sqrt(sa / dof), Math.Sqrt(st / dof));
    }

    private static double Sq(double v) => v * v;
}
