namespace Serimetry.Engine.Io.Masks;

/// <summary>
/// A mask argument: a file and, optionally, which item in it to use, written <c>PATH#ITEM</c> — a segment
/// number or label (SEG), an ROI number or name (RTSTRUCT), or a label value (NIfTI).
/// </summary>
/// <param name="Path">The mask file.</param>
/// <param name="Item">The segment, ROI or label to use; null for "the only one" (NIfTI: every non-zero voxel).</param>
public sealed record MaskSource(string Path, string? Item = null)
{
    /// <summary>
    /// Splits <c>PATH#ITEM</c>. A text that names an existing file as a whole is taken as the path (so file names
    /// holding '#' still work); otherwise the part after the last '#' is the item.
    /// </summary>
    public static MaskSource Parse(string text)
    {
        ArgumentException.ThrowIfNullOrEmpty(text);
        if (File.Exists(text) || Directory.Exists(text)) return new MaskSource(text);
        int hash = text.LastIndexOf('#');
        if (hash <= 0 || hash == text.Length - 1) return new MaskSource(text);
        return new MaskSource(text[..hash], text[(hash + 1)..]);
    }

    /// <summary>The argument as written (<c>PATH</c> or <c>PATH#ITEM</c>).</summary>
    public override string ToString() => Item is null ? Path : Path + "#" + Item;
}
