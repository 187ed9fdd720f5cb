using Serimetry.Api.Hosting;
using Serimetry.Api.Security;
using Serimetry.Api.Storage;

namespace Serimetry.Cli.Verbs;

/// <summary><c>serimetry keys create</c>: makes an API key for the service; the key is the last line printed.</summary>
internal sealed class KeysVerb : IVerb
{
    public VerbSpec Spec { get; } = new("keys",
        "Create API keys for the HTTP service (stored hashed; the key is shown once)",
        "create --name NAME [--data DIR] [--store sqlite|postgres --connection CONN]",
        [
            new("name", "NAME", "who the key is for (recorded in the audit log)", Required: true),
            new("data", "DIR", "the service's data folder (default ./serimetry-data)"),
            new("store", "KIND", "metadata store of the service: sqlite (default, in the data folder) or postgres"),
            new("connection", "CONN", "PostgreSQL connection string of the postgres store"),
        ],
        MinPositionals: 1, MaxPositionals: 1);

    public int Run(ParsedArgs args, CliContext ctx)
    {
        if (args.Positionals is not ["create"])
            throw new UsageException("the only action is 'create': serimetry keys create --name NAME [--data DIR] [--store postgres --connection CONN]");
        var options = ServiceHost.ReadOptions(ServeVerb.Forward(args));
        var paths = new DataPaths(options.DataDir);
        var name = args.Required("name");
        using var store = MetadataStore.Open(options, paths);
        var key = ApiKeys.Create(store, name);
        ctx.Out.WriteLine($"created API key '{name}' in {store.Location}; it is shown only now:");
        ctx.Out.WriteLine(key);
        return CliHost.ExitOk;
    }
}
