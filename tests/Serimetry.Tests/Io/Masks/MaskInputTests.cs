using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Reports.Dicom;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Tests.Io.Masks;

/// <summary>
/// Mask input rules of docs/masks.md on small hand-made objects: contour tracing and even-odd filling, RTSTRUCT
/// holes, self-intersection, ROI choice and bad input, FRACTIONAL SEG thresholds (PS3.3 C.8.20.2.3, C.8.8.6).
/// </summary>
public sealed class MaskInputTests : IDisposable
{
    private readonly ScratchFolder _tmp = new("serimetry-maskin-");
    private static readonly Geometry Grid = new(new Size3(20, 16, 4), new Vec3(0.8, 0.9, 3), new Vec3(-10, 5, 20),
        Mat3.FromColumns(new Vec3(1, 0, 0), new Vec3(0, Math.Cos(0.2), Math.Sin(0.2)), new Vec3(0, -Math.Sin(0.2), Math.Cos(0.2))));

    public void Dispose() => _tmp.Dispose();

    [Theory]
    [InlineData(1, 0.5)]
    [InlineData(2, 0.15)]
    [InlineData(3, 0.85)]
    public void Traced_outlines_filled_at_voxel_centres_give_the_slice_back(int seed, double density)
    {
        // Src: the even-odd rule (a point is inside when a ray from it crosses the outline an odd number of times);
        // random slices include single voxels, diagonal pairs (ambiguous cells), holes and border-touching regions.
        var rng = new Random(seed);
        const int w = 23, h = 17;
        var slice = new byte[w * h];
        for (int i = 0; i < slice.Length; i++) slice[i] = rng.NextDouble() < density ? (byte)1 : (byte)0;
        var loops = SliceContours.Trace(slice, w, h);
        var back = new byte[w * h];
        ContourRasterizer.FillEvenOdd(loops, w, h, back);
        Assert.Equal(slice, back);
        Assert.All(loops, l => Assert.False(ContourRasterizer.SelfIntersects(l)));
    }

    [Fact]
    public void Nested_contours_make_a_hole_and_the_roi_is_chosen_by_name()
    {
        string path = _tmp.PathOf("holes.dcm");
        var outer = MaskObjects.OnSlice(Grid, 1, 1.5, 1.5, 12.5, 1.5, 12.5, 12.5, 1.5, 12.5);
        var inner = MaskObjects.OnSlice(Grid, 1, 4.5, 4.5, 8.5, 4.5, 8.5, 8.5, 4.5, 8.5);
        var other = MaskObjects.OnSlice(Grid, 2, 0.5, 0.5, 3.5, 0.5, 3.5, 3.5);
        MaskObjects.WriteRtStruct(path, "1.2.3", ("Prostate", [outer, inner], "CLOSED_PLANAR"), ("Lesion", [other], "CLOSED_PLANAR"));
        var ambiguous = Assert.Throws<InvalidParameterException>(() => MaskFiles.Read(new MaskSource(path), Grid));
        Assert.Contains("1 'Prostate', 2 'Lesion'", ambiguous.Message, StringComparison.Ordinal);
        var m = MaskFiles.Read(new MaskSource(path, "prostate"), Grid).Mask;
        // Src: even-odd rule — centres between the squares are in, centres inside the inner square are out.
        Assert.Equal(11 * 11 - 4 * 4, m.Voxels.Count(v => v != 0));
        Assert.Equal(1, m[2, 2, 1]);
        Assert.Equal(0, m[6, 6, 1]);
        Assert.Equal(0, m[2, 2, 2]);
        Assert.Equal(MaskFiles.Read(new MaskSource(path, "2"), Grid).Mask.Voxels, MaskFiles.Read(new MaskSource(path, "Lesion"), Grid).Mask.Voxels);
    }

    [Fact]
    public void A_self_intersecting_contour_is_filled_by_even_odd_and_flagged()
    {
        string path = _tmp.PathOf("bowtie.dcm");
        // A bow tie: (0,0) → (10,10) → (10,0) → (0,10); the two triangles meet at (5,5).
        var bowtie = MaskObjects.OnSlice(Grid, 0, 0.2, 0.2, 10.2, 10.2, 10.2, 0.2, 0.2, 10.2);
        MaskObjects.WriteRtStruct(path, "1.2.3", ("Bow", [bowtie], "CLOSED_PLANAR"));
        var read = MaskFiles.Read(new MaskSource(path), Grid);
        Assert.Contains(read.Notes, n => n.Contains("intersect themselves", StringComparison.Ordinal));
        // Src: geometry of the two triangles (left: x < y < 10.4 - x … ; centre (1,5) is in the left lobe, (5,2) in neither).
        Assert.Equal(1, read.Mask[1, 5, 0]);
        Assert.Equal(1, read.Mask[9, 5, 0]);
        Assert.Equal(0, read.Mask[5, 2, 0]);
        Assert.Equal(0, read.Mask[5, 8, 0]);
    }

