namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// The leniencies used while reading one file, shared by the file's data sets (reads and on-demand
/// conversions both add to it). Thread-safe.
/// </summary>
internal sealed class DicomReadLog(DicomReadOptions options, string source)
{
    private readonly List<string> _items = [];
    private readonly Lock _lock = new();

    public DicomReadOptions Options { get; } = options;

    /// <summary>File name or other description of the input, for error locations.</summary>
    public string Source { get; } = source;

    public IReadOnlyList<string> Items
    {
        get { lock (_lock) return _items.ToArray(); }
    }

    /// <summary>Records a leniency, or throws in strict mode.</summary>
    public void Lenient(string what, string? where = null)
    {
        if (Options.Strict)
            throw new Core.InputFormatException(what + " (strict reading)", where ?? Source,
                "read without the strict option to accept this deviation");
        lock (_lock)
            if (!_items.Contains(what) && _items.Count < 200) _items.Add(what);
    }
}
