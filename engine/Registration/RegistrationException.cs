namespace Serimetry.Engine.Registration;

/// <summary>
/// Registration could not run or could not produce a usable result (images that do not overlap in
/// physical space, a constant image, an empty mask). Kept separate from the input-error family: the
/// inputs may each be valid on their own. <see cref="Fix"/> says what the user can do about it.
/// </summary>
public sealed class RegistrationException(string message, string? fix = null, Exception? inner = null)
    : Exception(message, inner)
{
    /// <summary>What the user can do about it.</summary>
    public string? Fix { get; } = fix;

    /// <summary>A stable short identifier of the error kind.</summary>
    public string Kind => "registration";

    /// <summary>The message with the fix, on one line.</summary>
    public string Describe() => string.IsNullOrEmpty(Fix) ? Message : $"{Message} ({Fix})";
}
