using Serimetry.Engine.Core;
using Serimetry.Engine.Diffusion;
using Serimetry.Engine.Io;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Generates a digital phantom subject from a <see cref="PhantomSpec"/> (docs/qa.md). Each visit's images are
/// made by mapping every voxel centre q of the visit grid through the inverse true transform to the baseline
/// anatomy point p = T⁻¹(q) and evaluating the analytic anatomy there, so motion is exact (no resampling).
/// The bias field is fixed to the scanner grid (it does not move with the patient); texture moves with the
/// anatomy. Image signals average sub-samples inside each voxel (partial volume at edges); masks are sampled at
/// voxel centres; Rician noise is added last.
/// </summary>
public static class PhantomGenerator
{
    /// <summary>Generates every visit of the subject.</summary>
    public static PhantomSubject Generate(PhantomSpec spec, int maxDegreeOfParallelism = -1)
    {
        ArgumentNullException.ThrowIfNull(spec);
        spec.Validate();
        var transforms = TrueTransforms(spec);
        double maxRadius = LesionRadius(spec, spec.Visits - 1);
        if (!new PhantomAnatomy(spec, maxRadius).LesionFitsInGland(Math.Max(maxRadius, spec.LesionRadiusMm)))
            throw new InvalidParameterException(
                $"the lesion (radius up to {Math.Max(maxRadius, spec.LesionRadiusMm):F1} mm) leaves the gland", "phantom spec",
                "reduce lesionRadiusMm, growthPerVisit or visits, or move lesionOffsetMm");
        var visits = new List<PhantomVisit>();
        for (int k = 0; k < spec.Visits; k++) visits.Add(GenerateVisit(spec, k, transforms[k], maxDegreeOfParallelism));
        return new PhantomSubject(spec.SubjectId, spec, visits);
    }

    /// <summary>Lesion radius at visit k: volume grows by GrowthPerVisit per visit, so r = r0·F^(k/3).</summary>
    internal static double LesionRadius(PhantomSpec spec, int k) => spec.LesionRadiusMm * Math.Pow(spec.GrowthPerVisit, k / 3.0);

    /// <summary>
    /// True rigid transforms baseline → visit: identity at baseline; later visits rotate about the gland centre by a
    /// random axis and an angle uniform in ±MaxRotateDeg, then shift by a random direction × uniform [0, MaxShiftMm].
    /// </summary>
    internal static IReadOnlyList<AffineTransform> TrueTransforms(PhantomSpec spec)
    {
        var rng = new Random(spec.Seed);
        var c = new Vec3(spec.GlandCentreMm[0], spec.GlandCentreMm[1], spec.GlandCentreMm[2]);
        var list = new List<AffineTransform> { AffineTransform.Identity };
        for (int k = 1; k < spec.Visits; k++)
        {
            var axis = RandomDirection(rng);
            double angle = spec.MaxRotateDeg * (2 * rng.NextDouble() - 1) * Math.PI / 180;
            var shift = RandomDirection(rng) * (spec.MaxShiftMm * rng.NextDouble());
            var r = Rotation(axis, angle);
            list.Add(new AffineTransform(r, c - r * c + shift));
        }
        return list;
    }

    private static Vec3 RandomDirection(Random rng)
    {
        while (true)
        {
            var v = new Vec3(2 * rng.NextDouble() - 1, 2 * rng.NextDouble() - 1, 2 * rng.NextDouble() - 1);
            double n = v.Norm;
            if (n > 1e-3 && n <= 1) return v / n;
        }
    }

    /// <summary>Rodrigues' rotation matrix about a unit axis.</summary>
    internal static Mat3 Rotation(Vec3 u, double angle)
    {
        double c = Math.Cos(angle), s = Math.Sin(angle), t = 1 - c;
        return new Mat3(
            t * u.X * u.X + c, t * u.X * u.Y - s * u.Z, t * u.X * u.Z + s * u.Y,
            t * u.X * u.Y + s * u.Z, t * u.Y * u.Y + c, t * u.Y * u.Z - s * u.X,
            t * u.X * u.Z - s * u.Y, t * u.Y * u.Z + s * u.X, t * u.Z * u.Z + c);
    }

    /// <summary>An oblique-axial grid (tilted about the left-right axis) centred on the gland centre.</summary>
    internal static Geometry GridGeometry(PhantomGrid grid, double tiltDeg, Vec3 centreMm)
    {
        double a = tiltDeg * Math.PI / 180;
        var direction = Mat3.FromColumns(new Vec3(1, 0, 0), new Vec3(0, Math.Cos(a), Math.Sin(a)), new Vec3(0, -Math.Sin(a), Math.Cos(a)));
        var half = new Vec3((grid.SizeX - 1) / 2.0, (grid.SizeY - 1) / 2.0, (grid.SizeZ - 1) / 2.0);
        var origin = centreMm - direction * Mat3.Diagonal(grid.Spacing) * half;
        return new Geometry(grid.Size, grid.Spacing, origin, direction);
    }

