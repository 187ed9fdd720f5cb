using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Reports.Dicom;

namespace Serimetry.Engine.Compare;

/// <summary>
/// Reads the outlines given for the baseline (<c>--gland</c>, <c>--lesion</c>: NIfTI, SEG or RTSTRUCT, optionally
/// <c>PATH#ITEM</c>) through <see cref="MaskFiles"/>, onto the baseline T2w grid. When the baseline is a DICOM
/// folder, DICOM masks must refer to its Frame of Reference or one of its series (docs/masks.md).
/// </summary>
internal sealed class BaselineMasks(string baselineExam, Geometry t2Grid)
{
    private MaskReference? _reference;
    private bool _resolved;

    public Volume<byte> Read(string text)
    {
        var source = MaskSource.Parse(text);
        var reference = ImageFiles.IsNifti(source.Path) ? null : Reference();
        return MaskFiles.Read(source, t2Grid, reference).Mask;
    }

    private MaskReference? Reference()
    {
        if (_resolved) return _reference;
        _resolved = true;
        if (SegSourceResolver.FromExam(baselineExam) is { } found)
            _reference = new MaskReference(found.Reference.FrameOfReferenceUid, [found.Reference.SeriesInstanceUid], found.Reference.SopInstanceUids);
        return _reference;
    }
}
