using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Morphology;

/// <summary>
/// Morphological features (IBSI 3.1, family HCUG) of the morphological mask's marching-cubes mesh and
/// voxel positions; integrated intensity, centre-of-mass shift and Moran's I / Geary's C also use the
/// intensity mask. All lengths in mm, areas mm², volumes mm³.
/// </summary>
internal static class MorphologyFeatures
{
    public static void Compute(RoiData roi, RadiomicsSettings settings, FeatureSink sink)
    {
        var mesh = SurfaceMesh.Build(roi);
        double v = mesh.VolumeMm3, a = mesh.AreaMm2;
        var sp = roi.SpacingMm;
        void Add(string name, string code, double value) => sink.Add(FamilyNames.Morphology, name, code, IbsiAggregation.None, value);
        Add("Volume (mesh)", "RNU0", v);
        Add("Volume (voxel counting)", "YEKZ", roi.MorphVoxelCount * sp.X * sp.Y * sp.Z);
        Add("Surface area (mesh)", "C0JK", a);
        Add("Surface to volume ratio", "2PR5", a / v);
        Add("Compactness 1", "SKGS", v / (Math.Sqrt(Math.PI) * Math.Pow(a, 1.5)));
        Add("Compactness 2", "BQWJ", 36 * Math.PI * v * v / (a * a * a));
        double sphereArea = Math.Cbrt(36 * Math.PI * v * v);
        Add("Spherical disproportion", "KRCK", a / sphereArea);
        Add("Sphericity", "QCFX", sphereArea / a);
        Add("Asphericity", "25C7", Math.Cbrt(a * a * a / (36 * Math.PI * v * v)) - 1);
        Add("Centre of mass shift", "KLMA", CentreOfMassShift(roi));
        var pts = ToMm(mesh.DoubledVertices, sp);
        var hull = ConvexHull.Measure(mesh.DoubledVertices, sp);
        // The farthest pair of mesh vertices are both convex-hull vertices (IBSI 3.1.11).
        var hullMm = ToMm([.. hull.Vertices], sp);
        Add("Maximum 3D diameter", "L0JK", MaxDiameter(hullMm));
        var lambda = PrincipalVariances(roi);
        Add("Major axis length", "TDIC", 4 * Math.Sqrt(lambda[0]));
        Add("Minor axis length", "P9VJ", 4 * Math.Sqrt(lambda[1]));
        Add("Least axis length", "7J51", 4 * Math.Sqrt(lambda[2]));
        Add("Elongation", "Q3CK", Math.Sqrt(lambda[1] / lambda[0]));
        Add("Flatness", "N17B", Math.Sqrt(lambda[2] / lambda[0]));
        var (bv, ba) = AxisAlignedBox(pts);
        Add("Volume density (axis-aligned bounding box)", "PBX1", v / bv);
        Add("Area density (axis-aligned bounding box)", "R59B", a / ba);
        double ea = 2 * Math.Sqrt(lambda[0]), eb = 2 * Math.Sqrt(lambda[1]), ec = 2 * Math.Sqrt(lambda[2]);
        Add("Volume density (approximate enclosing ellipsoid)", "6BDE", v / (4 * Math.PI * ea * eb * ec / 3));
        Add("Area density (approximate enclosing ellipsoid)", "RDD2", a / EllipsoidArea(ea, eb, ec));
        var mvee = EnclosingEllipsoid.SemiAxes(hullMm);
        // IBSI publishes no reference value for the MVEE densities (not standardised); computed for completeness.
        Add("Volume density (minimum volume enclosing ellipsoid)", "SWZ1", v / (4 * Math.PI * mvee[0] * mvee[1] * mvee[2] / 3));
        Add("Area density (minimum volume enclosing ellipsoid)", "BRI8", a / EllipsoidArea(mvee[0], mvee[1], mvee[2]));
        Add("Volume density (convex hull)", "R3ER", v / hull.VolumeMm3);
        Add("Area density (convex hull)", "7T7F", a / hull.AreaMm2);
        Add("Integrated intensity", "99N0", MeanIntensity(roi) * v);
        var (moran, geary) = SpatialAutocorrelation.Compute(roi, settings.SpatialAutocorrelationMaxVoxels);
        Add("Moran's I index", "N365", moran);
        Add("Geary's C measure", "NPT7", geary);
    }

    private static double[] ToMm(List<long> doubled, Core.Vec3 sp)
    {
        var p = new double[doubled.Count];
        for (int n = 0; n < p.Length; n += 3)
        {
            p[n] = 0.5 * doubled[n] * sp.X; p[n + 1] = 0.5 * doubled[n + 1] * sp.Y; p[n + 2] = 0.5 * doubled[n + 2] * sp.Z;
        }
        return p;
    }

    private static double MeanIntensity(RoiData roi)
    {
        double sum = 0;
        for (int n = 0; n < roi.Count; n++) if (roi.InRoi[n] != 0) sum += roi.Intensity[n];
        return sum / roi.RoiVoxelCount;
    }

