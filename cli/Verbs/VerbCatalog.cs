namespace Serimetry.Cli.Verbs;

/// <summary>The verbs, in the order the overview lists them.</summary>
internal static class VerbCatalog
{
    public static IReadOnlyList<IVerb> All { get; } =
    [
        new InspectVerb(),
        new RegisterVerb(),
        new CompareVerb(),
        new DemoVerb(),
        new PhantomVerb(),
        new QaVerb(),
        new QaAdcVerb(),
        new RadiomicsVerb(),
        new FetchVerb(),
        new PushVerb(),
        new ServeVerb(),
        new KeysVerb(),
    ];
}
