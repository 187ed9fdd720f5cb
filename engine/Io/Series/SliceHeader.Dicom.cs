using System.Text;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Series;

public sealed partial record SliceHeader
{
    /// <summary>Private creator of the Siemens block that holds the b-value (element 0x0C) in group 0019.</summary>
    internal const string SiemensCreator = "SIEMENS MR HEADER";

    /// <summary>
    /// One header per frame of a parsed data set. Single-frame objects give one; Enhanced MR multi-frame
    /// objects give one per frame, each attribute taken from the top level, then the Shared (5200,9229),
    /// then that frame's Per-frame (5200,9230) Functional Groups (PS3.3 C.7.6.16): Plane Position
    /// (0020,9113), Plane Orientation (0020,9116), Pixel Measures (0028,9110), MR Diffusion (0018,9117),
    /// Pixel Value Transformation (0028,9145), MR Image Frame Type (0018,9226), MR Echo / Timing.
    /// </summary>
    public static IReadOnlyList<SliceHeader> FromDataset(DicomDataset ds, SliceSource source, string? transferSyntaxUid = null)
    {
        ArgumentNullException.ThrowIfNull(ds);
        int frames = ds.TryGetInt(DicomTags.NumberOfFrames, out var f) && f > 0 ? f : 1;
        var common = Common(ds, source, transferSyntaxUid, frames);
        var list = new List<SliceHeader>(frames);
        for (int frame = 0; frame < frames; frame++) list.Add(ForFrame(ds, common, frame, frames));
        return list;
    }

    private static SliceHeader Common(DicomDataset ds, SliceSource source, string? ts, int frames) => new()
    {
        Source = source,
        SopInstanceUid = Text(ds, DicomTags.SOPInstanceUID),
        SeriesInstanceUid = Text(ds, DicomTags.SeriesInstanceUID),
        StudyInstanceUid = Text(ds, DicomTags.StudyInstanceUID),
        PatientId = Text(ds, DicomTags.PatientID),
        StudyDate = Text(ds, DicomTags.StudyDate),
        Modality = Text(ds, DicomTags.Modality),
        SeriesNumber = Int(ds, DicomTags.SeriesNumber),
        InstanceNumber = Int(ds, DicomTags.InstanceNumber),
        AcquisitionNumber = Int(ds, DicomTags.AcquisitionNumber),
        Rows = Int(ds, DicomTags.Rows) ?? 0,
        Columns = Int(ds, DicomTags.Columns) ?? 0,
        SeriesDescription = Text(ds, DicomTags.SeriesDescription),
        SequenceName = Text(ds, DicomTags.SequenceName),
        ScanningSequence = Texts(ds, DicomTags.ScanningSequence),
        SequenceVariant = Texts(ds, DicomTags.SequenceVariant),
        ScanOptions = Texts(ds, DicomTags.ScanOptions),
        SiemensBValueText = SiemensBValue(ds),
        Manufacturer = Text(ds, DicomTags.Manufacturer),
        Model = Text(ds, DicomTags.ManufacturerModelName),
        MagneticFieldStrengthT = Real(ds, DicomTags.MagneticFieldStrength),
        BitsAllocated = Int(ds, DicomTags.BitsAllocated) ?? 0,
        BitsStored = Int(ds, DicomTags.BitsStored) ?? 0,
        PixelRepresentation = Int(ds, DicomTags.PixelRepresentation) ?? 0,
        SamplesPerPixel = Int(ds, DicomTags.SamplesPerPixel) ?? 1,
        NumberOfFrames = frames,
        TransferSyntaxUid = ts,
    };

