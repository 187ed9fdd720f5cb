namespace Serimetry.Engine.Io.Series;

/// <summary>Reads the pixels of one slice on demand (after indexing, which read headers only).</summary>
public interface ISlicePixelSource
{
    /// <summary>
    /// The frame's values with Rescale Slope/Intercept applied (PS3.3 C.11.1.1.2), row by row
    /// (Columns values per row, Rows rows), as floats.
    /// </summary>
    float[] ReadRescaled(SliceSource source);
}
