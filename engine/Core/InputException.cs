namespace Serimetry.Engine.Core;

/// <summary>
/// The one family of errors caused by the user's input (files, masks, parameters). Each says what is
/// wrong, where, and what to do. Hosts map it to a clear one-line message (CLI) or a problem-details
/// response (HTTP); programming mistakes use ordinary argument exceptions instead.
/// </summary>
public abstract class InputException : Exception
{
    protected InputException(string message, string? where, string? fix, Exception? inner)
        : base(message, inner)
    {
        Where = where;
        Fix = fix;
    }

    /// <summary>Where the problem is (a file, an element, a parameter); never patient identifiers.</summary>
    public string? Where { get; }

    /// <summary>What the user can do about it.</summary>
    public string? Fix { get; }

    /// <summary>A stable short identifier of the error kind, used by the API's problem type.</summary>
    public abstract string Kind { get; }

    /// <summary>The message with location and fix, on one line.</summary>
    public string Describe()
    {
        var s = Message;
        if (!string.IsNullOrEmpty(Where)) s = $"{Where}: {s}";
        if (!string.IsNullOrEmpty(Fix)) s = $"{s} ({Fix})";
        return s;
    }
}

/// <summary>The input is malformed: truncated, inconsistent or not the format it claims to be.</summary>
public sealed class InputFormatException(string message, string? where = null, string? fix = null, Exception? inner = null)
    : InputException(message, where, fix, inner)
{
    public override string Kind => "format";
}

/// <summary>The input is valid but uses something Serimetry does not support (e.g. a lossy transfer syntax).</summary>
public sealed class UnsupportedInputException(string message, string? where = null, string? fix = null, Exception? inner = null)
    : InputException(message, where, fix, inner)
{
    public override string Kind => "unsupported";
}

/// <summary>Two inputs do not occupy the same physical space, or one geometry is invalid.</summary>
public sealed class GeometryMismatchException(string message, string? where = null, string? fix = null, Exception? inner = null)
    : InputException(message, where, fix, inner)
{
    public override string Kind => "geometry";
}

/// <summary>The input exceeds a safety limit (voxel count, decompressed size, file count).</summary>
public sealed class InputLimitException(string message, string? where = null, string? fix = null, Exception? inner = null)
    : InputException(message, where, fix, inner)
{
    public override string Kind => "limit";
}

/// <summary>A parameter or option has a missing, unknown or out-of-range value.</summary>
public sealed class InvalidParameterException(string message, string? where = null, string? fix = null, Exception? inner = null)
    : InputException(message, where, fix, inner)
{
    public override string Kind => "parameter";
}