    [Fact]
    public void Contours_off_the_image_or_oblique_to_its_slices_are_refused_clearly()
    {
        string off = _tmp.PathOf("off.dcm");
        MaskObjects.WriteRtStruct(off, "1.2.3", ("Far", [MaskObjects.OnSlice(Grid, 9, 1, 1, 5, 1, 5, 5)], "CLOSED_PLANAR"));
        var e = Assert.Throws<InputFormatException>(() => MaskFiles.Read(new MaskSource(off), Grid));
        Assert.Contains("off the image", e.Message, StringComparison.Ordinal);

        string beside = _tmp.PathOf("beside.dcm");
        MaskObjects.WriteRtStruct(beside, "1.2.3", ("Beside", [MaskObjects.OnSlice(Grid, 1, 40, 40, 45, 40, 45, 45)], "CLOSED_PLANAR"));
        Assert.Throws<InputFormatException>(() => MaskFiles.Read(new MaskSource(beside), Grid));

        string tilted = _tmp.PathOf("tilted.dcm");
        var c = MaskObjects.OnSlice(Grid, 1, 1, 1, 8, 1, 8, 8);
        c[^1] += 2.5; // the last point 2.5 mm off the plane
        MaskObjects.WriteRtStruct(tilted, "1.2.3", ("Tilted", [c], "CLOSED_PLANAR"));
        Assert.Throws<UnsupportedInputException>(() => MaskFiles.Read(new MaskSource(tilted), Grid));

        string points = _tmp.PathOf("points.dcm");
        MaskObjects.WriteRtStruct(points, "1.2.3", ("Marks", [MaskObjects.OnSlice(Grid, 1, 1, 1)], "POINT"));
        Assert.Throws<InputFormatException>(() => MaskFiles.Read(new MaskSource(points), Grid));
    }

    [Fact]
    public void A_mask_in_another_frame_of_reference_is_refused()
    {
        string path = _tmp.PathOf("for.dcm");
        MaskObjects.WriteRtStruct(path, "1.2.3.4", ("Prostate", [MaskObjects.OnSlice(Grid, 1, 1, 1, 8, 1, 8, 8)], "CLOSED_PLANAR"));
        // Src: PS3.3 C.7.4.1.1.1 — coordinates of different Frames of Reference are not related.
        Assert.Throws<GeometryMismatchException>(() => MaskFiles.Read(new MaskSource(path), Grid, new MaskReference("1.2.3.5")));
        Assert.NotNull(MaskFiles.Read(new MaskSource(path), Grid, new MaskReference("1.2.3.4")).Mask);
    }

    [Theory]
    [InlineData(255, 128, 1)]
    [InlineData(255, 127, 0)]
    [InlineData(200, 100, 1)]
    [InlineData(200, 99, 0)]
    public void Fractional_seg_voxels_are_inside_from_one_half(int max, int stored, int expected)
    {
        // Src: PS3.3 C.8.20.2.3 (fraction = stored value / Maximum Fractional Value); threshold 0.5 per docs/masks.md.
        var f = new Volume<float>(Grid);
        f[3, 4, 2] = stored / (float)max;
        f[5, 5, 1] = 1;
        string path = _tmp.PathOf($"frac-{max}-{stored}.dcm");
        MaskObjects.WriteFractionalSeg(path, f, max);
        var m = MaskFiles.Read(new MaskSource(path), Grid).Mask;
        Assert.Equal(expected, m[3, 4, 2]);
        Assert.Equal(1, m[5, 5, 1]);
        Assert.Equal(1 + expected, m.Voxels.Count(v => v != 0));
    }

    [Fact]
    public void An_image_or_a_missing_file_is_not_taken_for_a_mask()
    {
        var common = new DicomWriteDataset().Add(Engine.Io.Dicom.DicomTags.PatientID, Engine.Io.Dicom.DicomVR.LO, "P1");
        MrSeriesWriter.Write(_tmp.Dir, "mr", new Volume<float>(Grid), common, "not-a-mask");
        var e = Assert.Throws<UnsupportedInputException>(() => MaskFiles.Read(new MaskSource(_tmp.PathOf("mr-0001.dcm")), Grid));
        Assert.Contains("is not a mask object", e.Message, StringComparison.Ordinal);
        Assert.Throws<InputFormatException>(() => MaskFiles.Read(new MaskSource(_tmp.PathOf("nothing.dcm")), Grid));
    }

