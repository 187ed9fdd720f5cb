namespace Serimetry.Cli.Verbs;

/// <summary>One verb of the <c>serimetry</c> program. Verbs only parse, call the engine and print.</summary>
internal interface IVerb
{
    VerbSpec Spec { get; }

    int Run(ParsedArgs args, CliContext ctx);
}
