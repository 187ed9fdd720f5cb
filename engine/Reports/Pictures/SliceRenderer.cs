using Serimetry.Engine.Core;

namespace Serimetry.Engine.Reports.Pictures;

/// <summary>An outline to draw over a slice: the in-plane boundary of a mask's non-zero voxels.</summary>
internal sealed record OutlineLayer(Volume<byte> Mask, byte R, byte G, byte B);

/// <summary>An in-plane rectangle of voxels: columns [I0, I0+Width), rows [J0, J0+Height).</summary>
internal readonly record struct SliceRegion(int I0, int J0, int Width, int Height)
{
    public static SliceRegion Whole(Size3 s) => new(0, 0, s.X, s.Y);
}

/// <summary>
/// Renders one z-slice of a volume in grey levels with mask outlines, each voxel drawn as a block of
/// <c>scale</c> pixels (x to the right, y downwards, as stored). Outlines follow voxel edges, so they show
/// exactly which voxels a mask holds.
/// </summary>
internal static class SliceRenderer
{
    public static RgbImage Render(Volume<float> image, int k, IReadOnlyList<OutlineLayer> outlines, int scale,
        SliceRegion? region = null, (float Low, float High)? window = null)
    {
        var size = image.Size;
        if ((uint)k >= (uint)size.Z) throw new ArgumentOutOfRangeException(nameof(k));
        foreach (var o in outlines) image.Geometry.RequireCongruent(o.Mask.Geometry, "picture image and outline mask");
        var r = region ?? SliceRegion.Whole(size);
        var (lo, hi) = window ?? Window(image.Slice(k));
        var pic = new RgbImage(r.Width * scale, r.Height * scale);
        var slice = image.Slice(k);
        float range = Math.Max(hi - lo, 1e-6f);
        for (int j = 0; j < r.Height; j++)
        {
            for (int i = 0; i < r.Width; i++)
            {
                float raw = slice[(j + r.J0) * size.X + i + r.I0];
                float v = float.IsFinite(raw) ? (raw - lo) / range : 0f;
                byte g = (byte)Math.Clamp(MathF.Round(v * 255f), 0, 255);
                for (int dy = 0; dy < scale; dy++)
                    for (int dx = 0; dx < scale; dx++)
                        pic.SetGray(i * scale + dx, j * scale + dy, g);
            }
        }
        foreach (var layer in outlines) DrawOutline(pic, layer, k, scale, r);
        return pic;
    }

    /// <summary>Grey window from the 1st to the 99.5th percentile of the finite non-zero values.</summary>
    public static (float Low, float High) Window(ReadOnlySpan<float> values)
    {
        var list = new List<float>(values.Length);
        foreach (var v in values) if (float.IsFinite(v) && v != 0) list.Add(v);
        if (list.Count == 0) return (0, 1);
        list.Sort();
        float lo = list[(int)(0.01 * (list.Count - 1))];
        float hi = list[(int)(0.995 * (list.Count - 1))];
        return hi > lo ? (lo, hi) : (lo, lo + 1);
    }

    private static void DrawOutline(RgbImage pic, OutlineLayer layer, int k, int scale, SliceRegion region)
    {
        var size = layer.Mask.Size;
        var voxels = layer.Mask.Voxels;
        int sliceStart = k * size.X * size.Y;
        bool In(int i, int j) => i >= 0 && j >= 0 && i < size.X && j < size.Y && voxels[sliceStart + j * size.X + i] != 0;
        for (int j = 0; j < size.Y; j++)
        {
            for (int i = 0; i < size.X; i++)
            {
                if (!In(i, j) || i < region.I0 || j < region.J0 || i >= region.I0 + region.Width || j >= region.J0 + region.Height) continue;
                int x0 = (i - region.I0) * scale, y0 = (j - region.J0) * scale, x1 = x0 + scale - 1, y1 = y0 + scale - 1;
                if (!In(i - 1, j)) VLine(pic, x0, y0, y1, layer);
                if (!In(i + 1, j)) VLine(pic, x1, y0, y1, layer);
                if (!In(i, j - 1)) HLine(pic, y0, x0, x1, layer);
                if (!In(i, j + 1)) HLine(pic, y1, x0, x1, layer);
            }
        }
    }

    private static void VLine(RgbImage pic, int x, int y0, int y1, OutlineLayer c)
    {
        for (int y = y0; y <= y1; y++) pic.Set(x, y, c.R, c.G, c.B);
    }

    private static void HLine(RgbImage pic, int y, int x0, int x1, OutlineLayer c)
    {
        for (int x = x0; x <= x1; x++) pic.Set(x, y, c.R, c.G, c.B);
    }
}
