using Serimetry.Conformance.Dicom;
using Serimetry.Conformance.DicomOut;
using Serimetry.Engine.Compare;
using Serimetry.Engine.Core;
using Serimetry.Engine.Imaging;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Reports.Dicom;
using Serimetry.Tests.Shared;
using Xunit;
using Xunit.Abstractions;

namespace Serimetry.Conformance.Masks;

/// <summary>
/// DICOM masks in (docs/masks.md) against outside truth: the phantom generator's truth masks (what the outlines
/// were made from), dicom3tools (dciodvfy) and dcmtk (dcmdump) on the RTSTRUCT we write, and the NIfTI path
/// of the hosts as the reference for the SEG and RTSTRUCT paths.
/// </summary>
public sealed class MaskInputConformanceTests(MaskPhantomFixture fx, ITestOutputHelper output) : IClassFixture<MaskPhantomFixture>
{
    private Geometry T2 => fx.V.T2w.Geometry;

    private MaskReference Reference => new(fx.Source.FrameOfReferenceUid, [fx.Source.SeriesInstanceUid], fx.Source.SopInstanceUids);

    private static double Dice(Volume<byte> a, Volume<byte> b) => MaskAgreement.Compare(a, b).Dice ?? 0;

    private string WriteRtStruct(string name, Geometry grid, Volume<byte> gland, Volume<byte> lesion, SegSourceReference? source)
    {
        string path = Path.Combine(fx.Dir, name);
        RtStructWriter.Write(path, grid, [new RoiDefinition("Prostate", gland), new RoiDefinition("Lesion", lesion, "GTV")],
            new DicomStudyInfo(fx.Subject.SubjectId, null, fx.StudyInstanceUid, fx.V.Date), source, uidSeed: "mask-conformance/" + name);
        return path;
    }

