using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Xunit;

namespace Serimetry.Tests.Io.Series;

public class StackAssemblyTests
{
    private static AssembledSeries One(IReadOnlyList<SliceHeader> slices)
    {
        var studies = SeriesAssembler.Assemble(slices);
        var study = Assert.Single(studies);
        return Assert.Single(study.Series);
    }

    [Fact]
    public void ObliqueStackIsOrderedAlongTheNormalNotByInstanceNumber()
    {
        // Truth: the geometry the synthetic slices were built from (origin = position of k = 0, which has the
        // highest Instance Number), as the reference series README documents.
        var s = One(SyntheticSlices.ByInstance(SyntheticSlices.Oblique()));
        var g = s.MainStacks[0].Geometry!;
        Assert.Equal(new Size3(80, 64, 10), g.Size);
        Assert.True((g.OriginMm - new Vec3(-32, -30, 12.5)).Norm < 1e-9);
        Assert.True((g.SpacingMm - new Vec3(0.8, 0.9, 2.5)).Norm < 1e-9);
        double c15 = Math.Cos(Math.PI / 12), s15 = Math.Sin(Math.PI / 12);
        Assert.True(g.Direction.MaxAbsDifference(new Mat3(1, 0, 0, 0, c15, -s15, 0, s15, c15)) < 1e-12);
        Assert.Equal(10, s.MainStacks[0].Slices[0].InstanceNumber);
        Assert.Empty(s.Summary.Warnings);
        Assert.True(s.MainStacks[0].IsRegular);
    }

    [Fact]
    public void SliceStepComesFromPositionsNotSliceThickness()
    {
        var slices = SyntheticSlices.Oblique(stepMm: 3.6);
        var s = One(slices);
        Assert.Equal(3.6, s.Summary.SpacingMm.Z, 9);
        Assert.Equal(2, s.Summary.Acquisition.SliceThicknessMm);
    }

