using System.Buffers.Binary;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Reads a Part 10 file image (PS3.10 section 7): optional 128-byte preamble and "DICM", File Meta
/// Information, then the data set in the encoding its transfer syntax names. Files without preamble
/// or File Meta (bare data sets) are recognised and their encoding is detected from the first element,
/// as dcmtk does.
/// </summary>
internal static class DicomFileParser
{
    internal sealed record Result(DicomDataset Meta, DicomDataset Dataset, DicomTransferSyntax TransferSyntax,
        bool HasFileMeta, DicomPixelDataLocation? PixelData, ReadOnlyMemory<byte> DataSetBuffer, bool Inflated);

    public static Result Parse(ReadOnlyMemory<byte> data, bool isPrefix, bool headerOnly, DicomReadLog log)
    {
        var span = data.Span;
        if (isPrefix && span.Length < 132) throw new DicomNeedMoreDataException();
        var pos = span.Length >= 132 && span.Slice(128, 4).SequenceEqual("DICM"u8) ? 132 : 0;
        var meta = new DicomDataset(false, null, log);
        var hasMeta = span.Length - pos >= 8 && BinaryPrimitives.ReadUInt16LittleEndian(span[pos..]) == 0x0002;
        if (hasMeta)
        {
            var mp = new DicomParser(data, log, isPrefix) { Position = pos };
            meta = mp.ParseFileMeta();
            pos = mp.Position;
        }
        else if (pos == 132)
            log.Lenient("the file has a DICM prefix but no File Meta Information");

        var declared = meta.GetStringOrNull(DicomTags.TransferSyntaxUID)?.Trim(' ', '\0');
        if (hasMeta && string.IsNullOrEmpty(declared))
            log.Lenient("File Meta Information lacks the Transfer Syntax UID; the encoding was detected");
        var detected = Detect(span[pos..]);
        if (pos == 0 && !hasMeta && detected is null)
            throw new InputFormatException("not a DICOM file: no \"DICM\" at byte 128 and no recognisable data set at byte 0",
                log.Source, "check the file is DICOM (Part 10); other formats are not read as DICOM");

        var ts = DicomTransferSyntax.Of(string.IsNullOrEmpty(declared) ? GuessUid(detected) : declared);
        var buffer = data;
        var inflated = false;
        if (ts.Deflated)
        {
            if (isPrefix) throw new DicomNeedMoreDataException();
            buffer = DicomInflater.Inflate(data[pos..], log);
            pos = 0;
            inflated = true;
            detected = Detect(buffer.Span);
        }
        var enc = ChooseEncoding(ts, detected, declared, log);
        var parser = new DicomParser(buffer, log, isPrefix && !inflated) { Position = pos, StopAtPixelData = headerOnly };
        var ds = parser.ParseDataset(enc);
        return new Result(meta, ds, ts, hasMeta, parser.PixelData, buffer, inflated);
    }

    /// <summary>
    /// Guesses the encoding of a data set from its first element header: VR letters at bytes 4-5 mean
    /// Explicit VR; a group number that is smaller read big endian means Big Endian.
    /// Returns null when the bytes do not look like a data element.
    /// </summary>
    internal static DicomEncoding? Detect(ReadOnlySpan<byte> s)
    {
        if (s.Length < 8) return null;
        var gLe = BinaryPrimitives.ReadUInt16LittleEndian(s);
        var gBe = BinaryPrimitives.ReadUInt16BigEndian(s);
        var explicitVr = DicomVRInfo.TryParse(s[4], s[5], out _);
        var big = gBe < gLe;
        var group = big ? gBe : gLe;
        if (explicitVr) return group <= 0x7FE0 ? new DicomEncoding(false, big) : null;
        if (group > 0x0010 && group != 0x0028) return null;
        var len = BinaryPrimitives.ReadUInt32LittleEndian(s[4..]);
        return len < (uint)s.Length || len == DicomParser.UndefinedLength || s.Length >= 65536
            ? DicomEncoding.ImplicitLittle : null;
    }

    private static string GuessUid(DicomEncoding? e) => e switch
    {
        { Implicit: true } => DicomTransferSyntax.ImplicitVRLittleEndian,
        { BigEndian: true } => DicomTransferSyntax.ExplicitVRBigEndian,
        _ => DicomTransferSyntax.ExplicitVRLittleEndian,
    };

    /// <summary>The declared encoding, unless the first element plainly contradicts it (recorded as a leniency).</summary>
    private static DicomEncoding ChooseEncoding(DicomTransferSyntax ts, DicomEncoding? detected, string? declared, DicomReadLog log)
    {
        var expected = new DicomEncoding(ts.ImplicitVR, ts.BigEndian);
        if (detected is not { } d || d == expected || string.IsNullOrEmpty(declared)) return detected ?? expected;
        if (d.Implicit != expected.Implicit || d.BigEndian != expected.BigEndian)
        {
            log.Lenient($"the data set is encoded as {d} although the transfer syntax {ts} says {expected}; read as {d}");
            return d;
        }
        return expected;
    }
}
