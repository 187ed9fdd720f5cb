using System.Text.Json;
using System.Text.Json.Nodes;
using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration;

/// <summary>A transform read back from transform.json, with the quality figures stored beside it.</summary>
public sealed record StoredTransform(string Type, AffineTransform Transform, double? MetricBefore, double? MetricAfter,
    string? StopReason, IReadOnlyList<string> Warnings)
{
    /// <summary>The B-spline part of a <c>"bspline"</c> transform (its bulk equals <see cref="Transform"/>), else null.</summary>
    public BSplineDeformation? Deformation { get; init; }
}

/// <summary>
/// transform.json: <c>{"type": "translation|rigid|affine", "matrix": [16 numbers, 4x4 row-major, fixed LPS mm →
/// moving LPS mm], "quality": {...}, "settings": {...}, "software": {...}}</c>. The matrix is the whole contract
/// for the affine types; the rest documents how it was obtained. Type <c>"bspline"</c> adds a <c>bspline</c> block
/// (see <see cref="BSplineJson"/>): the map is matrix·x + u(x), u the cubic B-spline displacement.
/// </summary>
public static class TransformFile
{
    private static readonly JsonSerializerOptions Indented = new() { WriteIndented = true };

    /// <summary>Writes the result as transform.json.</summary>
    public static void Write(string path, RegistrationResult result) => File.WriteAllText(path, ToJson(result));

    /// <summary>The transform.json text of a result.</summary>
    public static string ToJson(RegistrationResult r)
    {
        var o = r.Settings;
        var root = new JsonObject
        {
            ["type"] = r.TransformType,
            ["matrix"] = Numbers(r.Transform.ToMatrix4x4()),
            ["convention"] = "maps a fixed-image point (LPS, mm) to the moving-image point (LPS, mm); row-major 4x4",
            ["centerOfRotationMm"] = Numbers(r.CenterOfRotationMm.ToArray()),
            ["parameters"] = Parameters(r),
            ["quality"] = new JsonObject
            {
                ["metric"] = r.MetricName,
                ["metricBefore"] = Finite(r.MetricBefore),
                ["metricAfter"] = Finite(r.MetricAfter),
                ["rotationDeg"] = Finite(r.RotationDeg),
                ["shiftMm"] = Finite(r.ShiftMm),
                ["iterations"] = new JsonArray(r.Levels.Select(l => (JsonNode?)l.Iterations).ToArray()),
                ["stopReasons"] = new JsonArray(r.Levels.Select(l => (JsonNode?)l.StopReason.ToString()).ToArray()),
                ["stopReason"] = r.StopReason.ToString(),
                ["warnings"] = new JsonArray(r.Warnings.Select(w => (JsonNode?)w).ToArray()),
                ["elapsedSeconds"] = r.ElapsedSeconds,
            },
            ["settings"] = new JsonObject
            {
                ["preset"] = o.Preset,
                ["transform"] = o.Transform.ToString(),
                ["metric"] = o.Metric.ToString(),
                ["histogramBins"] = o.HistogramBins,
                ["optimizer"] = o.Optimizer.ToString(),
                ["initialization"] = o.Initialization.ToString(),
                ["seed"] = o.Seed,
                ["maskDilationMm"] = o.MaskDilationMm,
                ["correctBias"] = o.CorrectBias,
                ["levels"] = new JsonArray(r.Levels.Select(Level).ToArray()),
            },
            ["software"] = new JsonObject { ["name"] = SoftwareInfo.Name, ["version"] = SoftwareInfo.Version },
        };
        if (r.Deformation is { } d)
        {
            root["bspline"] = BSplineJson.ToJson(d);
            root["quality"]!["deformationLevels"] = new JsonArray(r.DeformationLevels.Select(Level).ToArray());
            root["quality"]!["deformationMetric"] = r.DeformationMetricName;
            if (r.AbsorbedChange is { } absorbed) root["quality"]!["absorbedChange"] = Finite(absorbed);
        }
        return root.ToJsonString(Indented);
    }

    /// <summary>Reads transform.json; throws <see cref="InputFormatException"/> when it is malformed.</summary>
    public static StoredTransform Read(string path)
    {
        JsonNode? root;
        try
        {
            root = JsonNode.Parse(File.ReadAllText(path));
        }
        catch (JsonException e)
        {
            throw new InputFormatException($"not valid JSON: {e.Message}", Path.GetFileName(path), "supply a transform.json written by Serimetry", e);
        }
        try
        {
            var type = root?["type"]?.GetValue<string>() ?? throw Missing(path, "type");
            var m = root["matrix"]?.AsArray() ?? throw Missing(path, "matrix");
            var matrix = m.Select(n => n?.GetValue<double>() ?? double.NaN).ToArray();
            var q = root["quality"];
            var warnings = q?["warnings"]?.AsArray().Select(n => n?.GetValue<string>() ?? "").ToArray() ?? [];
            var affine = AffineTransform.FromMatrix4x4(matrix);
            var bspline = type == "bspline" ? BSplineJson.Read(root["bspline"] ?? throw Missing(path, "bspline"), affine, Path.GetFileName(path)) : null;
            return new StoredTransform(type, affine, q?["metricBefore"]?.GetValue<double>(),
                q?["metricAfter"]?.GetValue<double>(), q?["stopReason"]?.GetValue<string>(), warnings) { Deformation = bspline };
        }
        catch (Exception e) when (e is InvalidOperationException or FormatException)
        {
            throw new InputFormatException($"unexpected content: {e.Message}", Path.GetFileName(path), "supply a transform.json written by Serimetry", e);
        }
    }

    private static InputFormatException Missing(string path, string field) =>
        new($"the field '{field}' is missing", Path.GetFileName(path), "supply a transform.json written by Serimetry");

    internal static JsonArray Numbers(double[] v) => new(v.Select(x => (JsonNode?)x).ToArray());

    private static JsonNode? Finite(double v) => double.IsFinite(v) ? v : null;

    private static JsonObject Parameters(RegistrationResult r)
    {
        var o = new JsonObject();
        for (int i = 0; i < r.Parameters.Count; i++) o[r.ParameterNames[i]] = Finite(r.Parameters[i]);
        return o;
    }

    private static JsonNode? Level(LevelReport l) => new JsonObject
    {
        ["fixedShrink"] = Numbers([l.FixedShrink.X, l.FixedShrink.Y, l.FixedShrink.Z]),
        ["movingShrink"] = Numbers([l.MovingShrink.X, l.MovingShrink.Y, l.MovingShrink.Z]),
        ["fixedSigmaMm"] = Numbers(l.FixedSigmaMm.ToArray()),
        ["samples"] = l.Samples,
        ["seed"] = l.Seed,
        ["iterations"] = l.Iterations,
        ["stopReason"] = l.StopReason.ToString(),
        ["metricStart"] = Finite(l.MetricStart),
        ["metricEnd"] = Finite(l.MetricEnd),
    };
}
