using System.Text.RegularExpressions;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Dicom.Writing;

namespace Serimetry.Engine.Io.Dicom.Network;

/// <summary>
/// The data set of one C-STORE-RQ as its fragments arrive (PS3.7 9.1.1, PS3.8 annex E): streamed into a scratch Part 10 file
/// whose File Meta comes from the command's SOP class/instance UIDs and the context's transfer syntax; on the last
/// fragment it is read back, checked against the command and renamed into its study folder (atomic).
/// </summary>
internal sealed partial class IncomingInstance : IAsyncDisposable
{
    private readonly DimseCommand _command;
    private readonly string _transferSyntax;
    private readonly StorageScpOptions _options;
    private readonly string _scratch;
    private FileStream? _file;
    private long _dataBytes;
    private (ushort Status, string Comment)? _refusal;

    public IncomingInstance(DimseCommand command, string abstractSyntax, string transferSyntax, StorageScpOptions options)
    {
        _command = command;
        _transferSyntax = transferSyntax;
        _options = options;
        _scratch = Path.Combine(options.ScratchDirectory, $"cstore-{Guid.NewGuid():N}.dcm.part");
        if (command.AffectedSopClassUid != abstractSyntax)
            _refusal = (DimseStatus.SopClassNotSupported, "Affected SOP Class UID differs from the presentation context's abstract syntax");
        else if (!IsUid(command.AffectedSopInstanceUid))
            _refusal = (DimseStatus.CannotUnderstand, "Affected SOP Instance UID is missing or not a valid UID");
    }

    public DimseCommand Command => _command;

    /// <summary>Appends one data fragment (dropped once the instance is refused or over the size limit).</summary>
    public async Task AppendAsync(ReadOnlyMemory<byte> fragment, CancellationToken ct)
    {
        _dataBytes += fragment.Length;
        if (_refusal is not null) return;
        if (_dataBytes > _options.MaxInstanceBytes)
        {
            Refuse(DimseStatus.OutOfResources, $"data set larger than the receiver's limit of {_options.MaxInstanceBytes:N0} bytes");
            return;
        }
        try
        {
            if (_file is null)
            {
                _file = new FileStream(_scratch, FileMode.CreateNew, FileAccess.Write, FileShare.None, 1 << 16, useAsync: true);
                DicomPart10Writer.WriteFilePrefix(_file, _command.AffectedSopClassUid!, _command.AffectedSopInstanceUid!, _transferSyntax);
            }
            await _file.WriteAsync(fragment, ct);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            Refuse(DimseStatus.OutOfResources, "the receiver could not write the instance (storage full or unavailable)");
        }
    }

    private void Refuse(ushort status, string comment)
    {
        _refusal = (status, comment);
        _file?.Dispose();
        _file = null;
        TryDelete(_scratch);
    }

    /// <summary>Completes the instance after its last fragment: the response status and, when stored, the instance.</summary>
    public async Task<(DimseCommand Response, ReceivedInstance? Stored)> CompleteAsync(IStorageScpHandler handler)
    {
        if (_refusal is null && _file is null) _refusal = (DimseStatus.CannotUnderstand, "the data set is empty");
        if (_refusal is { } r) return (_command.Response(r.Status, r.Comment), null);
        try
        {
            await _file!.FlushAsync();
            await _file.DisposeAsync();
            _file = null;
            return Verify(handler);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            TryDelete(_scratch);
            return (_command.Response(DimseStatus.OutOfResources, "the receiver could not write the instance"), null);
        }
    }

    private (DimseCommand, ReceivedInstance?) Verify(IStorageScpHandler handler)
    {
        DicomDataset ds;
        try { ds = DicomFile.ReadHeader(_scratch).Dataset; }
        catch (InputException)
        {
            TryDelete(_scratch);
            return (_command.Response(DimseStatus.CannotUnderstand, "the data set cannot be parsed in the negotiated transfer syntax"), null);
        }
        string? problem = ds.GetStringOrNull(DicomTags.SOPClassUID) != _command.AffectedSopClassUid ? "SOP Class UID (0008,0016) differs from the command's"
            : ds.GetStringOrNull(DicomTags.SOPInstanceUID) != _command.AffectedSopInstanceUid ? "SOP Instance UID (0008,0018) differs from the command's"
            : !IsUid(ds.GetStringOrNull(DicomTags.StudyInstanceUID)) ? "Study Instance UID (0020,000D) is missing or invalid"
            : null;
        if (problem is not null)
        {
            TryDelete(_scratch);
            return (_command.Response(DimseStatus.DataSetDoesNotMatchSopClass, problem), null);
        }
        string study = ds.GetString(DicomTags.StudyInstanceUID);
        string dir = handler.DirectoryFor(study);
        Directory.CreateDirectory(dir);
        string final = Path.Combine(dir, _command.AffectedSopInstanceUid + ".dcm");
        long bytes = new FileInfo(_scratch).Length;
        File.Move(_scratch, final, overwrite: true);
        var stored = new ReceivedInstance(_command.AffectedSopClassUid!, _command.AffectedSopInstanceUid!, study, _transferSyntax, final, bytes);
        return (_command.Response(DimseStatus.Success), stored);
    }

    /// <summary>A UID as PS3.5 9.1 defines it: digits and dots, at most 64 characters (leading zeros tolerated).</summary>
    internal static bool IsUid(string? uid) => uid is { Length: > 0 and <= 64 } && UidPattern().IsMatch(uid);

    [GeneratedRegex(@"^[0-9]+(\.[0-9]+)*$")]
    private static partial Regex UidPattern();

    private static void TryDelete(string path)
    {
        try { File.Delete(path); }
        catch (IOException)
        {
            // A scratch file left behind is harmless: it is never indexed (only *.dcm in study folders are).
        }
    }

    /// <summary>Drops an unfinished instance (association ended mid-transfer): nothing is kept.</summary>
    public async ValueTask DisposeAsync()
    {
        if (_file is null) return;
        await _file.DisposeAsync();
        _file = null;
        TryDelete(_scratch);
    }
}
