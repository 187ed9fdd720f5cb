using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Tests.Shared;

namespace Serimetry.Tests.Measures;

/// <summary>
/// The IBSI chapter 1 digital phantom (5x4x4 voxels of 2 mm, 74 in the ROI) read from
/// shared/reference/ibsi/digital_phantom/phantom_voxels.csv; the grey levels are used as an "ADC" map and
/// the ROI as the lesion mask. Src: Zwanenburg et al., IBSI, Radiology 2020 (CC BY 4.0 data).
/// </summary>
internal sealed record IbsiPhantom(Volume<float> Image, Volume<byte> Roi, VisitContext Context)
{
    public static IbsiPhantom Load()
    {
        var path = SharedReference.PathOf("ibsi", "digital_phantom", "phantom_voxels.csv");
        var g = Geometry.Axial(new Size3(5, 4, 4), new Vec3(2, 2, 2), Vec3.Zero);
        var image = new Volume<float>(g);
        var roi = new Volume<byte>(g);
        foreach (var line in File.ReadLines(path).Skip(1))
        {
            var f = line.Split(',');
            int i = int.Parse(f[0], CultureInfo.InvariantCulture), j = int.Parse(f[1], CultureInfo.InvariantCulture),
                k = int.Parse(f[2], CultureInfo.InvariantCulture);
            image[i, j, k] = float.Parse(f[3], CultureInfo.InvariantCulture);
            roi[i, j, k] = byte.Parse(f[4], CultureInfo.InvariantCulture);
        }
        var ctx = new VisitContext(0, new DateOnly(2024, 1, 1), image) { Adc = image, LesionMask = roi };
        return new IbsiPhantom(image, roi, ctx);
    }
}
