using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Io.Dicom.Codecs;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Io.DicomWeb;

/// <summary>One fetched series.</summary>
/// <param name="SeriesInstanceUid">Series Instance UID.</param>
/// <param name="Modality">Modality (0008,0060) from QIDO-RS.</param>
/// <param name="Instances">Instances written.</param>
/// <param name="RequestedTransferSyntax">Explicit VR Little Endian, or "*" when the server refused to transcode.</param>
public sealed record FetchedSeries(string SeriesInstanceUid, string? Modality, int Instances, string RequestedTransferSyntax);

/// <summary>A study fetched into a folder: <c>{Directory}/{SeriesInstanceUID}/{SOPInstanceUID}.dcm</c>.</summary>
public sealed record FetchedStudy(string StudyInstanceUid, string Directory, IReadOnlyList<FetchedSeries> Series)
{
    /// <summary>All instances written.</summary>
    public int Instances => Series.Sum(s => s.Instances);
}

/// <summary>
/// Fetches one study from a DICOMweb server into a folder that the DICOM exam loader reads: QIDO-RS finds the
/// study (an unknown UID is a clear error) and its series with their instance counts; WADO-RS retrieves each
/// series. Every file is checked before it is kept: a DICOM Part 10 object of the requested study whose transfer
/// syntax the engine can decode. Files are staged in a hidden sub-folder and moved in only when the whole study
/// arrived, so a failed fetch leaves nothing that looks like a complete exam.
/// </summary>
public static class DicomWebStudyFetcher
{
    public static async Task<FetchedStudy> FetchAsync(DicomWebClient client, string studyInstanceUid, string directory,
        IProgress<string>? progress = null, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(client);
        DicomWebOptions.CheckUid(studyInstanceUid, "Study Instance UID");
        if (Directory.Exists(directory) && Directory.EnumerateFileSystemEntries(directory).Any())
            throw new InvalidParameterException("the output folder is not empty", directory, "fetch each study into a new or empty folder");
        var studies = await client.SearchStudiesAsync(studyInstanceUid: studyInstanceUid, ct: ct);
        if (studies.Count == 0)
            throw new DicomWebException($"study {studyInstanceUid} is not on the server", "DICOMweb " + client.Options.BaseUrl,
                "check the Study Instance UID and --server (search by Patient ID on the PACS to find it)", 404);
        var seriesList = await client.SearchSeriesAsync(studyInstanceUid, ct);
        if (seriesList.Count == 0)
            throw new DicomWebException($"study {studyInstanceUid} has no series on the server", "DICOMweb " + client.Options.BaseUrl,
                "the study is empty; check it on the PACS");
        bool created = !Directory.Exists(directory);
        Directory.CreateDirectory(directory);
        string staging = Path.Combine(directory, ".fetching-" + Guid.NewGuid().ToString("N")[..12]);
        bool done = false;
        try
        {
            var fetched = new List<FetchedSeries>();
            foreach (var s in seriesList)
            {
                var uid = s.GetString(DicomTags.SeriesInstanceUID)
                          ?? throw new InputFormatException("a QIDO-RS series result has no Series Instance UID (0020,000E)",
                              "DICOMweb " + client.Options.BaseUrl, "the server's answer breaks PS3.18 table 10.6.3-5; check the server");
                progress?.Report($"series {fetched.Count + 1}/{seriesList.Count}");
                fetched.Add(await FetchSeriesAsync(client, studyInstanceUid, uid, s, staging, ct));
            }
            foreach (var d in Directory.EnumerateDirectories(staging))
                Directory.Move(d, Path.Combine(directory, Path.GetFileName(d)));
            done = true;
            return new FetchedStudy(studyInstanceUid, directory, fetched);
        }
        finally
        {
            if (Directory.Exists(staging)) Directory.Delete(staging, recursive: true);
            if (!done && created && !Directory.EnumerateFileSystemEntries(directory).Any()) Directory.Delete(directory);
        }
    }

    private static async Task<FetchedSeries> FetchSeriesAsync(DicomWebClient client, string study, string series, DicomJsonDataset qido,
        string staging, CancellationToken ct)
    {
        string seriesDir = Path.Combine(staging, DicomWebOptions.CheckUid(series, "Series Instance UID"));
        string incoming = Path.Combine(staging, ".incoming");
        var result = await client.RetrieveAsync(study, series, incoming, ct);
        Directory.CreateDirectory(seriesDir);
        foreach (var file in result.Files)
        {
            var sop = CheckInstance(file, study);
            var target = Path.Combine(seriesDir, sop + ".dcm");
            if (File.Exists(target))
                throw new InputFormatException($"the server sent instance {sop} twice", "DICOMweb " + client.Options.BaseUrl, "check the server");
            File.Move(file, target);
        }
        Directory.Delete(incoming);
        // QIDO's Number of Series Related Instances (0020,1209) is the count the server promises; fewer means something was lost.
        if (qido.GetInteger(DicomTags.NumberOfSeriesRelatedInstances) is { } expected && expected != result.Files.Count)
            throw new DicomWebException($"series {series} has {expected} instances on the server but {result.Files.Count} arrived",
                "DICOMweb " + client.Options.BaseUrl, "the study may be changing on the server; try again");
        return new FetchedSeries(series, qido.GetString(DicomTags.Modality), result.Files.Count, result.RequestedTransferSyntax);
    }

    /// <summary>Reads the file's header; returns its SOP Instance UID after checking study and transfer syntax.</summary>
    private static string CheckInstance(string file, string study)
    {
        var dcm = DicomFile.ReadHeader(file);
        string where = $"retrieved instance {Path.GetFileName(file)}";
        var sop = dcm.Dataset.GetStringOrNull(DicomTags.SOPInstanceUID)?.Trim() ?? "";
        if (!DicomUids.IsValid(sop))
            throw new InputFormatException("the instance has no valid SOP Instance UID (0008,0018)", where, "check the object on the server");
        var itsStudy = dcm.Dataset.GetStringOrNull(DicomTags.StudyInstanceUID)?.Trim();
        if (itsStudy != study)
            throw new InputFormatException($"the server sent an instance of another study ({itsStudy})", where, "check the server");
        if (dcm.HasPixelData && dcm.TransferSyntax.Encapsulated) CodecRegistry.Require(dcm.TransferSyntaxUid, where);
        return sop;
    }
}