    private static SliceHeader ForFrame(DicomDataset ds, SliceHeader common, int frame, int frames)
    {
        var iop = FgReals(ds, DicomTags.ImageOrientationPatient, frame);
        var ipp = FgReals(ds, DicomTags.ImagePositionPatient, frame);
        var ps = FgReals(ds, DicomTags.PixelSpacing, frame);
        var (slope, intercept) = DicomFunctionalGroups.Rescale(ds, frame);
        var frameType = frames > 1 || !ds.Contains(DicomTags.ImageType) ? FgTexts(ds, DicomTags.FrameType, frame) : null;
        return common with
        {
            Source = common.Source with { Frame = frame },
            ImagePositionPatient = ipp is { Length: >= 3 } ? new Vec3(ipp[0], ipp[1], ipp[2]) : null,
            RowCosine = iop is { Length: >= 6 } ? new Vec3(iop[0], iop[1], iop[2]) : null,
            ColumnCosine = iop is { Length: >= 6 } ? new Vec3(iop[3], iop[4], iop[5]) : null,
            RowSpacingMm = ps is { Length: >= 2 } ? ps[0] : null,
            ColumnSpacingMm = ps is { Length: >= 2 } ? ps[1] : null,
            SliceThicknessMm = FgReals(ds, DicomTags.SliceThickness, frame) is { Length: > 0 } st ? st[0] : null,
            SpacingBetweenSlicesMm = FgReals(ds, DicomTags.SpacingBetweenSlices, frame) is { Length: > 0 } sb ? sb[0] : null,
            ImageType = (frameType ?? Texts(ds, DicomTags.ImageType)).Select(t => t.Trim().ToUpperInvariant()).ToList(),
            DiffusionBValue = FgReals(ds, DicomTags.DiffusionBValue, frame) is { Length: > 0 } b ? b[0] : null,
            DiffusionDirectionality = FgTexts(ds, DicomTags.DiffusionDirectionality, frame) is { Length: > 0 } dd ? dd[0] : null,
            DiffusionGradient = Gradient(ds, frame),
            RepetitionTimeMs = FgReals(ds, DicomTags.RepetitionTime, frame) is { Length: > 0 } tr ? tr[0] : null,
            EchoTimeMs = (FgReals(ds, DicomTags.EchoTime, frame) ?? FgReals(ds, DicomTags.EffectiveEchoTime, frame)) is { Length: > 0 } te
                ? te[0] : null,
            RescaleSlope = slope,
            RescaleIntercept = intercept,
        };
    }

    private static Vec3? Gradient(DicomDataset ds, int frame)
    {
        if (DicomFunctionalGroups.Find(ds, DicomTags.DiffusionGradientDirectionSequence, frame) is not { } found) return null;
        var items = found.Element.Items;
        if (items is not { Count: > 0 } || !items[0].Contains(DicomTags.DiffusionGradientOrientation)) return null;
        var g = Safe(() => items[0].GetDoubles(DicomTags.DiffusionGradientOrientation));
        return g is { Length: >= 3 } ? new Vec3(g[0], g[1], g[2]) : null;
    }

    /// <summary>
    /// The Siemens b-value text: find the (0019,00xx) private creator "SIEMENS MR HEADER" (PS3.5 7.8.1),
    /// then element (0019,xx0C); its bytes are ASCII digits (observed with VR OB, e.g. "400 ").
    /// </summary>
    internal static string? SiemensBValue(DicomDataset ds)
    {
        for (ushort block = 0x10; block <= 0xFF; block++)
        {
            var creatorTag = new DicomTag(0x0019, block);
            if (!ds.Contains(creatorTag)) continue;
            if (!string.Equals(Text(ds, creatorTag)?.Trim(), SiemensCreator, StringComparison.Ordinal)) continue;
            var e = ds.Find(new DicomTag(0x0019, (ushort)((block << 8) | 0x0C)));
            if (e is null || e.Value.Length is 0 or > 32) return null;
            var span = e.Value.Span;
            foreach (var c in span)
                if (c is not ((>= (byte)'0' and <= (byte)'9') or (byte)' ' or (byte)'.' or 0)) return null;
            return Encoding.ASCII.GetString(span);
        }
        return null;
    }

    private static double[]? FgReals(DicomDataset ds, DicomTag tag, int frame) =>
        DicomFunctionalGroups.Find(ds, tag, frame) is { } f ? Safe(() => f.Holder.GetDoubles(tag)) : null;

    private static string[]? FgTexts(DicomDataset ds, DicomTag tag, int frame) =>
        DicomFunctionalGroups.Find(ds, tag, frame) is { } f ? Safe(() => f.Holder.GetStrings(tag)) : null;

    private static string? Text(DicomDataset ds, DicomTag tag)
    {
        var s = Safe(() => ds.GetStringOrNull(tag))?.Trim();
        return string.IsNullOrEmpty(s) ? null : s;
    }

    private static string[] Texts(DicomDataset ds, DicomTag tag) =>
        ds.Contains(tag) ? Safe(() => ds.GetStrings(tag))?.Select(t => t.Trim()).ToArray() ?? [] : [];

    private static int? Int(DicomDataset ds, DicomTag tag) => ds.Contains(tag) ? Safe(() => ds.GetIntOrNull(tag)) : null;

    private static double? Real(DicomDataset ds, DicomTag tag) => ds.Contains(tag) ? Safe(() => ds.GetDoubleOrNull(tag)) : null;

    /// <summary>A malformed optional value counts as absent; assembly reports what is missing.</summary>
    private static T? Safe<T>(Func<T?> read)
    {
        try
        {
            return read();
        }
        catch (InputException)
        {
            return default;
        }
        catch (FormatException)
        {
            return default;
        }
        catch (OverflowException)
        {
            return default;
        }
    }
}
