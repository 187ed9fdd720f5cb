using System.Text.Json;
using System.Text.Json.Serialization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Phantoms;

/// <summary>A voxel grid of the phantom: voxel counts and spacing (mm) along the index axes.</summary>
public sealed record PhantomGrid(int SizeX, int SizeY, int SizeZ, double SpacingXMm, double SpacingYMm, double SpacingZMm)
{
    internal Size3 Size => new(SizeX, SizeY, SizeZ);
    internal Vec3 Spacing => new(SpacingXMm, SpacingYMm, SpacingZMm);
}

/// <summary>Signal and diffusion properties of one tissue.</summary>
/// <param name="T2Signal">T2-weighted signal (arbitrary units).</param>
/// <param name="DwiS0">DWI signal at b = 0 (arbitrary units).</param>
/// <param name="AdcUm2PerS">ADC in 10⁻⁶ mm²/s.</param>
public sealed record TissueProperties(double T2Signal, double DwiS0, double AdcUm2PerS);

/// <summary>
/// Everything that defines a digital phantom subject, serialised as JSON in <c>phantoms/*.json</c> so a QA
/// physicist can re-create exactly the same phantom years later (same seed → same voxels). Anatomy sits in
/// baseline LPS millimetres with the gland centre at <see cref="GlandCentreMm"/>.
/// Default tissue ADCs follow published prostate values (facts.md §3-4): PZ ≈ 1600, TZ ≈ 1300, lesion ≈ 800
/// (Jafar et al., World J Radiol 2016: median PZ 1.64, central gland 1.31 ×10⁻³ mm²/s).
/// </summary>
public sealed record PhantomSpec
{
    public string SubjectId { get; init; } = "NSC-0007";
    public int Seed { get; init; } = 7;

    /// <summary>Seed of the image noise; null = derived from <see cref="Seed"/>. Re-acquisitions of one anatomy differ only here.</summary>
    public int? NoiseSeed { get; init; }
    public int Visits { get; init; } = 3;
    public string FirstVisitDate { get; init; } = "2022-03-14";
    public int VisitIntervalMonths { get; init; } = 18;

    /// <summary>Lesion volume factor per visit (volume at visit k = baseline × F^k).</summary>
    public double GrowthPerVisit { get; init; } = 1.3;
    public double MaxRotateDeg { get; init; } = 4;
    public double MaxShiftMm { get; init; } = 6;

    /// <summary>Amplitude of the optional mild deformation of follow-up visits (mm; 0 = rigid motion only).</summary>
    public double DeformationMm { get; init; }

    /// <summary>Wavelength of the deformation (mm).</summary>
    public double DeformationWavelengthMm { get; init; } = 80;

    /// <summary>T2w SNR: PZ signal / Gaussian σ of the Rician noise.</summary>
    public double Snr { get; init; } = 40;

    /// <summary>DWI SNR at b = 0: PZ S0 / σ.</summary>
    public double DwiSnr { get; init; } = 30;
    public PhantomGrid T2Grid { get; init; } = new(256, 256, 24, 0.6, 0.6, 3.0);
    public PhantomGrid DwiGrid { get; init; } = new(80, 80, 24, 2.0, 2.0, 3.0);

    /// <summary>Rotation of the slice planes about the left-right axis (oblique axial), degrees.</summary>
    public double ObliqueTiltDeg { get; init; } = 8;
    public double[] BValues { get; init; } = [50, 400, 800, 1400];
    public double[] GlandCentreMm { get; init; } = [0, 0, 0];
    public double[] GlandSemiAxesMm { get; init; } = [24, 17, 19];
    public double LesionRadiusMm { get; init; } = 5.5;

    /// <summary>Lesion centre relative to the gland centre (mm, LPS): posterior left peripheral zone by default.</summary>
    public double[] LesionOffsetMm { get; init; } = [11, 5, -3];
    public double[] PsaNgPerMl { get; init; } = [5.1, 5.8, 6.9];
    public double BiasFieldAmplitude { get; init; } = 0.15;
    public double TextureAmplitude { get; init; } = 0.05;
    public TissueProperties PeripheralZone { get; init; } = new(900, 700, 1600);
    public TissueProperties TransitionZone { get; init; } = new(550, 650, 1300);
    public TissueProperties Lesion { get; init; } = new(380, 750, 800);
    public TissueProperties Fat { get; init; } = new(650, 60, 500);
    public TissueProperties Muscle { get; init; } = new(250, 300, 1400);
    public TissueProperties Urine { get; init; } = new(1500, 900, 3000);
    public TissueProperties RectalWall { get; init; } = new(300, 400, 1200);
    public TissueProperties RectalGas { get; init; } = new(30, 20, 2000);

