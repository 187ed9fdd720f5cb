using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Series;

/// <summary>
/// The three PROSTATEx exams in shared/reference/mr: every series must come out with the role, size,
/// spacing, orientation, origin and b-values that the folder's README documents.
/// Src: shared/reference/mr/README.md, values read with dcmtk (dcmdump) from these files.
/// </summary>
public class RealExamSeriesTests
{
    public sealed record Expected(string Case, string Folder, SeriesRole Role, int[] Size, double[] Spacing,
        double[] Iop, double[] Origin, double[] BValues, int Files);

    private static readonly double[] Iop0000 = [1, -0.0004, -0.0012, 0, 0.94838, -0.31715];
    private static readonly double[] Iop0001 = [1, 0, 0, 0, 0.99396, -0.10973];
    private static readonly double[] Iop0218 = [1, 0, 0, 0, 0.91845, -0.39555];

    // Src: shared/reference/mr/README.md tables "Cases" (dcmtk readings): folder, content, columns x rows x
    // slices, pixel spacing, slice step, ImageOrientationPatient, first-slice (lowest along the normal) position, b-values.
    public static readonly Expected[] All =
    [
        new("ProstateX-0000", "07-07-2011/4.000000-t2tsetra-00702", SeriesRole.T2w, [384, 384, 19], [0.5, 0.5, 3.0], Iop0000, [-57.685, -82.363, -27.081], [], 19),
        new("ProstateX-0000", "07-07-2011/6.000000-ep2ddifftraDYNDIST-69284", SeriesRole.Dwi, [84, 128, 19], [2, 2, 3.0], Iop0000, [-45.685, -112.716, -16.946], [50, 400, 800], 57),
        new("ProstateX-0000", "07-07-2011/7.000000-ep2ddifftraDYNDISTADC-48780", SeriesRole.Adc, [84, 128, 19], [2, 2, 3.0], Iop0000, [-45.685, -112.716, -16.946], [], 19),
        new("ProstateX-0000", "07-07-2011/8.000000-ep2ddifftraDYNDISTCALCBVAL-83202", SeriesRole.Dwi, [84, 128, 19], [2, 2, 3.0], Iop0000, [-45.685, -112.716, -16.946], [1000], 19),
        new("ProstateX-0001", "07-08-2011/6.000000-t2tsetra-76610", SeriesRole.T2w, [384, 384, 19], [0.5, 0.5, 3.0], Iop0001, [-118.955, -65.840, -33.366], [], 19),
        new("ProstateX-0001", "07-08-2011/10.000000-t2tsetra-17541", SeriesRole.T2w, [384, 384, 19], [0.5, 0.5, 3.0], Iop0001, [-118.955, -65.840, -33.366], [], 19),
        new("ProstateX-0001", "07-08-2011/7.000000-ep2ddifftraDYNDISTMIX-61648", SeriesRole.Dwi, [84, 128, 19], [2, 2, 3.0], Iop0001, [-106.955, -97.647, -29.854], [50, 400, 800], 57),
        new("ProstateX-0001", "07-08-2011/8.000000-ep2ddifftraDYNDISTMIXADC-33954", SeriesRole.Adc, [84, 128, 19], [2, 2, 3.0], Iop0001, [-106.955, -97.647, -29.854], [], 19),
        new("ProstateX-0001", "07-08-2011/9.000000-ep2ddifftraDYNDISTMIXCALCBVAL-58431", SeriesRole.Dwi, [84, 128, 19], [2, 2, 3.0], Iop0001, [-106.955, -97.647, -29.854], [1000], 19),
        new("ProstateX-0218", "02-18-2011/5.000000-t2tsetra320p2-09906", SeriesRole.T2w, [320, 320, 20], [0.625, 0.625, 3.6], Iop0218, [-115.422, -108.264, -7.278], [], 20),
        new("ProstateX-0218", "02-18-2011/8.000000-ep2dadvdiff3Scan4bvalspair511b-12670", SeriesRole.Dwi, [160, 130, 20], [1.625, 1.625, 3.6], Iop0218, [-145.422, -113.430, -5.053], [0, 100, 400, 800], 80),
        new("ProstateX-0218", "02-18-2011/9.000000-ep2dadvdiff3Scan4bvalspair511bADC-84922", SeriesRole.Adc, [160, 130, 20], [1.625, 1.625, 3.6], Iop0218, [-145.422, -113.430, -5.053], [], 20),
        new("ProstateX-0218", "02-18-2011/10.000000-ep2dadvdiff3Scan4bvalspair511bCALCBVAL-87429", SeriesRole.Dwi, [160, 130, 20], [1.625, 1.625, 3.6], Iop0218, [-145.422, -113.430, -5.053], [1600], 20),
    ];