    [Fact]
    public void Mask_arguments_split_at_the_last_hash_unless_the_whole_text_is_a_file()
    {
        Assert.Equal(new MaskSource("a/seg.dcm", "Lesion"), MaskSource.Parse("a/seg.dcm#Lesion"));
        Assert.Equal(new MaskSource("a/seg.dcm"), MaskSource.Parse("a/seg.dcm"));
        string odd = _tmp.PathOf("odd#name.nii");
        File.WriteAllBytes(odd, [0]);
        Assert.Equal(new MaskSource(odd), MaskSource.Parse(odd));
    }

    [Fact]
    public void Of_several_contour_planes_on_one_slice_only_the_nearest_is_used()
    {
        string path = _tmp.PathOf("planes.dcm");
        var near = MaskObjects.OnSlice(Grid, 1.1, 1.5, 1.5, 4.5, 1.5, 4.5, 4.5, 1.5, 4.5);
        var far = MaskObjects.OnSlice(Grid, 0.7, 10.5, 10.5, 13.5, 10.5, 13.5, 13.5, 10.5, 13.5);
        MaskObjects.WriteRtStruct(path, "1.2.3", ("Thin", [far, near], "CLOSED_PLANAR"));
        var read = MaskFiles.Read(new MaskSource(path), Grid);
        // Src: docs/masks.md plane rule — slice 1's centre plane is 0.1 slice from the first contour, 0.3 from the second.
        Assert.Equal(9, read.Mask.Voxels.Count(v => v != 0));
        Assert.Equal(1, read.Mask[2, 2, 1]);
        Assert.Contains(read.Notes, n => n.Contains("farther from a slice centre", StringComparison.Ordinal));
    }

    [Fact]
    public void Seg_frames_without_plane_position_are_placed_through_their_source_images()
    {
        var m = new Volume<byte>(Grid);
        m[3, 4, 1] = m[4, 4, 1] = m[7, 2, 3] = 1;
        var uids = Enumerable.Range(0, Grid.Size.Z).Select(k => $"1.2.3.{k + 1}").ToList();
        var source = new SegSourceReference("1.2.3.100", MrSeriesWriter.MrImageStorage, uids, "1.2.3.200");
        var ds = SegmentationWriter.Build(Grid, [new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "t", m)],
            new DicomStudyInfo(null, null, null, null), source);
        foreach (var frame in ds.Elements.First(e => e.Tag == Engine.Io.Dicom.DicomTags.PerFrameFunctionalGroupsSequence).Items!)
            frame.Remove(Engine.Io.Dicom.DicomTags.PlanePositionSequence);
        string path = _tmp.PathOf("no-position.dcm");
        DicomPart10Writer.Write(path, ds);
        // Src: PS3.3 C.7.6.16.2.6 — Derivation Image → Source Image names the slice each frame was derived from.
        Assert.Equal(m.Voxels, MaskFiles.Read(new MaskSource(path), Grid, new MaskReference("1.2.3.200", null, uids)).Mask.Voxels);
        var e = Assert.Throws<InputFormatException>(() => MaskFiles.Read(new MaskSource(path), Grid));
        Assert.Contains("Plane Position", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Rtstruct_writer_contours_read_back_voxel_for_voxel()
    {
        var mask = new Volume<byte>(Grid);
        var rng = new Random(7);
        for (int k = 1; k < 3; k++)
            for (int j = 3; j < 13; j++)
                for (int i = 2; i < 17; i++)
                    mask[i, j, k] = (byte)((i - 9) * (i - 9) + (j - 8) * (j - 8) < 30 && rng.NextDouble() < 0.9 ? 1 : 0);
        string path = _tmp.PathOf("rt.dcm");
        RtStructWriter.Write(path, Grid, [new RoiDefinition("Prostate", mask)], new DicomStudyInfo("P", null, null, new DateOnly(2024, 1, 2)), null);
        var back = MaskFiles.Read(new MaskSource(path), Grid);
        Assert.Equal(mask.Voxels, back.Mask.Voxels); // Src: even-odd rule at voxel centres (docs/masks.md)
        Assert.Empty(back.Notes);
    }
}
