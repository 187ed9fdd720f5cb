using System.Text.Json.Nodes;
using Serimetry.Engine.Core;
using Serimetry.Engine.Registration.Transforms;

namespace Serimetry.Engine.Registration;

/// <summary>
/// The <c>bspline</c> block of transform.json: <c>{"order": 3, "gridOriginMm": [x,y,z] (LPS, control point
/// 0,0,0), "gridSpacingMm": [3], "gridSize": [nx,ny,nz], "gridDirection": [9, row-major, columns = grid axes],
/// "coefficientsMm": {"x": [N], "y": [N], "z": [N]} (LPS displacement per control point, index
/// i + nx·(j + ny·k)), "composition": "T(x) = matrix·x + u(x)"}</c>.
/// </summary>
public static class BSplineJson
{
    /// <summary>The block for a deformation.</summary>
    public static JsonObject ToJson(BSplineDeformation d)
    {
        ArgumentNullException.ThrowIfNull(d);
        int n = d.PointCount;
        var c = d.CoefficientArray;
        JsonArray Part(int axis) => new(c.Skip(axis * n).Take(n).Select(v => (JsonNode?)v).ToArray());
        return new JsonObject
        {
            ["order"] = 3,
            ["composition"] = "T(x) = matrix·x + u(x); u(x) = Σ c_k β3(ξ(x) − k), ξ(x) = directionᵀ(x − origin)/spacing",
            ["gridOriginMm"] = TransformFile.Numbers(d.GridOriginMm.ToArray()),
            ["gridSpacingMm"] = TransformFile.Numbers(d.GridSpacingMm.ToArray()),
            ["gridSize"] = new JsonArray(d.GridSize.ToArray().Select(v => (JsonNode?)v).ToArray()),
            ["gridDirection"] = TransformFile.Numbers(d.GridDirection.ToRowMajor()),
            ["coefficientsMm"] = new JsonObject { ["x"] = Part(0), ["y"] = Part(1), ["z"] = Part(2) },
        };
    }

    /// <summary>Reads the block; throws <see cref="InputFormatException"/> when it is incomplete.</summary>
    public static BSplineDeformation Read(JsonNode block, AffineTransform bulk, string file)
    {
        ArgumentNullException.ThrowIfNull(block);
        double[] Nums(string name, int count)
        {
            var a = block[name]?.AsArray() ?? throw new InputFormatException($"bspline.{name} is missing", file, "supply a transform.json written by Serimetry");
            var v = a.Select(Number).ToArray();
            if (v.Length != count || v.Any(x => !double.IsFinite(x)))
                throw new InputFormatException($"bspline.{name} has {v.Length} values, expected {count} finite numbers", file, "supply a transform.json written by Serimetry");
            return v;
        }
        if (block["order"] is { } order && Number(order) != 3)
            throw new InputFormatException($"bspline.order is {order.ToJsonString()}; only cubic (3) is supported", file, "supply a cubic B-spline transform");
        var size = Nums("gridSize", 3);
        if (size.Any(v => v != Math.Floor(v) || v < 4 || v > 4096) || size[0] * size[1] * size[2] > 20_000_000)
            throw new InputFormatException($"bspline.gridSize [{string.Join(", ", size)}] is not a plausible control grid", file,
                "whole numbers of at least 4 control points per axis");
        var gridSize = new Size3((int)size[0], (int)size[1], (int)size[2]);
        var coeffs = block["coefficientsMm"] ?? throw new InputFormatException("bspline.coefficientsMm is missing", file, "supply a transform.json written by Serimetry");
        int n = (int)gridSize.Count;
        var all = new double[3 * n];
        string[] axes = ["x", "y", "z"];
        for (int d = 0; d < 3; d++)
        {
            var part = coeffs[axes[d]]?.AsArray() ?? throw new InputFormatException($"bspline.coefficientsMm.{axes[d]} is missing", file, "supply a transform.json written by Serimetry");
            if (part.Count != n || part.Any(x => !double.IsFinite(Number(x))))
                throw new InputFormatException($"bspline.coefficientsMm.{axes[d]} has {part.Count} values, expected {n} finite numbers for grid {gridSize}", file, "supply a transform.json written by Serimetry");
            for (int i = 0; i < n; i++) all[d * n + i] = Number(part[i]);
        }
        return new BSplineDeformation(bulk, Vec(Nums("gridOriginMm", 3)), Vec(Nums("gridSpacingMm", 3)), gridSize,
            Mat3.FromRowMajor(Nums("gridDirection", 9)), all);
    }

    /// <summary>A JSON number as double (NaN when it is not a number), whether parsed from text or built in memory.</summary>
    private static double Number(JsonNode? node) => node is JsonValue v
        ? v.TryGetValue(out double d) ? d : v.TryGetValue(out int i) ? i : v.TryGetValue(out long l) ? l : double.NaN
        : double.NaN;

    private static Vec3 Vec(double[] v) => new(v[0], v[1], v[2]);
}
