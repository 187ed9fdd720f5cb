using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>Settings of the storage service class provider (<see cref="StorageScpListener"/>).</summary>
public sealed record StorageScpOptions
{
    /// <summary>Our AE title (PS3.5 AE: 1-16 characters, no backslash or control characters).</summary>
    public string AeTitle { get; init; } = "SERIMETRY";

    /// <summary>Refuse associations whose called AE title is not <see cref="AeTitle"/> (A-ASSOCIATE-RJ, reason 7).</summary>
    public bool CheckCalledAeTitle { get; init; } = true;

    /// <summary>Calling AE titles allowed to associate; empty = any (else A-ASSOCIATE-RJ, reason 3).</summary>
    public IReadOnlyList<string> AllowedCallingAeTitles { get; init; } = [];

    /// <summary>
    /// Largest PDU variable field accepted, announced as our maximum length received (PS3.8 D.1). A PDU announcing more
    /// is refused with A-ABORT before its body is read.
    /// </summary>
    public uint MaxPduLength { get; init; } = 1 << 20;

    /// <summary>ARTIM timer (PS3.8 9.1.5): wait for the A-ASSOCIATE-RQ after connect, and for the close after release or abort.</summary>
    public TimeSpan ArtimTimeout { get; init; } = TimeSpan.FromSeconds(30);

    /// <summary>Longest silence accepted inside an association (between or within PDUs) before it is aborted.</summary>
    public TimeSpan IdleTimeout { get; init; } = TimeSpan.FromMinutes(5);

    /// <summary>Largest data set accepted in one C-STORE; a larger one is answered with status A700 (out of resources).</summary>
    public long MaxInstanceBytes { get; init; } = 1L << 30;

    /// <summary>Associations served at the same time; more are refused with A-ASSOCIATE-RJ (transient, local limit exceeded).</summary>
    public int MaxAssociations { get; init; } = 8;

    /// <summary>Abstract syntaxes accepted: Verification and the storage SOP classes.</summary>
    public IReadOnlyList<string> AbstractSyntaxes { get; init; } = StorageSopClasses.Accepted;

    /// <summary>Transfer syntaxes accepted, in no particular order (the requester's order of preference decides).</summary>
    public IReadOnlyList<string> TransferSyntaxes { get; init; } = NetworkTransferSyntaxes.Accepted;

    /// <summary>Folder for instances being received (same volume as the final folders, so the final rename is atomic).</summary>
    public string ScratchDirectory { get; init; } = Path.GetTempPath();

    /// <summary>Checks the settings; an <see cref="InvalidParameterException"/> names the bad one.</summary>
    public StorageScpOptions Validate()
    {
        if (!IsValidAeTitle(AeTitle))
            throw new InvalidParameterException($"AE title '{AeTitle}' is not valid", "DICOM AE title",
                "use 1-16 characters, no backslash or control characters, not only spaces (PS3.5 AE)");
        foreach (var ae in AllowedCallingAeTitles)
            if (!IsValidAeTitle(ae))
                throw new InvalidParameterException($"allowed calling AE title '{ae}' is not valid", "DICOM calling AE titles", "use 1-16 characters (PS3.5 AE)");
        if (MaxPduLength < 4096)
            throw new InvalidParameterException($"maximum PDU length {MaxPduLength} is below 4096 bytes", "DICOM max PDU", "use at least 4096 (dcmtk uses 16384)");
        if (MaxAssociations < 1)
            throw new InvalidParameterException($"maximum associations {MaxAssociations} must be at least 1", "DICOM associations", "use 1 or more");
        if (ArtimTimeout <= TimeSpan.Zero || IdleTimeout <= TimeSpan.Zero)
            throw new InvalidParameterException("DICOM timeouts must be positive", "DICOM timeouts", "use a number of seconds above 0");
        return this;
    }

    /// <summary>True for a valid AE title (PS3.5 table 6.2-1, AE).</summary>
    public static bool IsValidAeTitle(string? ae) =>
        ae is { Length: > 0 and <= 16 } && ae.Trim().Length > 0 && ae.All(c => c >= 0x20 && c < 0x7F && c != '\\');
}
