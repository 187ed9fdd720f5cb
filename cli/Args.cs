using System.Globalization;

namespace Serimetry.Cli;

/// <summary>A command-line mistake (unknown option, missing value); reported with exit code 2.</summary>
internal sealed class UsageException(string message) : Exception(message);

/// <summary>One option of a verb.</summary>
/// <param name="Name">Long name without dashes.</param>
/// <param name="Value">Placeholder for the value (e.g. "DIR"); null for a flag.</param>
/// <param name="Help">One line of help.</param>
/// <param name="Repeatable">Whether it may be given more than once.</param>
/// <param name="Required">Whether it must be given.</param>
internal sealed record OptionSpec(string Name, string? Value, string Help, bool Repeatable = false, bool Required = false)
{
    public bool IsFlag => Value is null;
}

/// <summary>What a verb accepts: its options and positional arguments.</summary>
internal sealed record VerbSpec(string Name, string Summary, string Usage, IReadOnlyList<OptionSpec> Options,
    int MinPositionals = 0, int MaxPositionals = 0, string? Details = null)
{
    public void PrintHelp(TextWriter w)
    {
        w.WriteLine($"usage: serimetry {Name} {Usage}");
        w.WriteLine();
        w.WriteLine(Summary);
        if (Details is not null)
        {
            w.WriteLine();
            w.WriteLine(Details);
        }
        if (Options.Count > 0)
        {
            w.WriteLine();
            w.WriteLine("options:");
            foreach (var o in Options)
            {
                var head = o.IsFlag ? $"--{o.Name}" : $"--{o.Name} {o.Value}";
                var tags = (o.Required ? " (required)" : "") + (o.Repeatable ? " (repeatable)" : "");
                w.WriteLine($"  {head,-28} {o.Help}{tags}");
            }
        }
    }
}

/// <summary>Parsed arguments of one verb, checked against its <see cref="VerbSpec"/>.</summary>
internal sealed class ParsedArgs
{
    private readonly Dictionary<string, List<string>> _values = new(StringComparer.Ordinal);

    public List<string> Positionals { get; } = [];

    public static ParsedArgs Parse(VerbSpec spec, IReadOnlyList<string> args)
    {
        var result = new ParsedArgs();
        for (int i = 0; i < args.Count; i++)
        {
            var a = args[i];
            if (!a.StartsWith("--", StringComparison.Ordinal) || a == "--")
            {
                result.Positionals.Add(a);
                continue;
            }
            var name = a[2..];
            string? inline = null;
            int eq = name.IndexOf('=');
            if (eq >= 0)
            {
                inline = name[(eq + 1)..];
                name = name[..eq];
            }
            var opt = spec.Options.FirstOrDefault(o => o.Name == name)
                ?? throw new UsageException($"unknown option '--{name}'");
            if (!result._values.TryGetValue(name, out var list)) result._values[name] = list = [];
            if (list.Count > 0 && !opt.Repeatable) throw new UsageException($"option '--{name}' given more than once");
            if (opt.IsFlag)
            {
                if (inline is not null) throw new UsageException($"option '--{name}' takes no value");
                list.Add("true");
                continue;
            }
            if (inline is null)
            {
                if (i + 1 >= args.Count || (args[i + 1].StartsWith("--", StringComparison.Ordinal) && args[i + 1].Length > 2))
                    throw new UsageException($"option '--{name}' needs a value ({opt.Value})");
                inline = args[++i];
            }
            list.Add(inline);
        }
        foreach (var o in spec.Options.Where(o => o.Required))
            if (!result._values.ContainsKey(o.Name)) throw new UsageException($"option '--{o.Name} {o.Value}' is required");
        if (result.Positionals.Count < spec.MinPositionals) throw new UsageException($"expected {spec.Usage}");
        if (result.Positionals.Count > spec.MaxPositionals)
            throw new UsageException($"unexpected argument '{result.Positionals[spec.MaxPositionals]}'");
        return result;
    }

    public bool Has(string name) => _values.ContainsKey(name);

    public string? Get(string name) => _values.TryGetValue(name, out var l) ? l[^1] : null;

    public IReadOnlyList<string> GetAll(string name) => _values.TryGetValue(name, out var l) ? l : [];

    public string Required(string name) => Get(name) ?? throw new UsageException($"option '--{name}' is required");

    public int GetInt(string name, int fallback, int min = int.MinValue, int max = int.MaxValue)
    {
        var s = Get(name);
        if (s is null) return fallback;
        if (!int.TryParse(s, NumberStyles.Integer, CultureInfo.InvariantCulture, out var v) || v < min || v > max)
            throw new UsageException($"option '--{name}' needs an integer in [{min}, {max}], got '{s}'");
        return v;
    }

    public double GetDouble(string name, double fallback, double min = double.NegativeInfinity, double max = double.PositiveInfinity)
    {
        var s = Get(name);
        if (s is null) return fallback;
        if (!double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v) || v < min || v > max)
            throw new UsageException($"option '--{name}' needs a number in [{min}, {max}], got '{s}'");
        return v;
    }
}
