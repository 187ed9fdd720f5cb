using Serimetry.Cli;

namespace Serimetry.Tests.Cli;

/// <summary>Runs the <c>serimetry</c> program in-process and captures its exit code, standard output and error.</summary>
internal static class CliRun
{
    public static (int Code, string Out, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int code = CliHost.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }
}
