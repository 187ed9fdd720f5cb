using System.Globalization;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Reports.Dicom;

/// <summary>
/// Patient, study, series, frame of reference and equipment attributes shared by the SEG and SR objects
/// (PS3.3 C.7.1.1, C.7.2.1, C.7.3.1, C.7.4.1, C.7.5.1, C.7.5.2).
/// </summary>
internal static class SegmentationHeader
{
    /// <summary>New UIDs: random, or derived from a seed and a purpose when the seed is given (repeatable output).</summary>
    internal sealed class UidSource(string root, string? seed)
    {
        public string Root => root;

        public string Next(string purpose) => seed is null ? DicomUids.New(root) : DicomUids.FromName(seed + "/" + purpose, root);
    }

    public static void AddPatientStudySeries(DicomWriteDataset ds, DicomStudyInfo study, SegSourceReference? source, UidSource uids,
        int seriesNumber, DateTime now, string modality = "SEG")
    {
        string date = now.ToString("yyyyMMdd", CultureInfo.InvariantCulture);
        string time = now.ToString("HHmmss", CultureInfo.InvariantCulture);
        ds.Add(DicomTags.PatientName, DicomVR.PN, source?.PatientName ?? study.PatientName ?? "")
          .Add(DicomTags.PatientID, DicomVR.LO, study.PatientId ?? "")
          .Add(DicomTags.PatientBirthDate, DicomVR.DA, "")
          .Add(DicomTags.PatientSex, DicomVR.CS, "")
          .Add(DicomTags.StudyInstanceUID, DicomVR.UI, study.StudyInstanceUid ?? uids.Next("study"))
          .Add(DicomTags.StudyDate, DicomVR.DA, study.StudyDate?.ToString("yyyyMMdd", CultureInfo.InvariantCulture) ?? "")
          .Add(DicomTags.StudyTime, DicomVR.TM, source?.StudyTime ?? study.StudyTime ?? "")
          .Add(DicomTags.ReferringPhysicianName, DicomVR.PN, "")
          .Add(DicomTags.StudyID, DicomVR.SH, source?.StudyId ?? study.StudyId ?? "")
          .Add(DicomTags.AccessionNumber, DicomVR.SH, "")
          .Add(DicomTags.Modality, DicomVR.CS, modality)
          .Add(DicomTags.SeriesInstanceUID, DicomVR.UI, uids.Next("series"))
          .Add(DicomTags.SeriesNumber, DicomVR.IS, seriesNumber)
          .Add(DicomTags.SeriesDescription, DicomVR.LO, modality switch { "SEG" => "Serimetry outlines", "RTSTRUCT" => "Serimetry contours", _ => "Serimetry measurements" })
          .Add(DicomTags.SeriesDate, DicomVR.DA, date)
          .Add(DicomTags.SeriesTime, DicomVR.TM, time)
          .Add(DicomTags.ContentDate, DicomVR.DA, date)
          .Add(DicomTags.ContentTime, DicomVR.TM, time)
          .Add(DicomTags.InstanceCreationDate, DicomVR.DA, date)
          .Add(DicomTags.Manufacturer, DicomVR.LO, SoftwareInfo.Name)
          .Add(DicomTags.ManufacturerModelName, DicomVR.LO, SoftwareInfo.Name)
          .Add(DicomTags.DeviceSerialNumber, DicomVR.LO, "0")
          .Add(DicomTags.SoftwareVersions, DicomVR.LO, SoftwareInfo.Version);
        if (modality == "SEG")
            ds.Add(DicomTags.FrameOfReferenceUID, DicomVR.UI, source?.FrameOfReferenceUid ?? uids.Next("frame-of-reference"))
              .Add(DicomTags.PositionReferenceIndicator, DicomVR.LO, "");
    }
}
