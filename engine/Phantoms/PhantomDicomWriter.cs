using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Reports.Dicom;

namespace Serimetry.Engine.Phantoms;

/// <summary>
/// Writes a phantom subject as DICOM exams (docs/dicom-out.md): <c>DIR/visit-&lt;k&gt;/dicom/{t2w,dwi,adc}/*.dcm</c>
/// as classic MR Image Storage series (<see cref="MrSeriesWriter"/>; DWI is one series holding every b-value
/// with Diffusion b-value (0018,9087)), one Study Instance UID and Frame of Reference per visit, Patient ID =
/// subject id, Study Date = visit date; masks as NIfTI in <c>DIR/visit-&lt;k&gt;/masks/</c> (the DICOM loader
/// ignores non-DICOM files) and as a binary SEG <c>masks/seg.dcm</c> (segments Prostate, Lesion) referencing the T2w series, <c>truth.json</c> and <c>spec.json</c> as for NIfTI output. UIDs are derived from
/// the spec's subject id and seed, so the same spec gives the same files.
/// </summary>
public static class PhantomDicomWriter
{
    /// <summary>Writes every visit; <paramref name="progress"/> is told after each visit.</summary>
    public static void Write(string directory, PhantomSubject subject, Action<int>? progress = null, string uidRoot = DicomUids.UuidRoot)
    {
        ArgumentNullException.ThrowIfNull(subject);
        Directory.CreateDirectory(directory);
        foreach (var v in subject.Visits)
        {
            var dir = Path.Combine(directory, $"visit-{v.Index}");
            var t2 = WriteVisit(Path.Combine(dir, "dicom"), subject, v, uidRoot);
            var masks = Path.Combine(dir, "masks");
            Directory.CreateDirectory(masks);
            WriteTruthSeg(Path.Combine(masks, "seg.dcm"), subject, v, t2, uidRoot);
            NiftiFile.Write(Path.Combine(masks, "gland.nii.gz"), v.GlandMask);
            NiftiFile.Write(Path.Combine(masks, "zones.nii.gz"), v.ZoneMask);
            NiftiFile.Write(Path.Combine(masks, "lesion.nii.gz"), v.LesionMask);
            progress?.Invoke(v.Index + 1);
        }
        PhantomTruthWriter.WriteFile(Path.Combine(directory, "truth.json"), subject);
        File.WriteAllText(Path.Combine(directory, "spec.json"), subject.Spec.ToJson());
    }

    /// <summary>Writes one visit's three series into <paramref name="dicomDir"/>; returns the T2w series reference.</summary>
    internal static SegSourceReference WriteVisit(string dicomDir, PhantomSubject subject, PhantomVisit v, string uidRoot)
    {
        string seed = $"serimetry-phantom/{subject.SubjectId}/{subject.Spec.Seed}/{subject.Spec.NoiseSeed}/visit-{v.Index}";
        var study = Study(subject, v, seed, uidRoot);
        var t2 = Series(study, seed + "/t2w", 1, "T2W TSE AX", uidRoot, "ORIGINAL", "PRIMARY", "OTHER");
        Acquisition(t2, v.T2wAcquisition, "SE", "SK", 3000, 100);
        var t2Uids = MrSeriesWriter.Write(Path.Combine(dicomDir, "t2w"), "t2w", v.T2w, t2, seed + "/t2w", 1, uidRoot);

        var dwi = Series(study, seed + "/dwi", 2, "DWI EPI AX", uidRoot, "ORIGINAL", "PRIMARY", "OTHER");
        Acquisition(dwi, v.DwiAcquisition, "EP", "SK\\SP", 4000, 80);
        int instance = 1;
        foreach (var d in v.Dwi)
        {
            double b = d.BValue;
            MrSeriesWriter.Write(Path.Combine(dicomDir, "dwi"), "dwi", d.Image, dwi, seed + "/dwi", instance, uidRoot,
                ds => ds.Add(DicomTags.DiffusionBValue, DicomVR.FD, b));
            instance += d.Image.Size.Z;
        }

        var adc = Series(study, seed + "/adc", 3, "ADC (10^-6 mm2/s)", uidRoot, "DERIVED", "PRIMARY", "DIFFUSION MAP", "ADC");
        Acquisition(adc, v.DwiAcquisition, "EP", "SK\\SP", 4000, 80);
        MrSeriesWriter.Write(Path.Combine(dicomDir, "adc"), "adc", v.Adc, adc, seed + "/adc", 1, uidRoot);
        return new SegSourceReference(DicomUids.FromName(seed + "/t2w/series", uidRoot), MrSeriesWriter.MrImageStorage, t2Uids,
            DicomUids.FromName(seed + "/frame-of-reference", uidRoot), "PHANTOM^" + subject.SubjectId, StudyTime, StudyId(v));
    }

