using System.Globalization;
using Serimetry.Engine.Core;
using Serimetry.Engine.Io.Nifti;
using Serimetry.Tests.Shared;
using Xunit;

namespace Serimetry.Conformance.Nifti;

/// <summary>
/// A NIfTI made from the oblique reference DICOM series places every voxel centre at the same LPS point as
/// the DICOM headers do. Src: shared/reference/dicom/series-oblique/headers.csv and geometry.csv (values
/// printed by dcmtk's dcmdump); voxel→LPS rule of PS3.3 C.7.6.2.1.1 (facts.md §10); the written file is
/// read back both by nifti_tool (sto_xyz, qto_xyz) and by our reader.
/// </summary>
public sealed class ObliqueSeriesNiftiTests : IDisposable
{
    private readonly ScratchFolder _scratch = new();

    public void Dispose() => _scratch.Dispose();

    private const int Rows = 64, Columns = 80; // series-oblique/manifest.csv

    private static string Oblique(string file) => SharedReference.PathOf("dicom", "series-oblique", file);

    private static Vec3 ParseTriplet(string s)
    {
        var p = s.Split('\\').Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();
        return new Vec3(p[0], p[1], p[2]);
    }

    /// <summary>Splits one CSV line honouring double quotes.</summary>
    private static List<string> SplitCsv(string line)
    {
        var fields = new List<string>();
        var cur = new System.Text.StringBuilder();
        bool quoted = false;
        foreach (char ch in line)
        {
            if (ch == '"') quoted = !quoted;
            else if (ch == ',' && !quoted) { fields.Add(cur.ToString()); cur.Clear(); }
            else cur.Append(ch);
        }
        fields.Add(cur.ToString());
        return fields;
    }

    [Fact]
    public void EveryVoxelCentreKeepsItsLpsPosition()
    {
        var headers = File.ReadAllLines(Oblique("headers.csv"));
        var cols = SplitCsv(headers[0]);
        var first = SplitCsv(headers[1]);
        var iop = first[cols.IndexOf("ImageOrientationPatient")].Split('\\').Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();
        var ps = first[cols.IndexOf("PixelSpacing")].Split('\\').Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();
        var fr = new Vec3(iop[0], iop[1], iop[2]);
        var fc = new Vec3(iop[3], iop[4], iop[5]);
        double rowSpacing = ps[0], colSpacing = ps[1];

        // Slices in order along the normal (geometry.csv index_along_normal), with their positions.
        var slices = File.ReadAllLines(Oblique("geometry.csv")).Skip(1).Where(l => l.Length > 0).Select(SplitCsv)
            .Select(f => (Index: int.Parse(f[2], CultureInfo.InvariantCulture), Ipp: ParseTriplet(f[3])))
            .OrderBy(s => s.Index).ToArray();
        int n = slices.Length;
        var step = (slices[^1].Ipp - slices[0].Ipp) / (n - 1);
        var geometry = new Geometry(new Size3(Columns, Rows, n), new Vec3(colSpacing, rowSpacing, step.Norm), slices[0].Ipp,
            Mat3.FromColumns(fr, fc, step.Normalized()));

        var path = _scratch.PathOf("oblique.nii.gz");
        NiftiFile.Write(path, new Volume<float>(geometry));
        var ours = NiftiFile.ReadVolume(path).Geometry;
        var nim = NiftiTool.Image(path);
        var sto = NiftiTool.Numbers(nim, "sto_xyz");
        var qto = NiftiTool.Numbers(nim, "qto_xyz");

        double worstOurs = 0, worstSto = 0, worstQto = 0;
        for (int k = 0; k < n; k++)
            for (int j = 0; j < Rows; j++)
                for (int i = 0; i < Columns; i++)
                {
                    var dicom = slices[k].Ipp + i * colSpacing * fr + j * rowSpacing * fc;
                    worstOurs = Math.Max(worstOurs, (ours.IndexToPhysical(i, j, k) - dicom).Norm);
                    worstSto = Math.Max(worstSto, (Lps(sto, i, j, k) - dicom).Norm);
                    worstQto = Math.Max(worstQto, (Lps(qto, i, j, k) - dicom).Norm);
                }
        // float32 header fields limit agreement to ~1e-5 mm at these coordinates; nifti_tool prints 6 decimals.
        Assert.True(worstOurs < 1e-4, $"our reader: {worstOurs} mm");
        Assert.True(worstSto < 1e-3, $"nifti_tool sto_xyz: {worstSto} mm");
        Assert.True(worstQto < 1e-3, $"nifti_tool qto_xyz: {worstQto} mm");
    }

    [Fact]
    public void OurDicomSeriesWrittenAsNiftiKeepsVoxelsAndPositions()
    {
        // The series read by our DICOM reader and series assembly, written as NIfTI and read back: same voxels,
        // and every voxel centre within 1e-4 mm of the position the DICOM headers give (IPP of its slice +
        // i·column spacing·row cosines + j·row spacing·column cosines; geometry.csv values from dcmdump).
        var volume = Serimetry.Engine.Io.ImageFiles.ReadVolume(SharedReference.PathOf("dicom", "series-oblique"));
        var path = _scratch.PathOf("from-dicom.nii.gz");
        NiftiFile.Write(path, volume);
        var back = NiftiFile.ReadVolume(path).Volume;
        Assert.Equal(volume.Voxels, back.Voxels);
        var slices = File.ReadAllLines(Oblique("geometry.csv")).Skip(1).Where(l => l.Length > 0).Select(SplitCsv)
            .Select(f => (Index: int.Parse(f[2], CultureInfo.InvariantCulture), Ipp: ParseTriplet(f[3])))
            .OrderBy(s => s.Index).ToArray();
        var fr = new Vec3(1, 0, 0);
        var fc = new Vec3(0, 0.96592582628907, 0.25881904510252);
        double worst = 0;
        for (int k = 0; k < slices.Length; k++)
            for (int j = 0; j < Rows; j++)
                for (int i = 0; i < Columns; i++)
                    worst = Math.Max(worst, (back.Geometry.IndexToPhysical(i, j, k) - (slices[k].Ipp + i * 0.8 * fr + j * 0.9 * fc)).Norm);
        Assert.True(worst < 1e-4, $"worst voxel-centre error {worst} mm");
    }

    private static Vec3 Lps(double[] m, int i, int j, int k) => new(
        -(m[0] * i + m[1] * j + m[2] * k + m[3]),
        -(m[4] * i + m[5] * j + m[6] * k + m[7]),
        m[8] * i + m[9] * j + m[10] * k + m[11]);
}
