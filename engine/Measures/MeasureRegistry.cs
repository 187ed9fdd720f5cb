using System.Reflection;
using System.Text.RegularExpressions;
using Serimetry.Engine.Core;
using Serimetry.Engine.Measures.BuiltIn;

namespace Serimetry.Engine.Measures;

/// <summary>
/// The set of measures a comparison runs: the built-ins plus any loaded from plugin assemblies.
/// Ids are unique; a plugin cannot replace a built-in. Not thread-safe while registering; read-only use
/// afterwards is.
/// </summary>
public sealed partial class MeasureRegistry
{
    private readonly List<IMeasure> _measures = [];

    /// <summary>All registered measures in registration order.</summary>
    public IReadOnlyList<IMeasure> All => _measures;

    /// <summary>A registry holding the built-in measures (docs/measures.md lists them).</summary>
    public static MeasureRegistry CreateDefault()
    {
        var r = new MeasureRegistry();
        foreach (var m in BuiltIns()) r.Register(m);
        return r;
    }

    /// <summary>New instances of every built-in measure.</summary>
    public static IEnumerable<IMeasure> BuiltIns()
    {
        yield return new MaskVolumeMeasure(MaskKind.Lesion);
        yield return new MaskVolumeMeasure(MaskKind.Gland);
        yield return new EllipsoidVolumeMeasure(MaskKind.Lesion);
        yield return new EllipsoidVolumeMeasure(MaskKind.Gland);
        yield return new LesionDiameterMeasure();
        foreach (var axis in Enum.GetValues<PatientAxis>()) yield return new ExtentMeasure(MaskKind.Lesion, axis);
        foreach (var s in Enum.GetValues<AdcStatistic>()) yield return new LesionAdcMeasure(s);
        yield return new ConspicuityMeasure(ConspicuityImage.T2w, false);
        yield return new ConspicuityMeasure(ConspicuityImage.T2w, true);
        yield return new ConspicuityMeasure(ConspicuityImage.Adc, false);
        yield return new ConspicuityMeasure(ConspicuityImage.Adc, true);
        yield return new PsaDensityMeasure();
    }

    /// <summary>The measure with this id, or null.</summary>
    public IMeasure? Find(string id) => _measures.FirstOrDefault(m => m.Id == id);

    /// <summary>Adds a measure; refuses malformed or duplicate ids.</summary>
    public void Register(IMeasure measure)
    {
        ArgumentNullException.ThrowIfNull(measure);
        if (string.IsNullOrEmpty(measure.Id) || !IdPattern().IsMatch(measure.Id))
            throw new InvalidParameterException($"measure id '{measure.Id}' is not a dotted lower-case id",
                measure.GetType().FullName, "use ids like 'lesion.adc.median' (letters, digits, '.', '_' and '-')");
        if (Find(measure.Id) is { } existing)
            throw new InvalidParameterException($"measure id '{measure.Id}' is already registered by {existing.GetType().FullName}",
                measure.GetType().FullName, "give the plugin measure an id of its own");
        _measures.Add(measure);
    }

    /// <summary>
    /// Loads every public, non-abstract <see cref="IMeasure"/> with a parameterless constructor from the
    /// <c>*.dll</c> files directly in <paramref name="folder"/> and registers it. Returns the ids added.
    /// </summary>
    public IReadOnlyList<string> LoadPlugins(string folder)
    {
        if (!Directory.Exists(folder))
            throw new InvalidParameterException($"plugin folder '{folder}' does not exist", "--plugins", "give an existing folder of measure assemblies");
        var added = new List<string>();
        foreach (var file in Directory.GetFiles(folder, "*.dll").Order(StringComparer.Ordinal))
            foreach (var measure in LoadAssembly(file))
            {
                Register(measure);
                added.Add(measure.Id);
            }
        return added;
    }

    private static IEnumerable<IMeasure> LoadAssembly(string file)
    {
        Assembly asm;
        Type[] types;
        try
        {
            asm = Assembly.LoadFrom(Path.GetFullPath(file));
            types = asm.GetExportedTypes();
        }
        catch (Exception ex) when (ex is BadImageFormatException or FileLoadException or ReflectionTypeLoadException or FileNotFoundException)
        {
            throw new InputFormatException($"cannot load measure plugin: {ex.Message}", Path.GetFileName(file),
                "build the plugin against the same Serimetry.Engine version, or remove it from the plugin folder", ex);
        }
        foreach (var t in types.Where(t => typeof(IMeasure).IsAssignableFrom(t) && t is { IsAbstract: false, IsInterface: false }).OrderBy(t => t.FullName, StringComparer.Ordinal))
        {
            if (t.GetConstructor(Type.EmptyTypes) is null) continue;
            yield return (IMeasure)Activator.CreateInstance(t)!;
        }
    }

    [GeneratedRegex("^[a-z0-9][a-z0-9_-]*(\\.[a-z0-9_-]+)*$")]
    private static partial Regex IdPattern();
}
