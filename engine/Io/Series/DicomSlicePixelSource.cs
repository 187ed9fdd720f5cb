using System.Collections.Concurrent;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Reads slice pixels through the engine's DICOM parser. A multi-frame object is parsed once and kept
/// for its other frames; zip entries are inflated under the same <see cref="ZipLimits"/> as indexing.
/// Thread-safe.
/// </summary>
public sealed class DicomSlicePixelSource(DicomReadOptions? options = null, ZipLimits? zipLimits = null) : ISlicePixelSource
{
    private readonly ConcurrentDictionary<(string, string?), Lazy<DicomFile>> _multiFrame = new();

    public float[] ReadRescaled(SliceSource source)
    {
        ArgumentNullException.ThrowIfNull(source);
        var file = Open(source);
        var px = file.GetPixelData();
        if (px.Info.SamplesPerPixel != 1)
            throw new UnsupportedInputException($"Samples per Pixel is {px.Info.SamplesPerPixel}; a volume needs one sample per pixel",
                source.Describe(), "colour images cannot be measured; choose a greyscale series");
        if (source.Frame >= px.FrameCount)
            throw new InputFormatException($"frame {source.Frame + 1} requested but the object has {px.FrameCount}", source.Describe());
        return px.GetRescaledValues(source.Frame);
    }

    private DicomFile Open(SliceSource source)
    {
        var key = (source.Container, source.Entry);
        if (_multiFrame.TryGetValue(key, out var cached)) return cached.Value;
        var file = Load(source);
        if (file.Dataset.TryGetInt(DicomTags.NumberOfFrames, out var frames) && frames > 1)
            return _multiFrame.GetOrAdd(key, new Lazy<DicomFile>(() => file)).Value;
        return file;
    }

    private DicomFile Load(SliceSource source)
    {
        if (source.Entry is null) return DicomFile.ReadHeader(source.Container, options);
        using var zip = new ZipReader(source.Container, zipLimits ?? ZipLimits.Default);
        var entry = zip.Entries.FirstOrDefault(e => e.FullName == source.Entry)
            ?? throw new InputFormatException($"zip entry '{source.Entry}' no longer exists", source.Container,
                "the archive changed after indexing; index it again");
        return DicomFile.Read(zip.ReadEntry(entry), options, source.Entry);
    }
}
