namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// What a DICOM mask must refer to. A SEG or RTSTRUCT whose Frame of Reference differs from
/// <paramref name="FrameOfReferenceUid"/>, or (without a Frame of Reference to compare) which names none of
/// <paramref name="SeriesInstanceUids"/>, is refused: its patient coordinates cannot be trusted on these images.
/// </summary>
/// <param name="FrameOfReferenceUid">Frame of Reference UID (0020,0052) of the target images, when known.</param>
/// <param name="SeriesInstanceUids">Series Instance UIDs of the exam's series, when known.</param>
/// <param name="SliceInstanceUids">
/// SOP Instance UID of each slice k of the target grid, when known: lets SEG frames without Plane Position
/// be placed through their Derivation Image references.
/// </param>
public sealed record MaskReference(string? FrameOfReferenceUid, IReadOnlyCollection<string>? SeriesInstanceUids = null,
    IReadOnlyList<string>? SliceInstanceUids = null);

/// <summary>What the DICOM mask readers need besides the file and the grid.</summary>
/// <param name="Item">Segment / ROI / label to read (see <see cref="MaskSource"/>); null: the only one.</param>
/// <param name="Reference">Identifiers the mask must refer to; null: not checked.</param>
internal sealed record MaskReadOptions(string? Item = null, MaskReference? Reference = null);

/// <summary>A mask read from a file.</summary>
/// <param name="Mask">1 inside, 0 outside; on the target grid for DICOM masks, on the file's own grid for NIfTI.</param>
/// <param name="Format">The file's kind.</param>
/// <param name="Item">The segment / ROI that was read, as "number 'label'" (empty for NIfTI without a label).</param>
/// <param name="Notes">Documented handling applied on the way (e.g. a self-intersecting contour filled by the even-odd rule).</param>
public sealed record MaskReadResult(Engine.Core.Volume<byte> Mask, MaskFormat Format, string Item, IReadOnlyList<string> Notes);

/// <summary>One selectable item of a mask file: segment (SEG), ROI (RTSTRUCT).</summary>
public sealed record MaskItem(int Number, string Label)
{
    public override string ToString() => $"{Number} '{Label}'";
}

/// <summary>What a mask file holds, read without a target grid (for validating uploads).</summary>
public sealed record MaskDescription(MaskFormat Format, IReadOnlyList<MaskItem> Items);
