namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// One raw data element (PS3.5 section 7.1): tag, VR and the value bytes exactly as stored (in the
/// byte order of the data set that holds it). Values are converted on demand by
/// <see cref="DicomDataset"/>; sequences hold their item data sets, encapsulated Pixel Data its fragments.
/// </summary>
public sealed class DicomElement
{
    internal DicomElement(DicomTag tag, DicomVR vr, ReadOnlyMemory<byte> value, long offset, bool undefinedLength,
        IReadOnlyList<DicomDataset>? items = null, DicomFragments? fragments = null)
    {
        Tag = tag;
        VR = vr;
        Value = value;
        Offset = offset;
        UndefinedLength = undefinedLength;
        Items = items;
        Fragments = fragments;
    }

    /// <summary>The tag.</summary>
    public DicomTag Tag { get; }

    /// <summary>
    /// The VR: from the Explicit VR header, or from the data dictionary for Implicit VR (UN when unknown).
    /// Elements of undefined length read as sequences (UN per PS3.5 6.2.2, unknown Implicit VR elements)
    /// report SQ, as dcmtk does.
    /// </summary>
    public DicomVR VR { get; }

    /// <summary>The value bytes as stored (empty for sequences and encapsulated Pixel Data).</summary>
    public ReadOnlyMemory<byte> Value { get; }

    /// <summary>Byte offset of the value in the (inflated) data stream; diagnostics only.</summary>
    public long Offset { get; }

    /// <summary>True when the element was encoded with undefined length (FFFFFFFFH, PS3.5 7.1.3).</summary>
    public bool UndefinedLength { get; }

    /// <summary>The items of a sequence (SQ, or UN of undefined length read as a sequence per PS3.5 6.2.2); else null.</summary>
    public IReadOnlyList<DicomDataset>? Items { get; }

    /// <summary>The Basic Offset Table and fragments of encapsulated Pixel Data (PS3.5 A.4); else null.</summary>
    public DicomFragments? Fragments { get; }

    /// <summary>True for a sequence.</summary>
    public bool IsSequence => Items is not null;

    public override string ToString() => $"{Tag} {VR.Code()} {(IsSequence ? $"{Items!.Count} items" : $"{Value.Length} bytes")}";
}

/// <summary>Encapsulated Pixel Data (PS3.5 A.4): the Basic Offset Table and the fragments in order.</summary>
/// <param name="BasicOffsetTable">Offsets of each frame's first fragment item, from the first fragment item; may be empty.</param>
/// <param name="Fragments">Fragment values (item headers removed).</param>
/// <param name="FragmentOffsets">Offset of each fragment's item header from the first fragment item (the BOT's reference).</param>
public sealed record DicomFragments(IReadOnlyList<uint> BasicOffsetTable, IReadOnlyList<ReadOnlyMemory<byte>> Fragments,
    IReadOnlyList<long> FragmentOffsets);
