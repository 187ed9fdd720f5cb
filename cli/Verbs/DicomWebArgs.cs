using Serimetry.Engine.Core;
using Serimetry.Engine.Io.DicomWeb;

namespace Serimetry.Cli.Verbs;

/// <summary>The options every DICOMweb verb shares (--server, --auth, --timeout) and the client they make.</summary>
internal static class DicomWebArgs
{
    public static OptionSpec Server(bool required) =>
        new("server", "URL", "DICOMweb root of the server, e.g. http://pacs:8042/dicom-web", Required: required);

    public static readonly OptionSpec Auth =
        new("auth", "HEADER", "Authorization header value, e.g. 'Bearer TOKEN' or 'Basic BASE64'; '@FILE' reads it from FILE (keeps it out of the process list)");

    public static readonly OptionSpec Timeout =
        new("timeout", "SECONDS", "longest wait for the server to answer or to send more data (default 120)");

    public static DicomWebClient Client(ParsedArgs args)
    {
        var auth = args.Get("auth");
        if (auth is ['@', .. var file])
        {
            if (!File.Exists(file)) throw new InvalidParameterException("the file with the Authorization value does not exist", file, "check --auth @FILE");
            auth = File.ReadAllText(file).Trim();
        }
        var seconds = args.GetDouble("timeout", DicomWebOptions.DefaultTimeout.TotalSeconds, 1, 86400);
        return new DicomWebClient(DicomWebOptions.Create(args.Required("server"), auth, TimeSpan.FromSeconds(seconds)));
    }

    /// <summary>Progress lines written at once, in order (System.Progress would post them to the thread pool).</summary>
    public static IProgress<string> Lines(TextWriter w, string prefix) => new LineProgress(s => w.WriteLine(prefix + s));

    private sealed class LineProgress(Action<string> report) : IProgress<string>
    {
        public void Report(string value) => report(value);
    }

    /// <summary>Runs an engine call to completion from a synchronous verb.</summary>
    public static T Wait<T>(Task<T> task) => task.GetAwaiter().GetResult();
}
