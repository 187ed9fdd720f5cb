namespace Serimetry.Engine.Io.Series;

/// <summary>What reading one file's header gave: its slices (one per frame), or why it was skipped.</summary>
/// <param name="Slices">Slice headers, empty when skipped.</param>
/// <param name="SkipReason">Why the file gave no slices (not DICOM, no image, unreadable), or null.</param>
public sealed record SliceReadResult(IReadOnlyList<SliceHeader> Slices, string? SkipReason)
{
    public static SliceReadResult Skip(string reason) => new([], reason);
}

/// <summary>
/// Reads slice headers (never pixel data) from one DICOM object. The DICOM adapter implements it over the
/// engine's Part 10 parser; tests may supply their own.
/// </summary>
public interface ISliceHeaderReader
{
    /// <summary>Reads a file on disk.</summary>
    SliceReadResult ReadFile(string path);

    /// <summary>Reads an object held in memory (a zip entry); <paramref name="source"/> says where it came from.</summary>
    SliceReadResult ReadBytes(byte[] bytes, SliceSource source);
}
