using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom.Writing;

/// <summary>
/// Writes a volume as a classic MR Image Storage series (SOP Class 1.2.840.10008.5.1.4.1.1.4, PS3.3 A.4):
/// one file per slice with Image Plane attributes (PS3.3 C.7.6.2) taken from the LPS geometry, and float
/// voxels stored as unsigned 16-bit with Rescale Slope/Intercept (PS3.3 C.11.1.1.2) so that
/// stored × slope + intercept gives the value back within half a slope. Volumes of whole numbers in 0…65535 are
/// stored as they are, without Rescale Slope/Intercept.
/// </summary>
public static class MrSeriesWriter
{
    /// <summary>MR Image Storage SOP Class UID (PS3.4 B.5).</summary>
    public const string MrImageStorage = "1.2.840.10008.5.1.4.1.1.4";

    /// <summary>
    /// Writes the slices of <paramref name="volume"/> into <paramref name="directory"/> as
    /// <c>&lt;prefix&gt;-&lt;instance&gt;.dcm</c>. <paramref name="common"/> holds the patient, study, series
    /// and acquisition attributes shared by every slice (copied, not changed); <paramref name="perSlice"/> may
    /// add attributes per slice (e.g. Diffusion b-value). Instance numbers start at <paramref name="firstInstance"/>.
    /// The SOP Instance UID of each slice is derived from <paramref name="uidSeed"/> and the instance number.
    /// Returns the SOP Instance UIDs in slice order.
    /// </summary>
    public static IReadOnlyList<string> Write(string directory, string prefix, Volume<float> volume, DicomWriteDataset common,
        string uidSeed, int firstInstance = 1, string uidRoot = DicomUids.UuidRoot, Action<DicomWriteDataset>? perSlice = null)
    {
        ArgumentNullException.ThrowIfNull(volume);
        Directory.CreateDirectory(directory);
        var g = volume.Geometry;
        var (slope, intercept) = Rescale(volume.Voxels);
        var uids = new List<string>(g.Size.Z);
        var rowDir = g.Direction.Column(0);
        var colDir = g.Direction.Column(1);
        for (int k = 0; k < g.Size.Z; k++)
        {
            int instance = firstInstance + k;
            var ds = Copy(common);
            string uid = DicomUids.FromName($"{uidSeed}/instance/{instance}", uidRoot);
            ds.Add(DicomTags.SOPClassUID, DicomVR.UI, MrImageStorage)
              .Add(DicomTags.SOPInstanceUID, DicomVR.UI, uid)
              .Add(DicomTags.Modality, DicomVR.CS, "MR")
              .Add(DicomTags.InstanceNumber, DicomVR.IS, instance)
              .Add(DicomTags.ImagePositionPatient, DicomVR.DS, Xyz(g.IndexToPhysical(0, 0, k)))
              .Add(DicomTags.ImageOrientationPatient, DicomVR.DS, [.. Xyz(rowDir), .. Xyz(colDir)])
              // PS3.3 C.7.6.2.1.1: Pixel Spacing is row spacing (between rows, along a column) \ column spacing.
              .Add(DicomTags.PixelSpacing, DicomVR.DS, g.SpacingMm.Y, g.SpacingMm.X)
              .Add(DicomTags.SliceThickness, DicomVR.DS, g.SpacingMm.Z)
              .Add(DicomTags.SliceLocation, DicomVR.DS, Math.Round(g.IndexToPhysical(0, 0, k).Dot(rowDir.Cross(colDir)), 4))
              .AddMonochromePixelModule(g.Size.Y, g.Size.X, bitsAllocated: 16, bitsStored: 16);
            // The classic MR Image IOD (PS3.3 A.4) has no Modality LUT module; Rescale Slope/Intercept are written only
            // when the values are not already whole numbers in 0…65535 (docs/dicom-out.md explains why we keep them then).
            if (!(slope == 1 && intercept == 0))
                ds.Add(DicomTags.RescaleIntercept, DicomVR.DS, intercept)
                  .Add(DicomTags.RescaleSlope, DicomVR.DS, slope);
            ds.AddBytes(DicomTags.PixelData, DicomVR.OW, Pixels(volume.Slice(k), slope, intercept));
            perSlice?.Invoke(ds);
            DicomPart10Writer.Write(Path.Combine(directory, $"{prefix}-{instance:D4}.dcm"), ds);
            uids.Add(uid);
        }
        return uids;
    }

    /// <summary>
    /// Slope and intercept mapping [min, max] onto 0…65535; both are the values their DS text reads back as,
    /// so that quantisation uses exactly what a reader applies.
    /// </summary>
    internal static (double Slope, double Intercept) Rescale(ReadOnlySpan<float> v)
    {
        float min = float.PositiveInfinity, max = float.NegativeInfinity;
        bool whole = true;
        foreach (var x in v)
        {
            if (!float.IsFinite(x)) continue;
            if (x < min) min = x;
            if (x > max) max = x;
            whole &= x == MathF.Round(x);
        }
        if (min > max) (min, max) = (0, 0);
        if (whole && min >= 0 && max <= 65535) return (1, 0); // stored values are the values: identity, no Modality LUT
        double intercept = RoundTrip(Math.Floor(min * 1000) / 1000);
        double slope = RoundTrip(Math.Max((max - intercept) / 65535.0 * 1.0000001, 1e-6));
        return (slope, intercept);
    }

    private static double RoundTrip(double v) =>
        double.Parse(DicomWriteDataset.FormatDecimal(v), System.Globalization.CultureInfo.InvariantCulture);

    private static byte[] Pixels(ReadOnlySpan<float> slice, double slope, double intercept)
    {
        var b = new byte[slice.Length * 2];
        for (int i = 0; i < slice.Length; i++)
        {
            double s = float.IsFinite(slice[i]) ? Math.Round((slice[i] - intercept) / slope) : 0;
            ushort u = (ushort)Math.Clamp(s, 0, 65535);
            b[2 * i] = (byte)u;
            b[2 * i + 1] = (byte)(u >> 8);
        }
        return b;
    }

    private static DicomWriteDataset Copy(DicomWriteDataset d)
    {
        var c = new DicomWriteDataset();
        c.CopyFrom(d);
        return c;
    }

    private static double[] Xyz(Vec3 v) => [Math.Round(v.X, 6), Math.Round(v.Y, 6), Math.Round(v.Z, 6)];

}
