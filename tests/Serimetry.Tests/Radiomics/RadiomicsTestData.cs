using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics;
using Serimetry.Tests.Shared;

namespace Serimetry.Tests.Radiomics;

/// <summary>Test inputs: the IBSI digital phantom (Src: theibsi/data_sets, CC BY 4.0), voxelised spheres, reorientations.</summary>
internal static class RadiomicsTestData
{
    public static readonly RadiomicsSettings PhantomSettings = new()
    {
        Discretisation = new DiscretisationSettings { Method = DiscretisationMethod.FixedBinSize, BinWidth = 1, LowerBound = 1 },
        IvhDiscretisation = new DiscretisationSettings { Method = DiscretisationMethod.None },
    };

    public static (Volume<float> Image, Volume<byte> Mask) Phantom()
    {
        var geometry = Geometry.Axial(new Size3(5, 4, 4), new Vec3(2, 2, 2), new Vec3(0, 0, 0));
        var image = new Volume<float>(geometry);
        var mask = new Volume<byte>(geometry);
        foreach (var line in File.ReadAllLines(SharedReference.PathOf("ibsi", "digital_phantom", "phantom_voxels.csv")).Skip(1))
        {
            var f = line.Split(',').Select(s => int.Parse(s, CultureInfo.InvariantCulture)).ToArray();
            image[f[0], f[1], f[2]] = f[3];
            mask[f[0], f[1], f[2]] = (byte)f[4];
        }
        return (image, mask);
    }

    /// <summary>A ball of radius <paramref name="radiusMm"/> sampled at voxel centres on an isotropic grid.</summary>
    public static (Volume<float> Image, Volume<byte> Mask) Sphere(double radiusMm, double spacingMm)
    {
        int n = (int)Math.Ceiling(2 * radiusMm / spacingMm) + 4;
        var geometry = Geometry.Axial(new Size3(n, n, n), new Vec3(spacingMm, spacingMm, spacingMm), new Vec3(0, 0, 0));
        var image = new Volume<float>(geometry);
        var mask = new Volume<byte>(geometry);
        double c = (n - 1) / 2.0;
        for (int k = 0; k < n; k++)
        for (int j = 0; j < n; j++)
        for (int i = 0; i < n; i++)
        {
            double dx = (i - c) * spacingMm, dy = (j - c) * spacingMm, dz = (k - c) * spacingMm;
            image[i, j, k] = (float)(100 + i % 3 + 2 * (j % 2));
            if (dx * dx + dy * dy + dz * dz <= radiusMm * radiusMm) mask[i, j, k] = 1;
        }
        return (image, mask);
    }

    /// <summary>Reorders voxels: new[i', j', k'] = old[i, j, k] with (i', j', k') from <paramref name="map"/>.</summary>
    public static Volume<T> Reorient<T>(Volume<T> v, bool flipX, bool flipY, bool flipZ, int[] permutation) where T : unmanaged
    {
        var s = v.Size;
        int[] oldSize = [s.X, s.Y, s.Z];
        var newSize = new Size3(oldSize[permutation[0]], oldSize[permutation[1]], oldSize[permutation[2]]);
        var sp = v.Geometry.SpacingMm;
        double[] oldSp = [sp.X, sp.Y, sp.Z];
        var geometry = Geometry.Axial(newSize, new Vec3(oldSp[permutation[0]], oldSp[permutation[1]], oldSp[permutation[2]]), new Vec3(0, 0, 0));
        var result = new Volume<T>(geometry);
        for (int k = 0; k < s.Z; k++)
        for (int j = 0; j < s.Y; j++)
        for (int i = 0; i < s.X; i++)
        {
            int[] idx = [flipX ? s.X - 1 - i : i, flipY ? s.Y - 1 - j : j, flipZ ? s.Z - 1 - k : k];
            result[idx[permutation[0]], idx[permutation[1]], idx[permutation[2]]] = v[i, j, k];
        }
        return result;
    }
}
