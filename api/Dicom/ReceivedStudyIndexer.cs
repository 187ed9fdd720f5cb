using System.Security.Cryptography;
using System.Text;
using Serimetry.Api.Hosting;
using Serimetry.Api.Intake;
using Serimetry.Api.Storage;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Network;

namespace Serimetry.Api.Dicom;

/// <summary>
/// The service's side of the DICOM receiver. Instances are kept per Study Instance UID under <c>received/&lt;hash&gt;/</c>;
/// when an association ends, every study it touched is indexed through <see cref="StudyIntake"/> with all instances
/// received for it so far (exactly as an upload of those files: content-addressed blobs, study row, roles), then the
/// trigger rule runs. Once indexed, the received copies are removed (the blob store and study folder hold them) and
/// only the study id is kept there, so the next association on the study indexes the earlier instances with the new;
/// when indexing fails they stay for a re-send. The association is audited (calling AE title, instance count); the log carries study ids only.
/// </summary>
internal sealed class ReceivedStudyIndexer(DataPaths paths, StudyIntake intake, MetadataStore store, ComparisonTrigger trigger,
    ServiceOptions options, ILogger<ReceivedStudyIndexer> log) : IStorageScpHandler
{
    private readonly Lock _indexing = new();

    /// <summary>Name of the small file in a study's received folder that holds the study id it was last indexed as.</summary>
    internal const string IndexedAsFile = "indexed-as";

    /// <summary>Where received instances are kept (per study) until they are indexed.</summary>
    public string ReceivedRoot => Path.Combine(paths.Root, "received");

    public string DirectoryFor(string studyInstanceUid) =>
        Path.Combine(ReceivedRoot, Convert.ToHexStringLower(SHA256.HashData(Encoding.ASCII.GetBytes(studyInstanceUid)))[..32]);

    public Task AssociationEndedAsync(AssociationSummary s)
    {
        string who = s.CallingAe ?? "?";
        if (s.End == AssociationEnd.Released || s.Instances.Count > 0)
            log.LogInformation("DICOM association from {CallingAe} at {Peer} ended ({End}): {Instances} instances stored, {Failed} refused",
                who, s.Peer, s.End, s.Instances.Count, s.FailedStores);
        else
            log.LogWarning("DICOM association from {CallingAe} at {Peer} ended ({End}): {Problem}", who, s.Peer, s.End, s.Problem);
        if (s.CallingAe is not null)
            store.Audit("dicom:" + s.CallingAe, "dicom-association", $"{s.End.ToString().ToLowerInvariant()}; {s.Instances.Count} instances stored; {s.FailedStores} refused");
        foreach (var study in s.Instances.Select(i => i.StudyInstanceUid).Distinct(StringComparer.Ordinal))
        {
            try { Index(DirectoryFor(study), who); }
            catch (Exception e) when (e is not OutOfMemoryException and not InputException)
            {
                // Type only: messages of storage errors may quote paths or values. The files stay in received/ for a re-send.
                log.LogError("received study in {Folder} could not be indexed: {ErrorType}", Path.GetFileName(DirectoryFor(study)), e.GetType().FullName);
            }
        }
        return Task.CompletedTask;
    }

    private void Index(string dir, string callingAe)
    {
        // One study at a time: two associations ending together on one study would otherwise index it twice over.
        lock (_indexing)
        {
            var received = Directory.GetFiles(dir, "*.dcm");
            var files = EarlierInstances(dir);
            foreach (var f in received) files[Path.GetFileName(f)] = f; // a re-sent instance replaces the earlier copy
            try
            {
                var study = intake.Ingest(files.Select(f => new IntakeFile(f.Key, f.Value)).ToList(), moveFiles: false);
                RecordIndexed(dir, study.Id, received);
                store.Audit("dicom:" + callingAe, "receive-study", study.Id);
                log.LogInformation("study {StudyId} indexed from DICOM ({Files} instances)", study.Id, files.Count);
                if (options.AutoCompare) trigger.Consider(study);
            }
            catch (InputException e)
            {
                log.LogWarning("received instances in {Folder} could not be indexed: input problem of kind {Kind}", Path.GetFileName(dir), e.Kind);
            }
        }
    }

    /// <summary>
    /// The instances indexed before for this study (name → file in the study folder it was last indexed as), so a
    /// later association that adds series indexes the whole study again, not only its new part.
    /// </summary>
    private SortedDictionary<string, string> EarlierInstances(string dir)
    {
        var files = new SortedDictionary<string, string>(StringComparer.Ordinal);
        string marker = Path.Combine(dir, IndexedAsFile);
        if (!File.Exists(marker)) return files;
        string earlier = Path.Combine(paths.Studies, File.ReadAllText(marker).Trim());
        if (Directory.Exists(earlier))
            foreach (var f in Directory.GetFiles(earlier, "*.dcm")) files[Path.GetFileName(f)] = f;
        return files;
    }

    /// <summary>
    /// After a successful index: notes the study id (written aside and renamed, so it is whole or absent) and removes
    /// the received copies, which now live in the blob store and the study folder.
    /// </summary>
    private void RecordIndexed(string dir, string studyId, string[] received)
    {
        string tmp = Path.Combine(dir, IndexedAsFile + "." + Guid.NewGuid().ToString("N"));
        File.WriteAllText(tmp, studyId);
        File.Move(tmp, Path.Combine(dir, IndexedAsFile), overwrite: true);
        foreach (var f in received)
        {
            try { File.Delete(f); }
            catch (IOException) { } // left for the next association on this study, which indexes it again (same content, same blob)
        }
    }
}