    // IBSI 3.1.10: distance between the morphological-mask centroid and the intensity-weighted intensity-mask centroid.
    private static double CentreOfMassShift(RoiData roi)
    {
        double gx = 0, gy = 0, gz = 0, ix = 0, iy = 0, iz = 0, wsum = 0;
        for (int z = 0, n = 0; z < roi.Nz; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++, n++)
        {
            if (roi.Morph[n] != 0) { gx += x; gy += y; gz += z; }
            if (roi.InRoi[n] == 0) continue;
            double w = roi.Intensity[n];
            ix += w * x; iy += w * y; iz += w * z; wsum += w;
        }
        double m = roi.MorphVoxelCount, sp0 = roi.SpacingMm.X, sp1 = roi.SpacingMm.Y, sp2 = roi.SpacingMm.Z;
        double dx = (gx / m - ix / wsum) * sp0, dy = (gy / m - iy / wsum) * sp1, dz = (gz / m - iz / wsum) * sp2;
        return Math.Sqrt(dx * dx + dy * dy + dz * dz);
    }

    private static double MaxDiameter(double[] p)
    {
        double best = 0;
        for (int i = 0; i < p.Length; i += 3)
        for (int j = i + 3; j < p.Length; j += 3)
        {
            double dx = p[i] - p[j], dy = p[i + 1] - p[j + 1], dz = p[i + 2] - p[j + 2];
            double d = dx * dx + dy * dy + dz * dz;
            if (d > best) best = d;
        }
        return Math.Sqrt(best);
    }

    // Eigenvalues (descending) of the covariance of morphological-mask voxel centres in mm (IBSI 3.1.12).
    private static double[] PrincipalVariances(RoiData roi)
    {
        double n = roi.MorphVoxelCount, mx = 0, my = 0, mz = 0;
        var sp = roi.SpacingMm;
        for (int z = 0, i = 0; z < roi.Nz; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++, i++)
            if (roi.Morph[i] != 0) { mx += x * sp.X; my += y * sp.Y; mz += z * sp.Z; }
        mx /= n; my /= n; mz /= n;
        var c = new double[3, 3];
        for (int z = 0, i = 0; z < roi.Nz; z++)
        for (int y = 0; y < roi.Ny; y++)
        for (int x = 0; x < roi.Nx; x++, i++)
        {
            if (roi.Morph[i] == 0) continue;
            double dx = x * sp.X - mx, dy = y * sp.Y - my, dz = z * sp.Z - mz;
            c[0, 0] += dx * dx; c[0, 1] += dx * dy; c[0, 2] += dx * dz;
            c[1, 1] += dy * dy; c[1, 2] += dy * dz; c[2, 2] += dz * dz;
        }
        c[1, 0] = c[0, 1]; c[2, 0] = c[0, 2]; c[2, 1] = c[1, 2];
        // Sample covariance (N − 1), which reproduces the IBSI consensus axis lengths of the digital phantom.
        for (int r = 0; r < 3; r++) for (int k = 0; k < 3; k++) c[r, k] /= Math.Max(1, n - 1);
        var values = SymmetricEigen.Values(c);
        for (int k = 0; k < 3; k++) values[k] = Math.Max(0, values[k]);
        return values;
    }

    private static (double Volume, double Area) AxisAlignedBox(double[] p)
    {
        double x0 = double.MaxValue, y0 = double.MaxValue, z0 = double.MaxValue, x1 = double.MinValue, y1 = double.MinValue, z1 = double.MinValue;
        for (int i = 0; i < p.Length; i += 3)
        {
            x0 = Math.Min(x0, p[i]); x1 = Math.Max(x1, p[i]);
            y0 = Math.Min(y0, p[i + 1]); y1 = Math.Max(y1, p[i + 1]);
            z0 = Math.Min(z0, p[i + 2]); z1 = Math.Max(z1, p[i + 2]);
        }
        double a = x1 - x0, b = y1 - y0, c = z1 - z0;
        return (a * b * c, 2 * (a * b + a * c + b * c));
    }

    /// <summary>
    /// Ellipsoid surface area with semi-axes a ≥ b ≥ c by the Legendre series IBSI 3.1.19 gives
    /// (20 terms): 4πab Σ (αβ)^ν P_ν((α²+β²)/(2αβ)) / (1 − 4ν²), α² = 1 − b²/a², β² = 1 − c²/a².
    /// </summary>
    internal static double EllipsoidArea(double a, double b, double c)
    {
        if (!(a > 0)) return double.NaN;
        double alpha2 = 1 - b * b / (a * a), beta2 = 1 - c * c / (a * a);
        double u2 = alpha2 * beta2, half = 0.5 * (alpha2 + beta2);
        // Q_ν = (αβ)^ν P_ν(x): Q_{ν+1} = ((2ν+1)·(xαβ)·Q_ν − ν·(αβ)²·Q_{ν−1})/(ν+1), xαβ = (α²+β²)/2.
        double qPrev = 1, q = half, sum = 1 + q / (1 - 4.0);
        for (int nu = 1; nu < 20; nu++)
        {
            double qNext = ((2 * nu + 1) * half * q - nu * u2 * qPrev) / (nu + 1);
            qPrev = q; q = qNext;
            sum += q / (1 - 4.0 * (nu + 1) * (nu + 1));
        }
        return 4 * Math.PI * a * b * sum;
    }
}