    [Fact]
    public void Own_seg_reads_back_voxel_for_voxel_through_the_mask_input()
    {
        string seg = Path.Combine(fx.Masks, "seg.dcm");
        var gland = MaskFiles.Read(new MaskSource(seg, "Prostate"), T2, Reference);
        var lesion = MaskFiles.Read(new MaskSource(seg, "2"), T2, Reference);
        Assert.Equal(fx.V.GlandMask.Voxels, gland.Mask.Voxels); // Src: the phantom generator's truth masks
        Assert.Equal(fx.V.LesionMask.Voxels, lesion.Mask.Voxels);
        var e = Assert.Throws<InvalidParameterException>(() => MaskFiles.Read(new MaskSource(seg), T2));
        Assert.Contains("1 'Prostate', 2 'Lesion'", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Rtstruct_passes_dciodvfy_and_dcmdump_and_rasterises_to_the_truth()
    {
        string path = WriteRtStruct("rt.dcm", T2, fx.V.GlandMask, fx.V.LesionMask, fx.Source);
        // Src: dicom3tools dciodvfy, the RT Structure Set IOD of PS3.3 A.19.
        var (errors, warnings) = Dciodvfy.Check(path);
        foreach (var w in warnings) output.WriteLine($"dciodvfy rtstruct: {w}");
        Assert.True(errors.Count == 0, string.Join('\n', errors));
        // Src: dcmtk dcmdump parses the file and names the SOP class and contour data.
        var dump = ReferenceTool.Capture("dcmdump", path);
        Assert.Contains("RTStructureSetStorage", dump, StringComparison.Ordinal);
        Assert.Contains("(3006,0050)", dump, StringComparison.Ordinal);
        var gland = MaskFiles.Read(new MaskSource(path, "Prostate"), T2, Reference);
        var lesion = MaskFiles.Read(new MaskSource(path, "Lesion"), T2, Reference);
        output.WriteLine($"RTSTRUCT Dice gland {Dice(gland.Mask, fx.V.GlandMask):F4}, lesion {Dice(lesion.Mask, fx.V.LesionMask):F4}");
        // Src: the phantom truth masks the contours were traced from; Dice ≥ 0.95 is the acceptance bound.
        Assert.True(Dice(gland.Mask, fx.V.GlandMask) >= 0.95);
        Assert.True(Dice(lesion.Mask, fx.V.LesionMask) >= 0.95);
        Assert.Equal(fx.V.GlandMask.Voxels, gland.Mask.Voxels); // on the same grid the rules give the mask back exactly
    }

    [Fact]
    public void Fractional_seg_on_a_coarser_grid_rasterises_to_the_truth()
    {
        // 2x2 blocks of the T2w grid: coarse voxel centre = mean of its four fine centres; fraction = share of them inside.
        var coarse = T2.With(size: new Size3(T2.Size.X / 2, T2.Size.Y / 2, T2.Size.Z),
            spacingMm: new Vec3(2 * T2.SpacingMm.X, 2 * T2.SpacingMm.Y, T2.SpacingMm.Z), originMm: T2.IndexToPhysical(new Vec3(0.5, 0.5, 0)));
        var f = new Volume<float>(coarse);
        var truth = fx.V.GlandMask;
        for (int k = 0; k < coarse.Size.Z; k++)
            for (int j = 0; j < coarse.Size.Y; j++)
                for (int i = 0; i < coarse.Size.X; i++)
                    f[i, j, k] = (truth[2 * i, 2 * j, k] + truth[2 * i + 1, 2 * j, k] + truth[2 * i, 2 * j + 1, k] + truth[2 * i + 1, 2 * j + 1, k]) / 4f;
        string path = Path.Combine(fx.Dir, "fractional.dcm");
        MaskObjects.WriteFractionalSeg(path, f, 255);
        var read = MaskFiles.Read(new MaskSource(path), T2);
        double dice = Dice(read.Mask, truth);
        output.WriteLine($"FRACTIONAL SEG on a 2x coarser grid: Dice {dice:F4}; {string.Join("; ", read.Notes)}");
        Assert.True(dice >= 0.95, $"Dice {dice}"); // Src: the phantom truth gland
        Assert.Contains(read.Notes, n => n.Contains("partial volume", StringComparison.Ordinal));
    }

    [Fact]
    public void Binary_seg_on_a_rotated_finer_grid_rasterises_to_the_truth()
    {
        var other = Rotated(T2, 8, new Vec3(0.6, 0.6, 1.5));
        var onOther = Resampler.ResampleMask(fx.V.GlandMask, other, null, MaskInterpolation.Nearest);
        string path = Path.Combine(fx.Dir, "rotated-seg.dcm");
        SegmentationWriter.Write(path, other,
            [new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "test", onOther)],
            new DicomStudyInfo(null, null, null, null), null);
        var read = MaskFiles.Read(new MaskSource(path), T2);
        double dice = Dice(read.Mask, fx.V.GlandMask);
        output.WriteLine($"BINARY SEG on a rotated 0.6x0.6x1.5 mm grid: Dice {dice:F4}");
        Assert.True(dice >= 0.95, $"Dice {dice}"); // Src: the phantom truth gland
    }

    [Fact]
    public void Rtstruct_traced_on_a_finer_grid_rasterises_to_the_truth()
    {
        var fine = T2.With(size: new Size3(T2.Size.X * 2, T2.Size.Y * 2, T2.Size.Z),
            spacingMm: new Vec3(T2.SpacingMm.X / 2, T2.SpacingMm.Y / 2, T2.SpacingMm.Z), originMm: T2.IndexToPhysical(new Vec3(-0.25, -0.25, 0)));
        var gland = Resampler.ResampleMask(fx.V.GlandMask, fine, null, MaskInterpolation.Nearest);
        var lesion = Resampler.ResampleMask(fx.V.LesionMask, fine, null, MaskInterpolation.Nearest);
        string path = WriteRtStruct("rt-fine.dcm", fine, gland, lesion, null);
        double g = Dice(MaskFiles.Read(new MaskSource(path, "Prostate"), T2).Mask, fx.V.GlandMask);
        double l = Dice(MaskFiles.Read(new MaskSource(path, "Lesion"), T2).Mask, fx.V.LesionMask);
        output.WriteLine($"RTSTRUCT traced on a 2x finer grid: Dice gland {g:F4}, lesion {l:F4}");
        Assert.True(g >= 0.95 && l >= 0.95, $"Dice {g} / {l}"); // Src: the phantom truth masks
    }

    [Fact]
    public void A_seg_referencing_another_exam_is_refused()
    {
        string seg = Path.Combine(fx.Masks, "seg.dcm");
        // Src: PS3.3 C.7.4.1.1.1 — positions in different Frames of Reference are unrelated.
        Assert.Throws<GeometryMismatchException>(() =>
            MaskFiles.Read(new MaskSource(seg, "Prostate"), T2, new MaskReference("2.25.1", ["2.25.2"])));
        var e = Assert.Throws<InputFormatException>(() =>
            MaskFiles.Read(new MaskSource(seg, "Prostate"), T2, new MaskReference(null, ["2.25.2"])));
        Assert.Contains("does not hold", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_baseline_masks_from_seg_and_rtstruct_equal_the_nifti_ones()
    {
        string rt = WriteRtStruct("rt-compare.dcm", T2, fx.V.GlandMask, fx.V.LesionMask, fx.Source);
        var masks = new BaselineMasks(fx.Visit, T2);
        var nifti = NiftiFile.ReadMask(Path.Combine(fx.Masks, "gland.nii.gz"));
        // Src: the NIfTI truth mask the phantom writer stored beside the SEG; both DICOM paths pass the exam's reference check.
        Assert.Equal(nifti.Voxels, masks.Read(Path.Combine(fx.Masks, "seg.dcm") + "#Prostate").Voxels);
        Assert.Equal(nifti.Voxels, masks.Read(rt + "#Prostate").Voxels);
    }

    /// <summary>A grid covering <paramref name="g"/>'s field of view, turned by <paramref name="degrees"/> about its slice normal.</summary>
    private static Geometry Rotated(Geometry g, double degrees, Vec3 spacing)
    {
        double a = degrees * Math.PI / 180;
        var turn = new Mat3(Math.Cos(a), -Math.Sin(a), 0, Math.Sin(a), Math.Cos(a), 0, 0, 0, 1);
        var dir = g.Direction * turn;
        var extent = new Vec3(g.Size.X * g.SpacingMm.X, g.Size.Y * g.SpacingMm.Y, g.Size.Z * g.SpacingMm.Z);
        var size = new Size3((int)(extent.X / spacing.X), (int)(extent.Y / spacing.Y), (int)(extent.Z / spacing.Z));
        var half = new Vec3((size.X - 1) * spacing.X / 2, (size.Y - 1) * spacing.Y / 2, (size.Z - 1) * spacing.Z / 2);
        return new Geometry(size, spacing, g.CenterMm - dir * half, dir);
    }
}
