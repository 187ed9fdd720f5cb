using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Xunit;

namespace Serimetry.Tests.Io.Series;

public class SeriesSelectorTests
{
    private static IEnumerable<SliceHeader> T2(string uid, int number) =>
        SyntheticSlices.Oblique(series: uid).Select(s => s with
        {
            SeriesNumber = number, ScanningSequence = ["SE"], EchoTimeMs = 104, RepetitionTimeMs = 5660,
            Source = new SliceSource(s.Source.Container + uid),
        });

    private static IEnumerable<SliceHeader> Dwi(string uid, int number, string description, params double[] bs) =>
        bs.SelectMany(b => SyntheticSlices.Oblique(series: uid, bValue: b).Select(s => s with
        {
            SeriesNumber = number, ImageType = ["DERIVED", "PRIMARY", "DIFFUSION", "TRACEW"], SeriesDescription = description,
            Source = new SliceSource(s.Source.Container + uid + b),
        }));

    [Fact]
    public void RepeatedT2PicksTheLatestAndSaysSo()
    {
        // As in ProstateX-0001 (series 6 and 10 are both T2w): the repeat is chosen.
        var study = SeriesAssembler.Assemble(T2("1.6", 6).Concat(T2("1.10", 10)).ToList())[0];
        var c = SeriesSelector.Select(study, SeriesRole.T2w);
        Assert.Equal("1.10", c.Series!.SeriesInstanceUid);
        Assert.Contains(c.Warnings, w => w.Contains("2 t2w series"));
    }

    [Fact]
    public void AcquiredDwiBeatsComputedUnlessOnlyTheComputedHasTheBValue()
    {
        var slices = Dwi("1.6", 6, "ep2d_diff", 50, 400, 800).Concat(Dwi("1.8", 8, "ep2d_diffCALC_BVAL", 1000)).ToList();
        var study = SeriesAssembler.Assemble(slices)[0];
        Assert.Equal("1.6", SeriesSelector.Select(study, SeriesRole.Dwi).Series!.SeriesInstanceUid);
        Assert.Equal("1.6", SeriesSelector.Select(study, SeriesRole.Dwi, 800).Series!.SeriesInstanceUid);
        Assert.Equal("1.8", SeriesSelector.Select(study, SeriesRole.Dwi, 1000).Series!.SeriesInstanceUid);
        Assert.Null(SeriesSelector.Select(study, SeriesRole.Dwi, 1500).Series);
    }

    [Fact]
    public void IrregularSeriesIsPassedOverWithAWarning()
    {
        var broken = T2("1.10", 10).ToList();
        broken.RemoveAt(4);
        var study = SeriesAssembler.Assemble(T2("1.6", 6).Concat(broken).ToList())[0];
        var c = SeriesSelector.Select(study, SeriesRole.T2w);
        Assert.Equal("1.6", c.Series!.SeriesInstanceUid);
        Assert.Contains(c.Warnings, w => w.Contains("no regular stack"));
        Assert.Null(SeriesSelector.Select(study, SeriesRole.Adc).Series);
    }
}
