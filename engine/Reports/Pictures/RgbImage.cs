namespace Serimetry.Engine.Reports.Pictures;

/// <summary>An 8-bit RGB raster (row-major, 3 bytes per pixel) for report pictures.</summary>
internal sealed class RgbImage
{
    public RgbImage(int width, int height)
    {
        if (width <= 0 || height <= 0 || (long)width * height > 16_000_000)
            throw new ArgumentOutOfRangeException(nameof(width), "picture size out of range");
        Width = width;
        Height = height;
        Pixels = new byte[width * height * 3];
    }

    public int Width { get; }
    public int Height { get; }
    public byte[] Pixels { get; }

    public void Set(int x, int y, byte r, byte g, byte b)
    {
        if ((uint)x >= (uint)Width || (uint)y >= (uint)Height) return;
        int o = (y * Width + x) * 3;
        Pixels[o] = r;
        Pixels[o + 1] = g;
        Pixels[o + 2] = b;
    }

    public void SetGray(int x, int y, byte v) => Set(x, y, v, v, v);

    public byte[] ToPng() => PngEncoder.EncodeRgb(this);
}
