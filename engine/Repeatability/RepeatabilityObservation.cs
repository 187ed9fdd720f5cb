namespace Serimetry.Engine.Repeatability;

/// <summary>
/// One row of a tidy test-retest table: the value of one measure on one subject at one repeat
/// (a session, scan, rater or re-acquisition label).
/// </summary>
/// <param name="Subject">Subject (or phantom) label; never logged.</param>
/// <param name="Measure">Dotted measure id, e.g. <c>lesion.adc.median</c>.</param>
/// <param name="Repeat">Repeat label (session, scan, rater).</param>
/// <param name="Value">The measured value; NaN marks a missing value (documented in docs/qa.md).</param>
public sealed record RepeatabilityObservation(string Subject, string Measure, string Repeat, double Value);
