using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Nifti;

namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// The one way masks come in (docs/masks.md): NIfTI label volumes, DICOM SEG (BINARY or FRACTIONAL) and DICOM
/// RTSTRUCT. DICOM masks are placed through patient coordinates onto the target grid (normally the exam's T2w);
/// NIfTI masks keep their own grid (callers transfer or check it as before).
/// </summary>
public static class MaskFiles
{
    /// <summary>Reads the mask <paramref name="source"/> names, onto <paramref name="target"/> for DICOM masks.</summary>
    public static MaskReadResult Read(MaskSource source, Geometry target, MaskReference? reference = null)
    {
        ArgumentNullException.ThrowIfNull(source);
        ArgumentNullException.ThrowIfNull(target);
        var options = new MaskReadOptions(source.Item, reference);
        string where = Path.GetFileName(source.Path);
        RequireFile(source.Path);
        if (ImageFiles.IsNifti(source.Path)) return ReadNifti(source.Path, source.Item, where);
        var file = DicomFile.Read(source.Path);
        return SopClass(file.Dataset, where) switch
        {
            MaskFormat.DicomSeg => SegmentationReader.ReadOne(file, where, target, options),
            _ => RtStructReader.ReadOne(file.Dataset, where, target, options),
        };
    }

    /// <summary>
    /// What the file holds, checked without a target grid (format, SOP class, segments / ROIs), and that
    /// <paramref name="item"/> names exactly one of them (or that there is only one when it is null).
    /// </summary>
    public static MaskDescription Describe(string path, string? item = null)
    {
        RequireFile(path);
        string where = Path.GetFileName(path);
        if (ImageFiles.IsNifti(path))
        {
            NiftiFile.ReadMask(path);
            if (item is not null) Label(item, where);
            return new MaskDescription(MaskFormat.Nifti, []);
        }
        var ds = DicomFile.ReadHeader(path).Dataset;
        var format = SopClass(ds, where);
        var items = format == MaskFormat.DicomSeg ? SegmentationReader.Segments(ds) : RtStructReader.Rois(ds);
        MaskItems.Choose(items, item, format == MaskFormat.DicomSeg ? "segment" : "ROI", where);
        return new MaskDescription(format, items);
    }

    private static MaskFormat SopClass(DicomDataset ds, string where)
    {
        var uid = ds.GetStringOrNull(DicomTags.SOPClassUID)?.Trim('\0', ' ');
        return uid switch
        {
            MaskSopClasses.Segmentation => MaskFormat.DicomSeg,
            MaskSopClasses.RtStructureSet => MaskFormat.RtStruct,
            _ => throw new UnsupportedInputException($"SOP Class {uid ?? "(none)"} is not a mask object", where,
                $"give a DICOM SEG ({MaskSopClasses.Segmentation}), an RTSTRUCT ({MaskSopClasses.RtStructureSet}) or a NIfTI mask"),
        };
    }

    private static MaskReadResult ReadNifti(string path, string? item, string where)
    {
        var mask = NiftiFile.ReadMask(path);
        if (item is null) return new MaskReadResult(mask, MaskFormat.Nifti, "", []);
        int label = Label(item, where);
        var selected = mask.Like<byte>();
        var src = mask.Voxels;
        var dst = selected.Voxels;
        for (int n = 0; n < src.Length; n++) dst[n] = src[n] == label ? (byte)1 : (byte)0;
        return new MaskReadResult(selected, MaskFormat.Nifti, label.ToString(CultureInfo.InvariantCulture), []);
    }

    private static int Label(string item, string where) =>
        int.TryParse(item, NumberStyles.None, CultureInfo.InvariantCulture, out int label) && label is >= 1 and <= 255 ? label
            : throw new InvalidParameterException($"NIfTI mask label '{item}' is not a number from 1 to 255", where, "write PATH#LABEL, e.g. mask.nii.gz#2");

    private static void RequireFile(string path)
    {
        if (Directory.Exists(path))
            throw new InputFormatException("a folder is not a mask", path, "give the mask file itself: NIfTI (.nii, .nii.gz), DICOM SEG or RTSTRUCT");
        if (!File.Exists(path))
            throw new InputFormatException("mask file not found", path, "give a NIfTI (.nii, .nii.gz), DICOM SEG or RTSTRUCT file");
    }
}
