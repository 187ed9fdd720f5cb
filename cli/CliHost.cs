using Serimetry.Cli.Verbs;
using Serimetry.Engine;
using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;

namespace Serimetry.Cli;

/// <summary>Dispatches verbs and maps errors to one clear line on stderr and an exit code.</summary>
internal static class CliHost
{
    public const int ExitOk = 0;
    public const int ExitFailure = 1;
    public const int ExitUsage = 2;
    public const int ExitInput = 3;

    public static int Run(string[] args, TextWriter stdout, TextWriter stderr)
    {
        var verbs = VerbCatalog.All;
        if (args.Length == 0 || args[0] is "--help" or "-h" or "help")
        {
            PrintOverview(stdout, verbs);
            return args.Length == 0 ? ExitUsage : ExitOk;
        }
        if (args[0] is "--version" or "version")
        {
            stdout.WriteLine($"serimetry {SoftwareInfo.Version}");
            return ExitOk;
        }
        var verb = verbs.FirstOrDefault(v => v.Spec.Name == args[0]);
        if (verb is null)
        {
            stderr.WriteLine($"serimetry: unknown verb '{args[0]}'; run 'serimetry --help' for the list");
            return ExitUsage;
        }
        try
        {
            var rest = args[1..];
            if (rest.Contains("--help") || rest.Contains("-h"))
            {
                verb.Spec.PrintHelp(stdout);
                return ExitOk;
            }
            var parsed = ParsedArgs.Parse(verb.Spec, rest);
            return verb.Run(parsed, new CliContext(stdout, stderr));
        }
        catch (UsageException e)
        {
            stderr.WriteLine($"serimetry {verb.Spec.Name}: {e.Message}; run 'serimetry {verb.Spec.Name} --help'");
            return ExitUsage;
        }
        catch (InputException e)
        {
            stderr.WriteLine($"serimetry {verb.Spec.Name}: error: {e.Describe()}");
            return ExitInput;
        }
        catch (RegistrationException e)
        {
            stderr.WriteLine($"serimetry {verb.Spec.Name}: registration failed: {e.Message}" + (e.Fix is null ? "" : $" ({e.Fix})"));
            return ExitFailure;
        }
        catch (IOException e)
        {
            stderr.WriteLine($"serimetry {verb.Spec.Name}: error: {e.Message}");
            return ExitInput;
        }
        catch (UnauthorizedAccessException e)
        {
            stderr.WriteLine($"serimetry {verb.Spec.Name}: error: {e.Message}");
            return ExitInput;
        }
    }

    private static void PrintOverview(TextWriter w, IReadOnlyList<IVerb> verbs)
    {
        w.WriteLine($"serimetry {SoftwareInfo.Version} - objective change between serial prostate MRI exams");
        w.WriteLine();
        w.WriteLine("usage: serimetry VERB [options]   (serimetry VERB --help for details)");
        w.WriteLine();
        foreach (var v in verbs) w.WriteLine($"  {v.Spec.Name,-12} {v.Spec.Summary}");
        w.WriteLine();
        w.WriteLine(SoftwareInfo.Caution);
    }
}

/// <summary>Where a verb writes.</summary>
internal sealed record CliContext(TextWriter Out, TextWriter Err);
