using Serimetry.Engine.Core;

namespace Serimetry.Engine.Registration.Interpolation;

/// <summary>Nearest-voxel lookup of a mask at physical points; points off the grid are outside.</summary>
internal sealed class MaskLookup(Volume<byte> mask)
{
    private readonly byte[] _v = mask.Voxels;
    private readonly Geometry _g = mask.Geometry;

    public bool Inside(Vec3 pointMm)
    {
        var c = _g.PhysicalToIndex(pointMm);
        int i = (int)Math.Round(c.X), j = (int)Math.Round(c.Y), k = (int)Math.Round(c.Z);
        if (i < 0 || j < 0 || k < 0 || i >= _g.Size.X || j >= _g.Size.Y || k >= _g.Size.Z) return false;
        return _v[i + _g.Size.X * (j + _g.Size.Y * k)] != 0;
    }
}