    internal static readonly JsonSerializerOptions Json = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.CamelCase,
        WriteIndented = true,
        ReadCommentHandling = JsonCommentHandling.Skip,
        AllowTrailingCommas = true,
        UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
    };

    /// <summary>Reads a spec from JSON; unknown fields are errors (a misspelt field must not silently fall back to a default).</summary>
    public static PhantomSpec Parse(string json, string where)
    {
        try
        {
            var spec = JsonSerializer.Deserialize<PhantomSpec>(json, Json)
                ?? throw new InputFormatException("the spec is null", where);
            spec.Validate(where);
            return spec;
        }
        catch (JsonException e)
        {
            throw new InputFormatException($"not a valid phantom spec ({e.Message})", where, "see phantoms/demo.json for the fields", e);
        }
    }

    /// <summary>Reads a spec file.</summary>
    public static PhantomSpec Load(string path)
    {
        if (!File.Exists(path)) throw new InputFormatException("phantom spec not found", path);
        return Parse(File.ReadAllText(path), Path.GetFileName(path));
    }

    /// <summary>The spec as indented JSON.</summary>
    public string ToJson() => JsonSerializer.Serialize(this, Json);

    /// <summary>Throws <see cref="InvalidParameterException"/> on out-of-range values.</summary>
    public void Validate(string where = "phantom spec")
    {
        void Check(bool ok, string what) { if (!ok) throw new InvalidParameterException(what, where); }
        Check(Visits is >= 1 and <= 20, $"visits must be 1-20, got {Visits}");
        Check(GrowthPerVisit is > 0 and <= 10, $"growth per visit must be in (0, 10], got {GrowthPerVisit}");
        Check(MaxRotateDeg is >= 0 and <= 45, $"max rotation must be 0-45 degrees, got {MaxRotateDeg}");
        Check(MaxShiftMm is >= 0 and <= 100, $"max shift must be 0-100 mm, got {MaxShiftMm}");
        Check(Snr > 0 && DwiSnr > 0, "SNR values must be positive");
        Check(DeformationMm is >= 0 and <= 5 && DeformationWavelengthMm >= 20 && 2 * Math.PI * DeformationMm / DeformationWavelengthMm < 0.5,
            "deformation amplitude must be 0-5 mm with wavelength ≥ 20 mm and 2π·A/λ < 0.5 (mild, invertible)");
        Check(Math.Abs(ObliqueTiltDeg) <= 45, "oblique tilt must be within ±45 degrees");
        Check(BValues.Length >= 2 && BValues.All(b => b >= 0 && double.IsFinite(b)), "at least two non-negative b-values are needed");
        Check(GlandCentreMm.Length == 3 && GlandSemiAxesMm.Length == 3 && LesionOffsetMm.Length == 3, "centre, semi-axes and offset need 3 numbers");
        Check(GlandSemiAxesMm.All(a => a > 2), "gland semi-axes must exceed 2 mm");
        Check(LesionRadiusMm > 0, "lesion radius must be positive");
        Check(PsaNgPerMl.Length == 0 || PsaNgPerMl.Length >= Visits, $"give one PSA value per visit ({Visits}) or none");
        Check(VisitIntervalMonths is >= 1 and <= 120, "visit interval must be 1-120 months");
        Check(DateOnly.TryParseExact(FirstVisitDate, "yyyy-MM-dd", out _), $"first visit date '{FirstVisitDate}' must be YYYY-MM-DD");
        foreach (var g in new[] { T2Grid, DwiGrid })
            Check(g.SizeX > 0 && g.SizeY > 0 && g.SizeZ > 0 && g.SpacingXMm > 0 && g.SpacingYMm > 0 && g.SpacingZMm > 0 && (long)g.SizeX * g.SizeY * g.SizeZ is > 0 and <= 1L << 26,
                "grid sizes must be positive (at most 2^26 voxels) with positive spacing");
    }
}
