namespace Serimetry.Engine.Io.Masks;

/// <summary>SOP Class UIDs of the DICOM objects that carry outlines (PS3.4 B.5, PS3.6 annex A).</summary>
public static class MaskSopClasses
{
    /// <summary>Segmentation Storage.</summary>
    public const string Segmentation = "1.2.840.10008.5.1.4.1.1.66.4";

    /// <summary>RT Structure Set Storage.</summary>
    public const string RtStructureSet = "1.2.840.10008.5.1.4.1.1.481.3";
}
