namespace Serimetry.Engine.Io.Series;

/// <summary>
/// A cheap first look at a file's opening bytes to skip obvious non-DICOM files without parsing them:
/// a Part 10 file has "DICM" after a 128-byte preamble (PS3.10 7.1); a bare data set starts with a
/// group 0002 or 0008 element tag in either byte order.
/// </summary>
internal static class DicomSniffer
{
    public const int BytesNeeded = 132;

    public static bool LooksLikeDicom(ReadOnlySpan<byte> head)
    {
        if (head.Length >= 132 && head[128] == 'D' && head[129] == 'I' && head[130] == 'C' && head[131] == 'M') return true;
        if (head.Length < 8) return false;
        int le = head[0] | (head[1] << 8);
        int be = (head[0] << 8) | head[1];
        return le is 0x0002 or 0x0008 || be is 0x0002 or 0x0008;
    }

    public static bool FileLooksLikeDicom(string path)
    {
        Span<byte> head = stackalloc byte[BytesNeeded];
        using var fs = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1, FileOptions.None);
        int n = 0;
        while (n < head.Length)
        {
            int r = fs.Read(head[n..]);
            if (r == 0) break;
            n += r;
        }
        return LooksLikeDicom(head[..n]);
    }
}