    /// <summary>The truth masks (gland, lesion) as a binary SEG on the T2w series (docs/dicom-out.md).</summary>
    private static void WriteTruthSeg(string path, PhantomSubject subject, PhantomVisit v, SegSourceReference t2, string uidRoot)
    {
        string seed = $"serimetry-phantom/{subject.SubjectId}/{subject.Spec.Seed}/{subject.Spec.NoiseSeed}/visit-{v.Index}";
        SegmentationWriter.Write(path, v.T2w.Geometry,
        [
            new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "Serimetry phantom truth", v.GlandMask, "prostate"),
            new SegmentDefinition("Lesion", DicomCode.MorphologicallyAlteredStructure, DicomCode.Neoplasm, "AUTOMATIC", "Serimetry phantom truth", v.LesionMask, "lesion-1"),
        ], new DicomStudyInfo(subject.SubjectId, null, DicomUids.FromName(seed + "/study", uidRoot), v.Date), t2, uidRoot, 900, seed + "/seg");
    }

    /// <summary>Every phantom visit is an exam at 09:00 on the visit date.</summary>
    private const string StudyTime = "090000";

    /// <summary>Study ID (0020,0010): the visit's number, counted from 1.</summary>
    private static string StudyId(PhantomVisit v) => (v.Index + 1).ToString(CultureInfo.InvariantCulture);

    private static DicomWriteDataset Study(PhantomSubject subject, PhantomVisit v, string seed, string uidRoot) =>
        new DicomWriteDataset()
            .Add(DicomTags.PatientName, DicomVR.PN, "PHANTOM^" + subject.SubjectId)
            .Add(DicomTags.PatientID, DicomVR.LO, subject.SubjectId)
            .Add(DicomTags.PatientBirthDate, DicomVR.DA, "")
            .Add(DicomTags.PatientSex, DicomVR.CS, "M")
            .Add(DicomTags.StudyInstanceUID, DicomVR.UI, DicomUids.FromName(seed + "/study", uidRoot))
            .Add(DicomTags.StudyDate, DicomVR.DA, v.Date.ToString("yyyyMMdd", CultureInfo.InvariantCulture))
            .Add(DicomTags.StudyTime, DicomVR.TM, StudyTime)
            .Add(DicomTags.ReferringPhysicianName, DicomVR.PN, "")
            .Add(DicomTags.StudyID, DicomVR.SH, StudyId(v))
            .Add(DicomTags.AccessionNumber, DicomVR.SH, "")
            .Add(DicomTags.StudyDescription, DicomVR.LO, "Synthetic prostate MRI phantom")
            .Add(DicomTags.FrameOfReferenceUID, DicomVR.UI, DicomUids.FromName(seed + "/frame-of-reference", uidRoot))
            .Add(DicomTags.PositionReferenceIndicator, DicomVR.LO, "")
            .Add(DicomTags.Manufacturer, DicomVR.LO, "Serimetry phantom")
            .Add(DicomTags.BodyPartExamined, DicomVR.CS, "PROSTATE")
            .Add(DicomTags.PatientPosition, DicomVR.CS, "FFS");

    private static DicomWriteDataset Series(DicomWriteDataset study, string seed, int number, string description, string uidRoot,
        params string[] imageType) =>
        new DicomWriteDataset().CopyFrom(study)
            .Add(DicomTags.SeriesInstanceUID, DicomVR.UI, DicomUids.FromName(seed + "/series", uidRoot))
            .Add(DicomTags.SeriesNumber, DicomVR.IS, number)
            .Add(DicomTags.SeriesDescription, DicomVR.LO, description)
            .Add(DicomTags.ImageType, DicomVR.CS, imageType);

    private static void Acquisition(DicomWriteDataset ds, AcquisitionInfo a, string sequence, string variant, double tr, double te) =>
        ds.Add(DicomTags.ScanningSequence, DicomVR.CS, sequence)
          .Add(DicomTags.SequenceVariant, DicomVR.CS, variant.Split('\\'))
          .Add(DicomTags.ScanOptions, DicomVR.CS, "")
          .Add(DicomTags.MRAcquisitionType, DicomVR.CS, "2D")
          .Add(DicomTags.RepetitionTime, DicomVR.DS, a.RepetitionTimeMs ?? tr)
          .Add(DicomTags.EchoTime, DicomVR.DS, a.EchoTimeMs ?? te)
          .Add(DicomTags.EchoTrainLength, DicomVR.IS, 1)
          .Add(DicomTags.MagneticFieldStrength, DicomVR.DS, a.FieldStrengthT ?? 3)
          .Add(DicomTags.ManufacturerModelName, DicomVR.LO, a.Model ?? "digital phantom");
}