    private static PhantomVisit GenerateVisit(PhantomSpec spec, int k, AffineTransform toVisit, int maxDegree)
    {
        double radius = LesionRadius(spec, k);
        var anatomy = new PhantomAnatomy(spec, radius);
        var centre = new Vec3(spec.GlandCentreMm[0], spec.GlandCentreMm[1], spec.GlandCentreMm[2]);
        var motion = new PhantomMotion(toVisit, Deformation(spec, k), centre);
        var renderer = new PhantomRenderer(spec, anatomy, motion);
        var t2Geometry = GridGeometry(spec.T2Grid, spec.ObliqueTiltDeg, centre);
        var t2 = renderer.RenderT2(t2Geometry, out var gland, out var zones, out var lesion, maxDegree);
        new RicianNoise(NoiseSeed(spec, k, 0)).Apply(t2.Voxels, spec.PeripheralZone.T2Signal / spec.Snr);

        var dwiGeometry = GridGeometry(spec.DwiGrid, spec.ObliqueTiltDeg, centre);
        var dwi = new List<DwiImage>();
        var signals = renderer.RenderDwi(dwiGeometry, spec.BValues, maxDegree);
        for (int i = 0; i < spec.BValues.Length; i++)
        {
            new RicianNoise(NoiseSeed(spec, k, i + 1)).Apply(signals[i].Voxels, spec.PeripheralZone.DwiS0 / spec.DwiSnr);
            dwi.Add(new DwiImage(spec.BValues[i], signals[i]));
        }
        var adc = AdcFitter.Fit(dwi, null, ScannerAdcOptions(spec, maxDegree)).AdcUm2PerS;
        var date = VisitDate(spec, k);
        var truth = Truth(spec, k, motion, toVisit, anatomy, radius, gland, lesion, date);
        var t2Acq = new AcquisitionInfo(3.0, "Serimetry digital phantom", "analytic", 4000, 100, spec.T2Grid.SpacingZMm, "T2W TSE oblique axial (phantom)", "MR");
        var dwiAcq = new AcquisitionInfo(3.0, "Serimetry digital phantom", "analytic", 4500, 70, spec.DwiGrid.SpacingZMm, "DWI (phantom)", "MR");
        return new PhantomVisit(k, date, t2, dwi, adc, gland, zones, lesion, t2Acq, dwiAcq, truth);
    }

    /// <summary>
    /// The scanner-style ADC map uses the b-values up to 1000 s/mm² when at least two exist (PI-RADS v2.1 advice,
    /// facts.md §4: lowest b 0-100, highest 800-1000, higher b not used for the ADC), else the default selection.
    /// </summary>
    private static AdcFitOptions ScannerAdcOptions(PhantomSpec spec, int maxDegree)
    {
        var bs = spec.BValues.Where(b => b <= 1000).Distinct().ToList();
        return bs.Count >= 2
            ? new AdcFitOptions(AdcFitMethod.WeightedLogLinear, BValues: bs, MaxDegreeOfParallelism: maxDegree)
            : new AdcFitOptions(AdcFitMethod.WeightedLogLinear, MinBValue: 0, MaxDegreeOfParallelism: maxDegree);
    }

    private static int NoiseSeed(PhantomSpec spec, int visit, int channel) => unchecked((spec.NoiseSeed ?? spec.Seed) * 7919 + visit * 101 + channel * 13 + 1);

    internal static DateOnly VisitDate(PhantomSpec spec, int k) =>
        DateOnly.ParseExact(spec.FirstVisitDate, "yyyy-MM-dd").AddMonths(k * spec.VisitIntervalMonths);

    /// <summary>Visit k's deformation (none at baseline or when the amplitude is 0); phases from the seed.</summary>
    private static PhantomDeformation? Deformation(PhantomSpec spec, int k)
    {
        if (k == 0 || spec.DeformationMm <= 0) return null;
        var rng = new Random(unchecked(spec.Seed * 31 + k));
        return new PhantomDeformation(spec.DeformationMm, spec.DeformationWavelengthMm,
            new Vec3(2 * Math.PI * rng.NextDouble(), 2 * Math.PI * rng.NextDouble(), 2 * Math.PI * rng.NextDouble()));
    }

    private static PhantomVisitTruth Truth(PhantomSpec spec, int k, PhantomMotion motion, AffineTransform toVisit, PhantomAnatomy anatomy, double radius,
        Volume<byte> gland, Volume<byte> lesion, DateOnly date)
    {
        double voxelMl = gland.Geometry.VoxelVolumeMm3 / 1000;
        var g = anatomy.GlandSemiAxes;
        var centre = new Vec3(spec.GlandCentreMm[0], spec.GlandCentreMm[1], spec.GlandCentreMm[2]);
        var tissues = new Dictionary<string, double>
        {
            ["peripheralZone"] = spec.PeripheralZone.AdcUm2PerS,
            ["transitionZone"] = spec.TransitionZone.AdcUm2PerS,
            ["lesion"] = spec.Lesion.AdcUm2PerS,
            ["muscle"] = spec.Muscle.AdcUm2PerS,
            ["urine"] = spec.Urine.AdcUm2PerS,
            ["rectalWall"] = spec.RectalWall.AdcUm2PerS,
            ["fat"] = spec.Fat.AdcUm2PerS,
        };
        return new PhantomVisitTruth(toVisit,
            4.0 / 3 * Math.PI * radius * radius * radius / 1000, Count(lesion) * voxelMl,
            4.0 / 3 * Math.PI * g.X * g.Y * g.Z / 1000, Count(gland) * voxelMl,
            radius, motion.BaselineToVisit(centre + anatomy.LesionOffset), motion.BaselineToVisit(centre),
            spec.Lesion.AdcUm2PerS, tissues, spec.Snr, spec.DwiSnr,
            spec.PsaNgPerMl.Length > k ? spec.PsaNgPerMl[k] : null, date, motion.Deformation);
    }

    private static long Count(Volume<byte> mask)
    {
        long n = 0;
        foreach (var b in mask.Voxels) if (b != 0) n++;
        return n;
    }
}
