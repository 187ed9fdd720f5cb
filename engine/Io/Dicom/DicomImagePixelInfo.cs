using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>The Image Pixel module attributes (PS3.3 C.7.6.3) that describe how Pixel Data is laid out.</summary>
/// <param name="Rows">Rows (0028,0010).</param>
/// <param name="Columns">Columns (0028,0011).</param>
/// <param name="Frames">Number of Frames (0028,0008); 1 when absent.</param>
/// <param name="SamplesPerPixel">Samples per Pixel (0028,0002).</param>
/// <param name="BitsAllocated">Bits Allocated (0028,0100): 1, 8, 16 or 32.</param>
/// <param name="BitsStored">Bits Stored (0028,0101).</param>
/// <param name="HighBit">High Bit (0028,0102).</param>
/// <param name="PixelRepresentation">0 unsigned, 1 two's complement (0028,0103).</param>
/// <param name="PlanarConfiguration">0 interleaved, 1 by plane (0028,0006).</param>
/// <param name="PhotometricInterpretation">Photometric Interpretation (0028,0004).</param>
public sealed record DicomImagePixelInfo(int Rows, int Columns, int Frames, int SamplesPerPixel, int BitsAllocated,
    int BitsStored, int HighBit, int PixelRepresentation, int PlanarConfiguration, string PhotometricInterpretation)
{
    /// <summary>Samples in one frame.</summary>
    public long SamplesPerFrame => (long)Rows * Columns * SamplesPerPixel;

    /// <summary>Bytes of one frame in native little-endian layout (1-bit frames rounded up to whole bytes).</summary>
    public long FrameBytes => BitsAllocated == 1 ? (SamplesPerFrame + 7) / 8 : SamplesPerFrame * (BitsAllocated / 8);

    /// <summary>
    /// Reads and validates the attributes, refusing absurd sizes before anything is allocated
    /// (<see cref="Limits"/>).
    /// </summary>
    public static DicomImagePixelInfo From(DicomDataset ds)
    {
        var rows = ds.GetInt(DicomTags.Rows);
        var cols = ds.GetInt(DicomTags.Columns);
        var frames = ds.Contains(DicomTags.NumberOfFrames) && ds.TryGetInt(DicomTags.NumberOfFrames, out var f) ? f : 1;
        var spp = ds.GetIntOrNull(DicomTags.SamplesPerPixel) ?? 1;
        var ba = ds.GetInt(DicomTags.BitsAllocated);
        var bs = ds.GetIntOrNull(DicomTags.BitsStored) ?? ba;
        var hb = ds.GetIntOrNull(DicomTags.HighBit) ?? bs - 1;
        var pr = ds.GetIntOrNull(DicomTags.PixelRepresentation) ?? 0;
        var pc = ds.GetIntOrNull(DicomTags.PlanarConfiguration) ?? 0;
        var pi = ds.GetStringOrNull(DicomTags.PhotometricInterpretation) ?? "";
        var info = new DicomImagePixelInfo(rows, cols, frames, spp, ba, bs, hb, pr, pc, pi);
        info.Validate(ds.Where);
        return info;
    }

    private void Validate(string where)
    {
        if (Frames < 1)
            throw new InputFormatException($"Number of Frames is {Frames}", where, "the file is corrupt; re-export it");
        Limits.CheckSize(new Size3(Columns, Rows, Frames), where);
        if (SamplesPerPixel is < 1 or > 4)
            throw new InputFormatException($"Samples per Pixel is {SamplesPerPixel}; expected 1 or 3", where, "the file is corrupt; re-export it");
        if ((long)Columns * Rows * Frames * SamplesPerPixel > Limits.MaxVoxels)
            throw new InputLimitException($"{Columns}x{Rows} pixels x {SamplesPerPixel} samples x {Frames} frames exceeds {Limits.MaxVoxels:N0} samples",
                where, "check the file is not corrupt; Serimetry refuses such sizes before allocating memory");
        if (BitsAllocated is not (1 or 8 or 16 or 32))
            throw new UnsupportedInputException($"Bits Allocated {BitsAllocated} is not supported (1, 8, 16 or 32)", where,
                "convert the file with `gdcmconv --raw` or ask the sender for 8- or 16-bit pixels");
        if (BitsStored < 1 || BitsStored > BitsAllocated || HighBit < BitsStored - 1 || HighBit >= BitsAllocated)
            throw new InputFormatException(
                $"Bits Stored {BitsStored} / High Bit {HighBit} do not fit Bits Allocated {BitsAllocated} (PS3.3 C.7.6.3.1)",
                where, "the file is corrupt; re-export it");
        if (PixelRepresentation is not (0 or 1))
            throw new InputFormatException($"Pixel Representation is {PixelRepresentation}; expected 0 or 1", where, "the file is corrupt; re-export it");
    }
}
