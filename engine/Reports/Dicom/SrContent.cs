using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>
/// Content items of a Structured Report (PS3.3 C.17.3, Document Content Macro and Content Item Macro
/// table C.17-5): each item is a data set with Relationship Type, Value Type, Concept Name and its value.
/// </summary>
internal static class SrContent
{
    public static DicomWriteDataset Container(string relationship, DicomCode concept, params DicomWriteDataset[] children) =>
        Item(relationship, "CONTAINER", concept)
            .Add(DicomTags.ContinuityOfContent, DicomVR.CS, "SEPARATE")
            .AddSequence(DicomTags.ContentSequence, children);

    public static DicomWriteDataset Code(string relationship, DicomCode concept, DicomCode value) =>
        Item(relationship, "CODE", concept).AddSequence(DicomTags.ConceptCodeSequence, SegmentationWriter.Code(value));

    public static DicomWriteDataset Text(string relationship, DicomCode concept, string value) =>
        Item(relationship, "TEXT", concept).Add(DicomTags.TextValue, DicomVR.UT, value);

    public static DicomWriteDataset Uid(string relationship, DicomCode concept, string value) =>
        Item(relationship, "UIDREF", concept).Add(DicomTags.UID, DicomVR.UI, value);

    /// <summary>A NUM item (PS3.3 C.18.1, Numeric Measurement Macro) with a UCUM unit.</summary>
    public static DicomWriteDataset Num(string relationship, DicomCode concept, double value, DicomCode unit, params DicomWriteDataset[] modifiers)
    {
        var item = Item(relationship, "NUM", concept).AddSequence(DicomTags.MeasuredValueSequence, new DicomWriteDataset()
            .AddSequence(DicomTags.MeasurementUnitsCodeSequence, SegmentationWriter.Code(unit))
            .Add(DicomTags.NumericValue, DicomVR.DS, value));
        if (modifiers.Length > 0) item.AddSequence(DicomTags.ContentSequence, modifiers);
        return item;
    }

    /// <summary>An IMAGE item referencing one segment of a SEG (TID 1411 row "Referenced Segment").</summary>
    public static DicomWriteDataset Segment(string relationship, DicomCode concept, string segInstanceUid, int segmentNumber) =>
        Item(relationship, "IMAGE", concept).AddSequence(DicomTags.ReferencedSOPSequence, new DicomWriteDataset()
            .Add(DicomTags.ReferencedSOPClassUID, DicomVR.UI, SegmentationWriter.SegmentationStorage)
            .Add(DicomTags.ReferencedSOPInstanceUID, DicomVR.UI, segInstanceUid)
            .Add(DicomTags.ReferencedSegmentNumber, DicomVR.US, segmentNumber));

    private static DicomWriteDataset Item(string relationship, string valueType, DicomCode concept) => new DicomWriteDataset()
        .Add(DicomTags.RelationshipType, DicomVR.CS, relationship)
        .Add(DicomTags.ValueType, DicomVR.CS, valueType)
        .AddSequence(DicomTags.ConceptNameCodeSequence, SegmentationWriter.Code(concept));
}
