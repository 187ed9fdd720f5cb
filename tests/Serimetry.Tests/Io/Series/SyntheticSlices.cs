using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Series;

namespace Serimetry.Tests.Io.Series;

/// <summary>Builds slice headers of a known stack, so assembly can be checked against the truth it was built from.</summary>
internal static class SyntheticSlices
{
    private static int _next;

    /// <summary>
    /// The oblique geometry of the reference series (README "Synthetic oblique series"): row r = (1,0,0),
    /// column c = (0, cos 15°, sin 15°), origin (-32,-30,12.5), spacing (0.8, 0.9, 2.5), 80 x 64 x 10.
    /// Instance numbers run against the normal, as in that series.
    /// </summary>
    public static List<SliceHeader> Oblique(int count = 10, string series = "1.2.3.1", double stepMm = 2.5, double? bValue = null,
        Vec3? origin = null, double tiltDeg = 15)
    {
        double t = tiltDeg * Math.PI / 180;
        var r = new Vec3(1, 0, 0);
        var c = new Vec3(0, Math.Cos(t), Math.Sin(t));
        var n = r.Cross(c);
        var o = origin ?? new Vec3(-32, -30, 12.5);
        var list = new List<SliceHeader>();
        for (int k = 0; k < count; k++)
        {
            int instance = count - k;
            list.Add(new SliceHeader
            {
                Source = new SliceSource($"/data/{series}/IM{instance:D4}.dcm"),
                SopInstanceUid = $"{series}.{Interlocked.Increment(ref _next)}",
                SeriesInstanceUid = series,
                StudyInstanceUid = "1.2.3",
                PatientId = "NSC-0007",
                Modality = "MR",
                InstanceNumber = instance,
                ImagePositionPatient = o + (stepMm * k) * n,
                RowCosine = r,
                ColumnCosine = c,
                RowSpacingMm = 0.9,
                ColumnSpacingMm = 0.8,
                Rows = 64,
                Columns = 80,
                SliceThicknessMm = 2,
                SpacingBetweenSlicesMm = stepMm,
                DiffusionBValue = bValue,
                BitsAllocated = 16,
                BitsStored = 12,
            });
        }
        return list;
    }

    /// <summary>The list sorted by Instance Number (the order a naive reader would use).</summary>
    public static List<SliceHeader> ByInstance(IEnumerable<SliceHeader> s) => s.OrderBy(x => x.InstanceNumber).ToList();
}
