namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>An instance stored by the receiver: its UIDs, the negotiated transfer syntax and the Part 10 file written.</summary>
public sealed record ReceivedInstance(string SopClassUid, string SopInstanceUid, string StudyInstanceUid, string TransferSyntaxUid,
    string Path, long Bytes);

/// <summary>How an association ended.</summary>
public enum AssociationEnd
{
    /// <summary>A-RELEASE-RQ answered with A-RELEASE-RP (the normal end).</summary>
    Released,

    /// <summary>The peer sent A-ABORT.</summary>
    AbortedByPeer,

    /// <summary>This side sent A-ABORT (malformed, unexpected or oversized PDU).</summary>
    Aborted,

    /// <summary>This side answered A-ASSOCIATE-RJ.</summary>
    Rejected,

    /// <summary>The ARTIM or idle timer expired (this side sent A-ABORT).</summary>
    TimedOut,

    /// <summary>The transport connection closed without release or abort.</summary>
    ConnectionLost,

    /// <summary>The receiver was stopped.</summary>
    Stopped,
}

/// <summary>
/// What happened on one association, for the host's log and audit: peer address, AE titles (not patient data),
/// the end, the refusal or protocol problem if any, the instances stored and the C-STOREs answered with an error status.
/// </summary>
public sealed record AssociationSummary(string Peer, string? CallingAe, string? CalledAe, AssociationEnd End, string? Problem,
    IReadOnlyList<ReceivedInstance> Instances, int FailedStores);

/// <summary>The host's part of the receiver: where instances go, and what to do when an association ends.</summary>
public interface IStorageScpHandler
{
    /// <summary>
    /// The folder that receives the instances of study <paramref name="studyInstanceUid"/> (a valid UID); the receiver
    /// moves each verified file into it with one rename, named by its SOP Instance UID. Must be on the scratch folder's volume.
    /// </summary>
    string DirectoryFor(string studyInstanceUid);

    /// <summary>Called once per connection when it ends (also for rejected and aborted ones).</summary>
    Task AssociationEndedAsync(AssociationSummary summary);
}
