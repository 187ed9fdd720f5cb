using System.Diagnostics;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io;
using Serimetry.Engine.Io.Dicom.Codecs;
using Serimetry.Engine.Io.Series;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Series;

/// <summary>
/// The oblique series transcoded at test time by dcmtk (dcmconv, dcmcrle, dcmcjpeg, dcmcjpls) must give the
/// same geometry and voxels as the original. Compressed syntaxes without an engine decoder must fail with a
/// clear <see cref="UnsupportedInputException"/> instead.
/// Src: dcmtk's encoders are the outside reference; the original series is shared/reference/dicom/series-oblique.
/// </summary>
public sealed class TranscodedSeriesTests : IDisposable
{
    private static readonly string Folder = SharedReference.PathOf("dicom", "series-oblique");
    private readonly string _tmp = Directory.CreateTempSubdirectory("serimetry-transcode-").FullName;

    public void Dispose() => Directory.Delete(_tmp, true);

    public static TheoryData<string, string, string> Syntaxes() => new()
    {
        { "dcmconv", "+ti", "1.2.840.10008.1.2" },
        { "dcmconv", "+tb", "1.2.840.10008.1.2.2" },
        { "dcmconv", "+td", "1.2.840.10008.1.2.1.99" },
        { "dcmcrle", "", "1.2.840.10008.1.2.5" },
        { "dcmcjpeg", "+e1", "1.2.840.10008.1.2.4.70" },
        { "dcmcjpls", "", "1.2.840.10008.1.2.4.80" },
    };

    [Theory]
    [MemberData(nameof(Syntaxes))]
    public void TranscodedSeriesGivesIdenticalGeometryAndVoxels(string tool, string option, string transferSyntax)
    {
        foreach (var f in Directory.GetFiles(Folder, "*.dcm"))
            Transcode(tool, option, f, Path.Combine(_tmp, Path.GetFileName(f)));
        var original = Only(Folder);
        var copy = Only(_tmp);
        Assert.All(copy.MainStacks[0].Slices, s => Assert.Equal(transferSyntax, s.TransferSyntaxUid));
        Assert.True(copy.MainStacks[0].Geometry!.IsCongruentWith(original.MainStacks[0].Geometry!, 1e-9));
        bool compressed = transferSyntax.StartsWith("1.2.840.10008.1.2.4", StringComparison.Ordinal) || transferSyntax.EndsWith(".5", StringComparison.Ordinal);
        if (compressed && CodecRegistry.Find(transferSyntax) is null)
        {
            var e = Assert.Throws<UnsupportedInputException>(() => StackVolumeBuilder.Build(copy));
            Assert.Contains(transferSyntax, e.Describe());
            return;
        }
        Assert.Equal(StackVolumeBuilder.Build(original).Voxels, StackVolumeBuilder.Build(copy).Voxels);
    }

    private static AssembledSeries Only(string folder) =>
        Assert.Single(Assert.Single(StudyIndex.Build(folder, DicomSliceHeaderReader.Default).Assemble()).Series);

    private static void Transcode(string tool, string option, string input, string output)
    {
        var psi = new ProcessStartInfo(tool) { RedirectStandardError = true, RedirectStandardOutput = true };
        if (option.Length > 0) psi.ArgumentList.Add(option);
        psi.ArgumentList.Add(input);
        psi.ArgumentList.Add(output);
        using var p = Process.Start(psi)!;
        var err = p.StandardError.ReadToEndAsync();
        p.StandardOutput.ReadToEnd();
        p.WaitForExit();
        Assert.True(p.ExitCode == 0, $"{tool} {option}: {err.Result}");
    }
}
