using System.Globalization;
using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Masks;

/// <summary>The one rule for choosing a segment / ROI: by number, else by label (case-insensitive), else the only one.</summary>
internal static class MaskItems
{
    public static MaskItem Choose(IReadOnlyList<MaskItem> items, string? selector, string kind, string where)
    {
        if (items.Count == 0)
            throw new InputFormatException($"the file holds no {kind}", where, $"give a file with at least one {kind}");
        string list = string.Join(", ", items);
        if (selector is null)
        {
            if (items.Count == 1) return items[0];
            throw new InvalidParameterException($"the file holds {items.Count} {kind}s: {list}", where,
                $"choose one with PATH#NUMBER or PATH#LABEL");
        }
        var byNumber = int.TryParse(selector, NumberStyles.None, CultureInfo.InvariantCulture, out int n)
            ? items.Where(i => i.Number == n).ToList() : [];
        if (byNumber.Count == 1) return byNumber[0];
        var byLabel = items.Where(i => string.Equals(i.Label.Trim(), selector.Trim(), StringComparison.OrdinalIgnoreCase)).ToList();
        if (byLabel.Count == 1) return byLabel[0];
        if (byLabel.Count > 1)
            throw new InvalidParameterException($"{byLabel.Count} {kind}s are labelled '{selector}': {list}", where, "choose by number");
        throw new InvalidParameterException($"no {kind} '{selector}'; the file holds {list}", where, "choose one of those by number or label");
    }
}