    [Fact]
    public void MissingSliceIsReportedAsAGap()
    {
        var slices = SyntheticSlices.Oblique();
        slices.RemoveAt(4);
        var s = One(slices);
        var stack = s.MainStacks[0];
        Assert.False(stack.IsRegular);
        Assert.Contains("gap", stack.BlockingProblem);
        Assert.Contains("1 slice(s) missing", stack.BlockingProblem);
        Assert.Equal(2.5, s.Summary.SpacingMm.Z, 9);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("gap"));
    }

    [Fact]
    public void UnevenStepIsReportedAsNonUniform()
    {
        var slices = SyntheticSlices.Oblique();
        var n = slices[0].Normal!.Value;
        slices[6] = slices[6] with { ImagePositionPatient = slices[6].ImagePositionPatient + 0.7 * n };
        var s = One(slices);
        Assert.Contains("non-uniform", s.MainStacks[0].BlockingProblem);
    }

    [Fact]
    public void SmallRoundingInPositionsIsTolerated()
    {
        var slices = SyntheticSlices.Oblique();
        var n = slices[0].Normal!.Value;
        slices[3] = slices[3] with { ImagePositionPatient = slices[3].ImagePositionPatient + 0.004 * n };
        Assert.True(One(slices).MainStacks[0].IsRegular);
    }

    [Fact]
    public void DuplicatePositionsAreReported()
    {
        var slices = SyntheticSlices.Oblique();
        slices.Add(slices[2] with { Source = new SliceSource("/data/copy.dcm"), SopInstanceUid = "1.2.3.1.99" });
        var s = One(slices);
        Assert.Contains("duplicate", s.MainStacks[0].BlockingProblem);
    }

    [Fact]
    public void RepeatedAcquisitionsAtTheSamePositionsBecomeSeparateStacks()
    {
        var a = SyntheticSlices.Oblique().Select(x => x with { AcquisitionNumber = 1 });
        var b = SyntheticSlices.Oblique().Select(x => x with { AcquisitionNumber = 2, Source = new SliceSource(x.Source.Container + "b") });
        var s = One(a.Concat(b).ToList());
        Assert.Equal(2, s.Stacks.Count);
        Assert.All(s.Stacks, st => Assert.True(st.IsRegular));
    }

    [Fact]
    public void MixedOrientationsAreSplitAndReported()
    {
        var axial = SyntheticSlices.Oblique(count: 12, tiltDeg: 0);
        var tilted = SyntheticSlices.Oblique(count: 3, tiltDeg: 90);
        var s = One(axial.Concat(tilted).ToList());
        Assert.Equal(2, s.Stacks.Count);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("mixed orientations"));
        Assert.Equal(12, s.Summary.Size.Z);
    }

    [Fact]
    public void InconsistentGridIsReported()
    {
        var slices = SyntheticSlices.Oblique();
        slices[5] = slices[5] with { Rows = 128 };
        var s = One(slices);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("inconsistent Rows/Columns/Pixel Spacing"));
    }

    [Fact]
    public void DiffusionSeriesSplitsByBValueIntoOneEntry()
    {
        var slices = new[] { 800.0, 50, 400 }
            .SelectMany(b => SyntheticSlices.Oblique(bValue: b)
                .Select(x => x with { Source = new SliceSource(x.Source.Container + b), ImageType = ["DERIVED", "PRIMARY", "DIFFUSION", "TRACEW"] }))
            .ToList();
        var s = One(slices);
        Assert.Equal(SeriesRole.Dwi, s.Summary.Role);
        Assert.Equal(new[] { 50.0, 400, 800 }, s.Summary.BValues);
        Assert.Equal(3, s.MainStacks.Count);
        Assert.Equal(10, s.Summary.Size.Z);
        Assert.Equal(400, s.StackFor(400)!.BValue);
        Assert.Empty(s.Summary.Warnings);
    }

    [Fact]
    public void UnknownBValueIsReported()
    {
        var slices = SyntheticSlices.Oblique().Select(x => x with { ImageType = ["DERIVED", "PRIMARY", "DIFFUSION"] }).ToList();
        var s = One(slices);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("b-value unknown"));
    }

    [Fact]
    public void SingleSliceTakesSpacingBetweenSlices()
    {
        var s = One(SyntheticSlices.Oblique(count: 1, stepMm: 4));
        Assert.Equal(4, s.Summary.SpacingMm.Z);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("single slice"));
    }

    [Fact]
    public void MissingPositionsBlockTheStack()
    {
        var slices = SyntheticSlices.Oblique().Select(x => x with { ImagePositionPatient = null }).ToList();
        var s = One(slices);
        Assert.Null(s.MainStacks[0].Geometry);
        Assert.False(s.MainStacks[0].IsRegular);
    }

    [Fact]
    public void RoleOverrideReplacesTheRules()
    {
        var slices = SyntheticSlices.Oblique();
        var studies = SeriesAssembler.Assemble(slices,
            new SeriesAssemblyOptions(new Dictionary<string, SeriesRole> { ["1.2.3.1"] = SeriesRole.T2w }));
        var s = studies[0].Series[0];
        Assert.Equal(SeriesRole.T2w, s.Summary.Role);
        Assert.True(s.RoleOverridden);
    }

    [Fact]
    public void OrderDoesNotDependOnInputOrder()
    {
        var a = SyntheticSlices.Oblique(series: "1.2.3.5").Concat(SyntheticSlices.Oblique(series: "1.2.3.4")).ToList();
        var b = Enumerable.Reverse(a).ToList();
        var sa = SeriesAssembler.Assemble(a)[0].Series.Select(x => x.SeriesInstanceUid);
        var sb = SeriesAssembler.Assemble(b)[0].Series.Select(x => x.SeriesInstanceUid);
        Assert.Equal(sa, sb);
        Assert.Equal(["1.2.3.4", "1.2.3.5"], sa);
    }

    [Fact]
    public void SecondCopiesOfTheSameInstanceAreIgnoredWithAWarning()
    {
        var slices = SyntheticSlices.Oblique();
        slices.Add(slices[3] with { Source = new SliceSource("/data/archive.zip", "IM0007.dcm") });
        var s = One(slices);
        Assert.True(s.MainStacks[0].IsRegular);
        Assert.Equal(10, s.MainStacks[0].Slices.Count);
        Assert.Contains(s.Summary.Warnings, w => w.Contains("1 file(s) repeat an image"));
    }

    [Fact]
    public void EveryProblemIsListedNotOnlyTheFirst()
    {
        var slices = SyntheticSlices.Oblique();
        slices.Add(slices[2] with { Source = new SliceSource("/data/copy.dcm"), SopInstanceUid = "1.2.3.1.98" });
        slices.RemoveAt(6);
        var stack = One(slices).MainStacks[0];
        Assert.Contains("duplicate", stack.BlockingProblem);
        Assert.Contains(stack.Warnings, w => w.Contains("gap"));
    }

    [Theory]
    [InlineData(0, 0, 0, 0, 0, 0)]
    [InlineData(1, 0, 0, 1, 0, 0)]
    [InlineData(2, 0, 0, 0, 1, 0)]
    public void DegenerateOrientationIsReportedNotThrown(double a, double b, double c, double d, double e, double f)
    {
        var slices = SyntheticSlices.Oblique().Select(x => x with { RowCosine = new Vec3(a, b, c), ColumnCosine = new Vec3(d, e, f) }).ToList();
        var stack = One(slices).MainStacks[0];
        Assert.Null(stack.Geometry);
        Assert.Contains("Image Orientation", stack.BlockingProblem);
    }
}
