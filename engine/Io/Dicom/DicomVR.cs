namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Value Representations of DICOM PS3.5 section 6.2 (table 6.2-1). Each value packs the two ASCII
/// letters of the VR, so the code read from an Explicit VR header converts directly.
/// <see cref="None"/> marks items and delimiters, which have no VR.
/// </summary>
public enum DicomVR : ushort
{
    None = 0,
    AE = ('A' << 8) | 'E', AS = ('A' << 8) | 'S', AT = ('A' << 8) | 'T',
    CS = ('C' << 8) | 'S',
    DA = ('D' << 8) | 'A', DS = ('D' << 8) | 'S', DT = ('D' << 8) | 'T',
    FD = ('F' << 8) | 'D', FL = ('F' << 8) | 'L',
    IS = ('I' << 8) | 'S',
    LO = ('L' << 8) | 'O', LT = ('L' << 8) | 'T',
    OB = ('O' << 8) | 'B', OD = ('O' << 8) | 'D', OF = ('O' << 8) | 'F', OL = ('O' << 8) | 'L',
    OV = ('O' << 8) | 'V', OW = ('O' << 8) | 'W',
    PN = ('P' << 8) | 'N',
    SH = ('S' << 8) | 'H', SL = ('S' << 8) | 'L', SQ = ('S' << 8) | 'Q', SS = ('S' << 8) | 'S',
    ST = ('S' << 8) | 'T', SV = ('S' << 8) | 'V',
    TM = ('T' << 8) | 'M',
    UC = ('U' << 8) | 'C', UI = ('U' << 8) | 'I', UL = ('U' << 8) | 'L', UN = ('U' << 8) | 'N',
    UR = ('U' << 8) | 'R', US = ('U' << 8) | 'S', UT = ('U' << 8) | 'T', UV = ('U' << 8) | 'V',
}

/// <summary>Properties of each VR from PS3.5 6.2 and 7.1.2.</summary>
public static class DicomVRInfo
{
    /// <summary>Parses the two VR bytes of an Explicit VR header; false when they name no VR.</summary>
    public static bool TryParse(byte first, byte second, out DicomVR vr)
    {
        vr = (DicomVR)((first << 8) | second);
        return IsKnown(vr);
    }

    /// <summary>True for the VRs of PS3.5 table 6.2-1.</summary>
    public static bool IsKnown(DicomVR vr) => vr switch
    {
        DicomVR.AE or DicomVR.AS or DicomVR.AT or DicomVR.CS or DicomVR.DA or DicomVR.DS or DicomVR.DT
            or DicomVR.FD or DicomVR.FL or DicomVR.IS or DicomVR.LO or DicomVR.LT or DicomVR.OB or DicomVR.OD
            or DicomVR.OF or DicomVR.OL or DicomVR.OV or DicomVR.OW or DicomVR.PN or DicomVR.SH or DicomVR.SL
            or DicomVR.SQ or DicomVR.SS or DicomVR.ST or DicomVR.SV or DicomVR.TM or DicomVR.UC or DicomVR.UI
            or DicomVR.UL or DicomVR.UN or DicomVR.UR or DicomVR.US or DicomVR.UT or DicomVR.UV => true,
        _ => false,
    };

    /// <summary>
    /// Explicit VR headers of these VRs have 2 reserved bytes and a 32-bit length (PS3.5 7.1.2,
    /// table 7.1-1); all others a 16-bit length.
    /// </summary>
    public static bool HasLongLength(this DicomVR vr) => vr switch
    {
        DicomVR.OB or DicomVR.OD or DicomVR.OF or DicomVR.OL or DicomVR.OV or DicomVR.OW or DicomVR.SQ
            or DicomVR.SV or DicomVR.UC or DicomVR.UN or DicomVR.UR or DicomVR.UT or DicomVR.UV => true,
        _ => false,
    };

    /// <summary>Character-string VRs (values are text, padded with a space or NUL for UI).</summary>
    public static bool IsString(this DicomVR vr) => vr switch
    {
        DicomVR.AE or DicomVR.AS or DicomVR.CS or DicomVR.DA or DicomVR.DS or DicomVR.DT or DicomVR.IS
            or DicomVR.LO or DicomVR.LT or DicomVR.PN or DicomVR.SH or DicomVR.ST or DicomVR.TM or DicomVR.UC
            or DicomVR.UI or DicomVR.UR or DicomVR.UT => true,
        _ => false,
    };

    /// <summary>
    /// String VRs whose text uses the Specific Character Set (0008,0005) (PS3.5 6.1.2.3); the others
    /// use the default repertoire only.
    /// </summary>
    public static bool UsesSpecificCharacterSet(this DicomVR vr) => vr switch
    {
        DicomVR.SH or DicomVR.LO or DicomVR.ST or DicomVR.LT or DicomVR.PN or DicomVR.UC or DicomVR.UT => true,
        _ => false,
    };

    /// <summary>String VRs that hold exactly one value: backslash is an ordinary character there (PS3.5 6.2).</summary>
    public static bool IsSingleValuedText(this DicomVR vr) =>
        vr is DicomVR.LT or DicomVR.ST or DicomVR.UT or DicomVR.UR;

    /// <summary>Bytes per value of binary VRs; 0 for strings and sequences (PS3.5 6.2).</summary>
    public static int ValueSize(this DicomVR vr) => vr switch
    {
        DicomVR.OB or DicomVR.UN => 1,
        DicomVR.US or DicomVR.SS or DicomVR.OW => 2,
        DicomVR.UL or DicomVR.SL or DicomVR.FL or DicomVR.OF or DicomVR.OL or DicomVR.AT => 4,
        DicomVR.FD or DicomVR.OD or DicomVR.SV or DicomVR.UV or DicomVR.OV => 8,
        _ => 0,
    };

    /// <summary>The two-letter code, or "--" for <see cref="DicomVR.None"/>.</summary>
    public static string Code(this DicomVR vr) =>
        vr == DicomVR.None ? "--" : new string([(char)((ushort)vr >> 8), (char)((ushort)vr & 0xFF)]);
}
