using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Dicom.Writing;
using Serimetry.Engine.Io.Series;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Reports.Dicom;
using Xunit;

namespace Serimetry.Tests.Io.Dicom.Writing;

/// <summary>
/// Writing then reading through the engine's own series assembly (Src: the written volume is the truth;
/// geometry per PS3.3 C.7.6.2, rescale per PS3.3 C.11.1.1.2, SEG bit packing per PS3.5 8.1.1).
/// </summary>
public sealed class MrSeriesAndSegRoundTripTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-dcmw-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    private static Geometry Oblique(int nx, int ny, int nz)
    {
        double a = 12 * Math.PI / 180;
        var dir = Mat3.FromColumns(new Vec3(1, 0, 0), new Vec3(0, Math.Cos(a), Math.Sin(a)), new Vec3(0, -Math.Sin(a), Math.Cos(a)));
        return new Geometry(new Size3(nx, ny, nz), new Vec3(0.7, 0.65, 3), new Vec3(-20.5, -30.25, 12), dir);
    }

    private static Volume<float> Ramp(Geometry g)
    {
        var v = new Volume<float>(g);
        for (int i = 0; i < v.Voxels.Length; i++) v.Voxels[i] = (float)(-3.5 + 0.37 * i + 10 * Math.Sin(i * 0.1));
        return v;
    }

    [Fact]
    public void Mr_series_reads_back_with_geometry_and_voxels_within_quantisation()
    {
        var g = Oblique(13, 11, 5); // odd sizes: rows and columns must not be swapped
        var vol = Ramp(g);
        var common = new DicomWriteDataset()
            .Add(Engine.Io.Dicom.DicomTags.StudyInstanceUID, Engine.Io.Dicom.DicomVR.UI, DicomUids.New())
            .Add(Engine.Io.Dicom.DicomTags.SeriesInstanceUID, Engine.Io.Dicom.DicomVR.UI, DicomUids.New())
            .Add(Engine.Io.Dicom.DicomTags.StudyDate, Engine.Io.Dicom.DicomVR.DA, "20240102")
            .Add(Engine.Io.Dicom.DicomTags.PatientID, Engine.Io.Dicom.DicomVR.LO, "P1");
        MrSeriesWriter.Write(_dir, "s", vol, common, "test-seed");
        var study = Assert.Single(StudyIndex.Build(_dir, DicomSliceHeaderReader.Default).Assemble());
        var series = Assert.Single(study.Series);
        var back = StackVolumeBuilder.Build(series);
        Assert.True(back.Geometry.IsCongruentWith(g, 1e-4), back.Geometry.Describe() + " vs " + g.Describe());
        var (slope, _) = MrSeriesWriter.Rescale(vol.Voxels);
        for (int i = 0; i < vol.Voxels.Length; i++)
            Assert.InRange(back.Voxels[i] - vol.Voxels[i], -slope / 2 - 1e-4, slope / 2 + 1e-4);
    }

    [Fact]
    public void Seg_reads_back_voxel_for_voxel()
    {
        // 5x3 planes: 15 bits per frame, so frames straddle byte boundaries (PS3.5 8.1.1: no padding between frames).
        var g = Oblique(5, 3, 6);
        var a = new Volume<byte>(g);
        var b = new Volume<byte>(g);
        var rng = new Random(3);
        for (int i = 0; i < a.Voxels.Length; i++)
        {
            a.Voxels[i] = (byte)(rng.NextDouble() < 0.4 ? 1 : 0);
            b.Voxels[i] = (byte)(i / 15 == 2 && rng.NextDouble() < 0.5 ? 1 : 0); // one slice only
        }
        var empty = new Volume<byte>(g);
        var segments = new[]
        {
            new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "test", a, "prostate"),
            new SegmentDefinition("Lesion", DicomCode.MorphologicallyAlteredStructure, DicomCode.Neoplasm, "SEMIAUTOMATIC", "test", b),
            new SegmentDefinition("Empty", DicomCode.MorphologicallyAlteredStructure, DicomCode.Neoplasm, "AUTOMATIC", "test", empty),
        };
        var path = Path.Combine(_dir, "seg.dcm");
        SegmentationWriter.Write(path, g, segments, new DicomStudyInfo("P1", null, null, new DateOnly(2024, 1, 2)), null);
        var back = SegmentationReader.Read(path, g);
        Assert.Equal(["Prostate", "Lesion", "Empty"], back.Select(s => s.Label));
        Assert.Equal(a.Voxels, back[0].Mask.Voxels);
        Assert.Equal(b.Voxels, back[1].Mask.Voxels);
        Assert.Equal(empty.Voxels, back[2].Mask.Voxels);
        var ds = Engine.Io.Dicom.DicomFile.Read(path).Dataset;
        Assert.Equal(SegmentationWriter.Frames(segments).Count, ds.GetInt(Engine.Io.Dicom.DicomTags.NumberOfFrames));
        Assert.Equal(6 + 1 + 1, ds.GetInt(Engine.Io.Dicom.DicomTags.NumberOfFrames)); // a: every slice; b: one; empty: placeholder
    }

    [Fact]
    public void Seg_read_onto_a_shifted_or_larger_grid_stays_at_the_same_physical_place()
    {
        var g = Oblique(5, 3, 6);
        var m = new Volume<byte>(g);
        m[1, 1, 1] = 1;
        var path = Path.Combine(_dir, "seg.dcm");
        SegmentationWriter.Write(path, g, [new SegmentDefinition("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "t", m)],
            new DicomStudyInfo(null, null, null, null), null);
        // Src: PS3.3 C.7.6.2.1.1 — a voxel is where its Image Position (Patient) puts it, whatever grid reads it.
        var shifted = g.With(originMm: g.IndexToPhysical(0, 0, 1));
        var back = SegmentationReader.Read(path, shifted)[0].Mask;
        Assert.Equal(1, back[1, 1, 0]);
        Assert.Equal(1, back.Voxels.Count(v => v != 0));
        var larger = SegmentationReader.Read(path, g.With(size: new Size3(6, 3, 7)))[0].Mask;
        Assert.Equal(1, larger[1, 1, 1]);
        Assert.Equal(1, larger.Voxels.Count(v => v != 0));
    }

    [Fact]
    public void An_image_is_not_read_as_a_seg()
    {
        var g = Oblique(4, 4, 2);
        var common = new DicomWriteDataset().Add(Engine.Io.Dicom.DicomTags.PatientID, Engine.Io.Dicom.DicomVR.LO, "P1");
        MrSeriesWriter.Write(_dir, "mr", Ramp(g), common, "not-a-seg");
        var e = Assert.Throws<InputFormatException>(() => SegmentationReader.Read(Path.Combine(_dir, "mr-0001.dcm"), g));
        Assert.Contains("not a DICOM Segmentation", e.Message, StringComparison.Ordinal);
    }
}
