using Serimetry.Engine.Core;

namespace Serimetry.Engine.Phantoms;

/// <summary>Tissue classes of the digital phantom (also the values of its internal label map).</summary>
public enum PhantomTissue : byte
{
    Air = 0,
    Fat = 1,
    Muscle = 2,
    Urine = 3,
    RectalWall = 4,
    RectalGas = 5,
    PeripheralZone = 6,
    TransitionZone = 7,
    Lesion = 8,
}

/// <summary>
/// Analytic pelvic anatomy in baseline LPS mm (x left, y posterior, z head), relative to the gland centre:
/// body (elliptic cylinder of fat), prostate ellipsoid with a transition-zone ellipsoid inside it and the rest
/// peripheral zone, a spherical lesion, bladder (urine ellipsoid above the gland), rectum (cylinder behind the
/// gland: wall and gas lumen), left and right obturator internus muscles. Evaluated per voxel centre.
/// </summary>
internal sealed class PhantomAnatomy
{
    private readonly Vec3 _c;
    private readonly Vec3 _gland;
    private readonly Vec3 _lesionCentre;
    private readonly double _lesionR2;
    private readonly (Vec3 K, double Phase)[] _waves;
    private readonly double _textureAmplitude;

    internal PhantomAnatomy(PhantomSpec spec, double lesionRadiusMm)
    {
        _c = new Vec3(spec.GlandCentreMm[0], spec.GlandCentreMm[1], spec.GlandCentreMm[2]);
        _gland = new Vec3(spec.GlandSemiAxesMm[0], spec.GlandSemiAxesMm[1], spec.GlandSemiAxesMm[2]);
        _lesionCentre = new Vec3(spec.LesionOffsetMm[0], spec.LesionOffsetMm[1], spec.LesionOffsetMm[2]);
        _lesionR2 = lesionRadiusMm * lesionRadiusMm;
        _textureAmplitude = spec.TextureAmplitude;
        var rng = new Random(spec.Seed ^ 0x5EED);
        _waves = new (Vec3, double)[3];
        for (int i = 0; i < _waves.Length; i++)
        {
            var dir = new Vec3(rng.NextDouble() - 0.5, rng.NextDouble() - 0.5, rng.NextDouble() - 0.5).Normalized();
            double wavelength = 7 + 8 * rng.NextDouble();
            _waves[i] = (dir * (2 * Math.PI / wavelength), 2 * Math.PI * rng.NextDouble());
        }
    }

    /// <summary>Lesion centre relative to the gland centre.</summary>
    internal Vec3 LesionOffset => _lesionCentre;

    /// <summary>Gland semi-axes (mm).</summary>
    internal Vec3 GlandSemiAxes => _gland;

    internal PhantomTissue Classify(Vec3 pointMm)
    {
        var p = pointMm - _c;
        if (InGland(p))
        {
            var d = p - _lesionCentre;
            if (d.Dot(d) <= _lesionR2) return PhantomTissue.Lesion;
            return InTransitionZone(p) ? PhantomTissue.TransitionZone : PhantomTissue.PeripheralZone;
        }
        if (Ellipsoid(p, new Vec3(0, -8, 42), new Vec3(32, 26, 24))) return PhantomTissue.Urine;
        double rx = p.X, ry = p.Y - 34, rr = rx * rx + ry * ry;
        if (rr <= 14 * 14 && Math.Abs(p.Z) <= 45) return rr <= 10 * 10 ? PhantomTissue.RectalGas : PhantomTissue.RectalWall;
        if (Ellipsoid(p, new Vec3(44, 2, -5), new Vec3(9, 26, 30)) || Ellipsoid(p, new Vec3(-44, 2, -5), new Vec3(9, 26, 30)))
            return PhantomTissue.Muscle;
        double bx = p.X / 150, by = (p.Y + 5) / 105;
        return bx * bx + by * by <= 1 ? PhantomTissue.Fat : PhantomTissue.Air;
    }

    /// <summary>The zone label (1 = PZ, 2 = TZ) of a point inside the gland, ignoring the lesion; 0 outside.</summary>
    internal byte Zone(Vec3 pointMm)
    {
        var p = pointMm - _c;
        if (!InGland(p)) return 0;
        return InTransitionZone(p) ? (byte)2 : (byte)1;
    }

    /// <summary>Smooth multiplicative gland texture 1 + A·mean of three plane waves (moves with the anatomy).</summary>
    internal double Texture(Vec3 pointMm)
    {
        var p = pointMm - _c;
        double s = 0;
        foreach (var (k, phase) in _waves) s += Math.Sin(k.Dot(p) + phase);
        return 1 + _textureAmplitude * s / _waves.Length;
    }

    private bool InGland(Vec3 p) => Ellipsoid(p, Vec3.Zero, _gland);

    private static bool InTransitionZone(Vec3 p) => Ellipsoid(p, new Vec3(0, -6, 3), new Vec3(13, 8, 12));

    private static bool Ellipsoid(Vec3 p, Vec3 centre, Vec3 semi)
    {
        double x = (p.X - centre.X) / semi.X, y = (p.Y - centre.Y) / semi.Y, z = (p.Z - centre.Z) / semi.Z;
        return x * x + y * y + z * z <= 1;
    }

    /// <summary>Whether a sphere of the given radius around the lesion centre lies inside the gland (checked on 2562 surface points); a grown lesion may cross into the TZ.</summary>
    internal bool LesionFitsInGland(double radiusMm)
    {
        for (int i = 0; i < 2562; i++)
        {
            double z = 1 - 2.0 * (i + 0.5) / 2562, r = Math.Sqrt(1 - z * z), phi = i * Math.PI * (3 - Math.Sqrt(5));
            var p = _lesionCentre + new Vec3(r * Math.Cos(phi), r * Math.Sin(phi), z) * radiusMm;
            if (!InGland(p)) return false;
        }
        return true;
    }
}
