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
/// trigger rule runs. The association is audited (calling AE title, instance count); the log carries study ids only.
/// </summary>
internal sealed class ReceivedStudyIndexer(DataPaths paths, StudyIntake intake, MetadataStore store, ComparisonTrigger trigger,
    ServiceOptions options, ILogger<ReceivedStudyIndexer> log) : IStorageScpHandler
{
    private readonly Lock _indexing = new();

    /// <summary>Where received instances are kept (per study).</summary>
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
            try
            {
                var files = Directory.GetFiles(dir, "*.dcm").Order(StringComparer.Ordinal)
                    .Select(f => (Path.GetFileName(f), File.ReadAllBytes(f))).ToList();
                var study = intake.Ingest(files);
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
}
