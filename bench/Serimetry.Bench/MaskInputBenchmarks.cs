using BenchmarkDotNet.Attributes;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Masks;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Engine.Reports.Dicom;

namespace Serimetry.Bench;

/// <summary>
/// Reading a gland-sized outline (ellipsoid 48x36x42 mm) onto a T2w grid (384x384x24, 0.5x0.5x3.6 mm) through
/// <see cref="MaskFiles"/>: NIfTI (the baseline), our SEG on the same grid (voxel copy), a SEG on a grid turned 5°
/// (partial-volume resampling) and an RTSTRUCT (contour rasterisation). Ratios against the NIfTI read.
/// </summary>
[SimpleJob(launchCount: 1, warmupCount: 1, iterationCount: 6)]
[MemoryDiagnoser]
public class MaskInputBenchmarks
{
    private string _dir = null!;
    private Geometry _grid = null!;

    [GlobalSetup]
    public void Setup()
    {
        _dir = Directory.CreateTempSubdirectory("serimetry-bench-masks-").FullName;
        _grid = Geometry.Axial(new Size3(384, 384, 24), new Vec3(0.5, 0.5, 3.6), new Vec3(-96, -96, -43));
        var study = new DicomStudyInfo("B", null, null, new DateOnly(2024, 1, 1));
        var mask = Ellipsoid(_grid);
        NiftiFile.Write(Path.Combine(_dir, "m.nii.gz"), mask);
        SegmentationWriter.Write(Path.Combine(_dir, "seg.dcm"), _grid, [Segment(mask)], study, null);
        double a = 5 * Math.PI / 180;
        var turned = _grid.With(direction: new Mat3(Math.Cos(a), -Math.Sin(a), 0, Math.Sin(a), Math.Cos(a), 0, 0, 0, 1));
        turned = turned.With(originMm: _grid.CenterMm - turned.IndexToPhysicalMatrix * new Vec3(191.5, 191.5, 11.5));
        SegmentationWriter.Write(Path.Combine(_dir, "seg-turned.dcm"), turned, [Segment(Ellipsoid(turned))], study, null);
        RtStructWriter.Write(Path.Combine(_dir, "rt.dcm"), _grid, [new RoiDefinition("Prostate", mask)], study, null);
    }

    [GlobalCleanup]
    public void Cleanup() => Directory.Delete(_dir, true);

    [Benchmark(Baseline = true)]
    public Volume<byte> Nifti() => MaskFiles.Read(new MaskSource(Path.Combine(_dir, "m.nii.gz")), _grid).Mask;

    [Benchmark]
    public Volume<byte> SegSameGrid() => MaskFiles.Read(new MaskSource(Path.Combine(_dir, "seg.dcm")), _grid).Mask;

    [Benchmark]
    public Volume<byte> SegTurnedGrid() => MaskFiles.Read(new MaskSource(Path.Combine(_dir, "seg-turned.dcm")), _grid).Mask;

    [Benchmark]
    public Volume<byte> RtStruct() => MaskFiles.Read(new MaskSource(Path.Combine(_dir, "rt.dcm")), _grid).Mask;

    private static SegmentDefinition Segment(Volume<byte> m) =>
        new("Prostate", DicomCode.AnatomicalStructure, DicomCode.Prostate, "AUTOMATIC", "bench", m);

    private static Volume<byte> Ellipsoid(Geometry g)
    {
        var m = new Volume<byte>(g);
        var c = g.CenterMm;
        for (int k = 0; k < g.Size.Z; k++)
            for (int j = 0; j < g.Size.Y; j++)
                for (int i = 0; i < g.Size.X; i++)
                {
                    var d = g.IndexToPhysical(i, j, k) - c;
                    if (d.X * d.X / 576 + d.Y * d.Y / 324 + d.Z * d.Z / 441 <= 1) m[i, j, k] = 1;
                }
        return m;
    }
}
