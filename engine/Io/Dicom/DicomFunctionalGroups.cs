namespace Serimetry.Engine.Io.Dicom;

/// <summary>
/// Finds attributes of multi-frame objects that live in functional group macros (PS3.3 C.7.6.16):
/// the top level first, then each standard macro item of the Shared Functional Groups Sequence
/// (5200,9229), then of the Per-frame Functional Groups Sequence (5200,9230) item of the frame.
/// Private macros (odd groups) are ignored: vendors repeat standard values there with other meanings.
/// </summary>
public static class DicomFunctionalGroups
{
    /// <summary>A value found, with the data set holding it and its path (e.g. "(5200,9230).(0020,9113)").</summary>
    public sealed record Found(DicomDataset Holder, DicomElement Element, string? Path);

    /// <summary>Finds <paramref name="tag"/> for frame <paramref name="frame"/> (0-based); null when absent.</summary>
    public static Found? Find(DicomDataset ds, DicomTag tag, int frame = 0)
    {
        if (ds.Find(tag) is { } top) return new Found(ds, top, null);
        var shared = ds.GetSequence(DicomTags.SharedFunctionalGroupsSequence);
        if (shared.Count > 0 && FindInMacros(shared[0], tag, DicomTags.SharedFunctionalGroupsSequence) is { } s) return s;
        var perFrame = ds.GetSequence(DicomTags.PerFrameFunctionalGroupsSequence);
        if (frame >= 0 && frame < perFrame.Count)
            return FindInMacros(perFrame[frame], tag, DicomTags.PerFrameFunctionalGroupsSequence);
        return null;
    }

    /// <summary>Rescale Slope and Intercept (0028,1053)/(0028,1052) of a frame, from the top level or the Pixel Value Transformation macro; (1, 0) when absent.</summary>
    public static (double Slope, double Intercept) Rescale(DicomDataset ds, int frame = 0)
    {
        var slope = Find(ds, DicomTags.RescaleSlope, frame) is { } s && s.Holder.TryGetDouble(DicomTags.RescaleSlope, out var sv) ? sv : 1.0;
        var intercept = Find(ds, DicomTags.RescaleIntercept, frame) is { } i && i.Holder.TryGetDouble(DicomTags.RescaleIntercept, out var iv) ? iv : 0.0;
        return (slope, intercept);
    }

    private static Found? FindInMacros(DicomDataset groupItem, DicomTag tag, DicomTag groupSeq)
    {
        foreach (var macro in groupItem.Elements)
        {
            if (macro.Items is not { Count: > 0 } items || macro.Tag.IsPrivate) continue;
            if (items[0].Find(tag) is { } e) return new Found(items[0], e, $"{groupSeq}.{macro.Tag}");
        }
        return null;
    }
}
