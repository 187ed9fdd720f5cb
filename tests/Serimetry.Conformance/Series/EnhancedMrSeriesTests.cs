using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Series;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Series;

/// <summary>
/// Enhanced MR multi-frame objects: one slice header per frame from the functional groups.
/// Src: shared/reference/dicom/README.md (file descriptions) and headers.csv (dcmdump values of frame 1 taken
/// from the standard per-frame macros (5200,9230).(0020,9113) etc., GDCM origin alongside).
/// </summary>
public class EnhancedMrSeriesTests
{
    private static AssembledSeries Series(string file)
    {
        var index = StudyIndex.Build(SharedReference.PathOf("dicom", "files", file), DicomSliceHeaderReader.Default);
        return Assert.Single(Assert.Single(index.Assemble()).Series);
    }

    [Fact]
    public void PhilipsFieldMapSplitsIntoMagnitudeAndRealStacksFromTheStandardMacros()
    {
        var s = Series("dcmqaenh_Philips_IM_0027_fMAP.dcm");
        // README: frames 1-32 MAGNITUDE, 33-64 REAL, the same 32 positions twice.
        Assert.Equal(2, s.Stacks.Count);
        Assert.All(s.Stacks, st => Assert.Equal(32, st.Slices.Count));
        Assert.All(s.Stacks, st => Assert.True(st.IsRegular, st.BlockingProblem));
        var frame1 = s.Stacks.SelectMany(st => st.Slices).Single(x => x.Source.Frame == 0);
        // headers.csv: frame 1 Image Position (Patient) from (0020,9113), not the private copy 2 mm off.
        Assert.True((frame1.ImagePositionPatient!.Value - new Vec3(-127.24297738075, -119.77660465240, -38.354590835260)).Norm < 1e-6);
        Assert.Equal(4, frame1.RowSpacingMm);
        // README: rescale 1.27985347985347 / 0 for MAGNITUDE frames, 0.24420024420024 / -500 for REAL frames.
        Assert.Equal(1.27985347985347, frame1.RescaleSlope, 1e-12);
        var frame33 = s.Stacks.SelectMany(st => st.Slices).Single(x => x.Source.Frame == 32);
        Assert.Equal(0.24420024420024, frame33.RescaleSlope, 1e-12);
        Assert.Equal(-500, frame33.RescaleIntercept);
        Assert.Equal(new Size3(64, 64, 32), s.Summary.Size);
    }

    [Fact]
    public void SiemensEnhancedFramesArePlaced()
    {
        var s = Series("dcmqaenh_Siemens_XA10_6_1.dcm");
        var slices = s.Stacks.SelectMany(st => st.Slices).ToList();
        Assert.Equal(6, slices.Count);
        var frame1 = slices.Single(x => x.Source.Frame == 0);
        // headers.csv: -109.79\-58.4773\-5.40356, Pixel Spacing 3.375\3.375, Slice Thickness 2.4.
        Assert.True((frame1.ImagePositionPatient!.Value - new Vec3(-109.79, -58.4773, -5.40356)).Norm < 1e-9);
        Assert.Equal(3.375, frame1.ColumnSpacingMm);
        Assert.Equal(2.4, frame1.SliceThicknessMm);
        Assert.Equal(new Size3(64, 64, 6), s.Summary.Size);
    }

    [Fact]
    public void EnhancedVolumeHasRescaledFrameValues()
    {
        var s = Series("dcmqaenh_Philips_IM_0027_fMAP.dcm");
        var real = s.Stacks.Single(st => st.Slices[0].Source.Frame >= 32);
        var v = StackVolumeBuilder.Build(real);
        // Every REAL voxel is stored × 0.24420024420024 − 500, so it lies in [-500, 4095 × 0.2442 − 500].
        Assert.All(v.Voxels, x => Assert.InRange(x, -500.0f, 500.1f));
        Assert.Contains(v.Voxels, x => x != -500f);
    }
}
