using Serimetry.Engine.Core;

namespace Serimetry.Engine.Measures;

/// <summary>Agreement of two outlines of the same object (e.g. re-fitted vs propagated lesion).</summary>
/// <param name="Dice">Dice similarity 2|A∩B|/(|A|+|B|) (Dice, Ecology 1945); null when both are empty.</param>
/// <param name="CentroidShiftMm">Distance between the physical centroids (LPS mm); null when either is empty.</param>
/// <param name="VoxelsA">Voxels in A.</param>
/// <param name="VoxelsB">Voxels in B.</param>
public sealed record MaskAgreementResult(double? Dice, double? CentroidShiftMm, int VoxelsA, int VoxelsB);

/// <summary>Dice and centroid shift of two masks on the same grid (non-zero = inside).</summary>
public static class MaskAgreement
{
    /// <summary>Compares two congruent masks; a grid mismatch is a <see cref="GeometryMismatchException"/>.</summary>
    public static MaskAgreementResult Compare(Volume<byte> a, Volume<byte> b)
    {
        a.Geometry.RequireCongruent(b.Geometry, "the two outlines");
        var s = a.Size;
        long na = 0, nb = 0, both = 0;
        Vec3 ca = Vec3.Zero, cb = Vec3.Zero;
        for (int k = 0; k < s.Z; k++)
            for (int j = 0; j < s.Y; j++)
                for (int i = 0; i < s.X; i++)
                {
                    int o = i + s.X * (j + s.Y * k);
                    bool ia = a.Voxels[o] != 0, ib = b.Voxels[o] != 0;
                    if (!ia && !ib) continue;
                    var idx = new Vec3(i, j, k);
                    if (ia) { na++; ca += idx; }
                    if (ib) { nb++; cb += idx; }
                    if (ia && ib) both++;
                }
        double? dice = na + nb == 0 ? null : 2.0 * both / (na + nb);
        double? shift = na == 0 || nb == 0 ? null
            : (a.Geometry.IndexToPhysical(ca / na) - a.Geometry.IndexToPhysical(cb / nb)).Norm;
        return new MaskAgreementResult(dice, shift, (int)na, (int)nb);
    }
}
