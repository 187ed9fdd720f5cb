using Serimetry.Engine.Core;

namespace Serimetry.Engine.Io.Series;

/// <summary>
/// Builds a <see cref="Volume{T}"/> of rescaled values from a regular <see cref="SliceStack"/>, reading each
/// slice's pixels on demand. Slice k of the volume is the k-th slice along the normal; pixel (row j,
/// column i) of a frame becomes voxel (i, j, k), so the geometry of the stack places it in LPS space.
/// </summary>
public static class StackVolumeBuilder
{
    /// <summary>Reads the stack into a float volume. Irregular stacks (gaps, duplicates, uneven spacing) are refused.</summary>
    public static Volume<float> Build(SliceStack stack, ISlicePixelSource? pixels = null, int maxDegreeOfParallelism = -1)
    {
        ArgumentNullException.ThrowIfNull(stack);
        pixels ??= new DicomSlicePixelSource();
        var where = stack.Slices.Count > 0 ? stack.Slices[0].SeriesInstanceUid ?? stack.Label : stack.Label;
        if (stack.Geometry is not { } g)
            throw new GeometryMismatchException(stack.BlockingProblem ?? "the stack has no geometry", $"series {where}",
                "the slices need Image Position/Orientation (Patient) and Pixel Spacing");
        if (stack.BlockingProblem is { } problem)
            throw new GeometryMismatchException(problem, $"series {where} [{stack.Label}]",
                "a regular voxel grid needs evenly spaced slices: re-export the complete series, or pick another stack");
        if (g.Size.Z != stack.Slices.Count)
            throw new GeometryMismatchException($"{stack.Slices.Count} slices for {g.Size.Z} positions", $"series {where}");
        var volume = new Volume<float>(g);
        int plane = g.Size.X * g.Size.Y;
        try
        {
            ParallelRange.For(stack.Slices.Count, 1, (_, start, end) =>
            {
                for (int k = start; k < end; k++) CopySlice(stack.Slices[k], pixels, volume.Voxels.AsSpan(k * plane, plane));
            }, maxDegreeOfParallelism);
        }
        catch (AggregateException ae) when (ae.Flatten().InnerExceptions.OfType<InputException>().FirstOrDefault() is { } first)
        {
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Capture(first).Throw();
        }
        return volume;
    }

    /// <summary>Builds the main stack of a series (for DWI: the stack of <paramref name="bValue"/>, default the lowest b).</summary>
    public static Volume<float> Build(AssembledSeries series, double? bValue = null, ISlicePixelSource? pixels = null)
    {
        ArgumentNullException.ThrowIfNull(series);
        var stack = series.StackFor(bValue) ?? throw new InvalidParameterException(
            $"series has no stack with b-value {bValue}; it has {string.Join(", ", series.Summary.BValues)}",
            $"series {series.SeriesInstanceUid}", "choose one of the listed b-values");
        return Build(stack, pixels);
    }

    private static void CopySlice(SliceHeader slice, ISlicePixelSource pixels, Span<float> destination)
    {
        var values = pixels.ReadRescaled(slice.Source);
        if (values.Length != destination.Length)
            throw new InputFormatException(
                $"slice holds {values.Length} pixels; the stack's grid needs {destination.Length} ({slice.Columns}x{slice.Rows})",
                slice.Source.Describe(), "the file's Rows/Columns disagree with its pixel data; re-export the series");
        values.AsSpan().CopyTo(destination);
    }
}