    private static readonly Dictionary<string, IReadOnlyList<AssembledStudy>> Cache = [];

    private static IReadOnlyList<AssembledStudy> Case(string name)
    {
        lock (Cache)
        {
            if (!Cache.TryGetValue(name, out var studies))
                Cache[name] = studies = StudyIndex.Build(SharedReference.PathOf("mr", name), DicomSliceHeaderReader.Default).Assemble();
            return studies;
        }
    }

    public static TheoryData<int> Indices()
    {
        var d = new TheoryData<int>();
        for (int i = 0; i < All.Length; i++) d.Add(i);
        return d;
    }

    [Theory]
    [MemberData(nameof(Indices))]
    public void SeriesMatchesTheDocumentedReading(int index)
    {
        var e = All[index];
        var study = Assert.Single(Case(e.Case));
        var series = study.Series.Single(s => s.Summary.Source.Replace('\\', '/') == e.Folder);
        var m = series.Summary;
        Assert.Equal(e.Role, m.Role);
        Assert.Equal(e.Size, m.Size.ToArray());
        for (int a = 0; a < 3; a++) Assert.Equal(e.Spacing[a], m.SpacingMm[a], 1e-4);
        Assert.Equal(e.BValues, m.BValues);
        Assert.Equal(e.Files, series.NumberOfFiles);
        var r = new Vec3(e.Iop[0], e.Iop[1], e.Iop[2]);
        var c = new Vec3(e.Iop[3], e.Iop[4], e.Iop[5]);
        // The README rounds cosines to 5 decimals (4 for the smallest); the contract tolerance is 1e-4.
        Assert.True(m.Direction.MaxAbsDifference(Mat3.FromColumns(r, c, r.Cross(c))) < 1e-4, $"direction {m.Direction}");
        // Origin: the README prints the lowest slice's position with 3 decimals.
        for (int a = 0; a < 3; a++) Assert.Equal(e.Origin[a], m.OriginMm[a], 6e-4);
        Assert.DoesNotContain(m.Warnings, w => w.Contains("gap") || w.Contains("duplicate") || w.Contains("non-uniform"));
        Assert.All(series.MainStacks, s => Assert.True(s.IsRegular, s.BlockingProblem));
    }

    [Fact]
    public void EveryDocumentedSeriesIsFoundAndNothingElse()
    {
        foreach (var name in All.Select(e => e.Case).Distinct())
        {
            var found = Case(name).SelectMany(s => s.Series).Select(s => s.Summary.Source.Replace('\\', '/')).Order().ToList();
            var documented = All.Where(e => e.Case == name).Select(e => e.Folder).Order().ToList();
            Assert.Equal(documented, found);
        }
    }

    [Fact]
    public void DiffusionFallbackSourcesAreNamed()
    {
        // The exams carry b-values only in the Siemens private element and Sequence Name (README "File format").
        var dwi = Case("ProstateX-0218")[0].Series.Single(s => s.Summary.BValues.Count == 4);
        Assert.All(dwi.MainStacks, s => Assert.Equal(BValueRules.SiemensSource, s.BValueSource));
        Assert.Equal(80, dwi.Stacks.Sum(s => s.Slices.Count));
    }

    // Src: shared/reference/mr/README.md — scanner ADC ranges (dcmtk reading): 0–3265, 0–3851, 0–4032 (10^-6 mm²/s).
    [Theory]
    [InlineData("ProstateX-0000", 3265)]
    [InlineData("ProstateX-0001", 3851)]
    [InlineData("ProstateX-0218", 4032)]
    public void AdcVolumeHasTheDocumentedRange(string name, float max)
    {
        var adc = Case(name)[0].Series.Single(s => s.Summary.Role == SeriesRole.Adc);
        var v = StackVolumeBuilder.Build(adc);
        Assert.Equal(adc.Summary.Size, v.Size);
        Assert.Equal(0f, v.Voxels.Min());
        Assert.Equal(max, v.Voxels.Max());
    }

    [Fact]
    public void EachBValueOfAMultiBSeriesBuildsItsOwnVolume()
    {
        var dwi = Case("ProstateX-0218")[0].Series.Single(s => s.Summary.BValues.Count == 4);
        var b0 = StackVolumeBuilder.Build(dwi, 0);
        var b800 = StackVolumeBuilder.Build(dwi, 800);
        Assert.True(b0.Geometry.IsCongruentWith(b800.Geometry));
        // Diffusion weighting attenuates the signal: the b=800 image is darker overall than b=0.
        Assert.True(b800.Voxels.Average() < b0.Voxels.Average());
        Assert.Throws<InvalidParameterException>(() => StackVolumeBuilder.Build(dwi, 1234));
    }
}
