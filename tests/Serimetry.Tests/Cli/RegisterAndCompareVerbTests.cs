using Serimetry.Cli;
using Serimetry.Engine.Phantoms;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Reports;
using Xunit;

namespace Serimetry.Tests.Cli;

/// <summary>
/// The register and compare verbs end to end on a digital phantom written to disk (Src: the phantom's known
/// rigid motion in truth; the change.json contract of ARCHITECTURE.md).
/// </summary>
public sealed class RegisterAndCompareVerbTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("serimetry-verbs-").FullName;
    private readonly PhantomSubject _subject;

    public RegisterAndCompareVerbTests()
    {
        _subject = PhantomGenerator.Generate(new PhantomSpec() with
        {
            Seed = 41,
            Visits = 2,
            T2Grid = new PhantomGrid(140, 120, 20, 0.7, 0.7, 3.0),
            DwiGrid = new PhantomGrid(50, 44, 20, 2.0, 2.0, 3.0),
            PsaNgPerMl = [4.0, 4.4],
        });
        PhantomWriter.WriteNifti(_dir, _subject);
    }

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private string P(params string[] parts) => Path.Combine([_dir, .. parts]);

    private static (int Code, string Out, string Err) Run(params string[] args) => CliRun.Run(args);

    [Fact]
    public void DeformableRegisterWithTheLesionReportsHowMuchChangeItAbsorbed()
    {
        // Src: phantom truth — visit 1 differs from baseline by a rigid motion and lesion growth ×1.3 only, so a
        // deformation that stays out of the lesion absorbs none of it: absorbedChange ≈ 1 (±10 %, the warning limit).
        var (code, stdout, err) = Run("register", "--fixed", P("visit-0", "t2w.nii.gz"), "--moving", P("visit-1", "t2w.nii.gz"),
            "--preset", "deformable", "--fixed-mask", P("visit-0", "masks", "gland.nii.gz"),
            "--lesion", P("visit-0", "masks", "lesion.nii.gz"), "--out", P("deformable.json"));
        Assert.True(code == 0, err);
        var quality = System.Text.Json.Nodes.JsonNode.Parse(File.ReadAllText(P("deformable.json")))!["quality"]!;
        Assert.InRange((double)quality["absorbedChange"]!, 0.9, 1.1);
        Assert.Contains("absorbed change over the lesion", stdout);
    }

    [Fact]
    public void RegisterRecoversTheTrueMotion()
    {
        var (code, _, err) = Run("register", "--fixed", P("visit-0", "t2w.nii.gz"), "--moving", P("visit-1", "t2w.nii.gz"),
            "--fixed-mask", P("visit-0", "masks", "gland.nii.gz"), "--out", P("transform.json"));
        Assert.True(code == 0, err);
        var stored = TransformFile.Read(P("transform.json"));
        var truth = _subject.Visits[1].Truth.BaselineToVisit;
        var gland = _subject.Visits[0].GlandMask;
        double sum = 0;
        int n = 0;
        for (int i = 0; i < gland.Voxels.Length; i += 5)
        {
            if (gland.Voxels[i] == 0) continue;
            int x = i % gland.Size.X, y = i / gland.Size.X % gland.Size.Y, z = i / (gland.Size.X * gland.Size.Y);
            var p = gland.Geometry.IndexToPhysical(x, y, z);
            sum += (stored.Transform.TransformPoint(p) - truth.TransformPoint(p)).Norm;
            n++;
        }
        Assert.True(sum / n <= 0.5, $"mean TRE {sum / n:F3} mm");
    }

    [Fact]
    public void CompareWritesTheContractFilesAndRefusesBadPsa()
    {
        // A test-retest feature table in which the voxel-counting volume repeats (ICC near 1) and joint maximum does
        // not (ICC(2,1) = −2 by hand: equal subject means, so no between-subject variance): only the volume may feed
        // the radiomic deltas (Shrout & Fleiss 1979 case 2; threshold 0.75 from Koo & Li 2016).
        File.WriteAllText(P("retest.csv"), "subject,repeat,family,feature,ibsiCode,aggregationCode,value\n"
            + "s1,r1,morphology,Volume (voxel counting),YEKZ,,100\ns1,r2,morphology,Volume (voxel counting),YEKZ,,101\n"
            + "s2,r1,morphology,Volume (voxel counting),YEKZ,,200\ns2,r2,morphology,Volume (voxel counting),YEKZ,,199\n"
            + "s3,r1,morphology,Volume (voxel counting),YEKZ,,300\ns3,r2,morphology,Volume (voxel counting),YEKZ,,302\n"
            + "s1,r1,glcm,Joint maximum,GYBY,IAZD,1\ns1,r2,glcm,Joint maximum,GYBY,IAZD,2\n"
            + "s2,r1,glcm,Joint maximum,GYBY,IAZD,2\ns2,r2,glcm,Joint maximum,GYBY,IAZD,1\n"
            + "s3,r1,glcm,Joint maximum,GYBY,IAZD,1\ns3,r2,glcm,Joint maximum,GYBY,IAZD,2\n");
        var (code, stdout, err) = Run("compare", "--baseline", P("visit-0"), "--followup", P("visit-1"),
            "--gland", P("visit-0", "masks", "gland.nii.gz"), "--lesion", P("visit-0", "masks", "lesion.nii.gz"),
            "--psa", "2022-03-14=4.0", "--psa", "2023-09-14=4.4", "--radiomics-robustness", P("retest.csv"), "--out", P("out"));
        Assert.True(code == 0, err + stdout);
        foreach (var f in new[] { "change.json", "measures.csv", "changes.csv", "report.html", "visit-1-t2w.png" })
            Assert.True(File.Exists(P("out", f)), f);
        var report = ChangeReportJson.Deserialize(File.ReadAllText(P("out", "change.json")));
        Assert.Equal(2, report.Visits.Count);
        Assert.Contains(report.Changes, c => c.Measure == "lesion.volume" && c.FromVisit == 0 && c.ToVisit == 1 && c.Ci95 is { Length: 2 });
        Assert.Contains("Caution", stdout);

        // radiomics.csv: IBSI voxel-counting volume (YEKZ, mm³) of the re-fitted lesion region against lesion.volume
        // (mL) of the same visit, two independent implementations over the same outline. lesion.volume adds the
        // partial-volume occupancy of the boundary band (docs/measures.md), which on 3 mm slices restores the thin
        // cap slices a binary outline misses (about 15-20 % of a small lesion): voxel counting must read 0.7-1.02 of it.
        var rows = File.ReadAllLines(P("out", "radiomics.csv"));
        Assert.Equal("visit,date,region,image,family,feature,ibsiCode,aggregationCode,value,robust", rows[0]);
        foreach (var v in report.Visits)
        {
            var row = rows.Single(r => r.StartsWith($"{v.Index},", StringComparison.Ordinal) && r.Contains(",lesion,t2w,") && r.Contains(",YEKZ,")).Split(',');
            double mm3 = double.Parse(row[^2], System.Globalization.CultureInfo.InvariantCulture);
            Assert.InRange(mm3 / (v.Values["lesion.volume"].Value!.Value * 1000), 0.70, 1.02);
            Assert.Equal("true", row[^1]);
        }
        Assert.All(rows.Skip(1).Where(r => r.Contains(",GYBY,")), r => Assert.EndsWith(",false", r));
        // Deltas only from the robust feature; every other feature dropped with its reason.
        var deltas = File.ReadAllLines(P("out", "radiomics-deltas-visit-1.csv")).Skip(1).ToList();
        Assert.NotEmpty(deltas);
        Assert.All(deltas, d => Assert.Contains(",YEKZ,", d));
        var decisions = File.ReadAllLines(P("out", "radiomics-robustness.csv"));
        Assert.Contains(decisions, d => d.Contains(",GYBY,IAZD,") && d.Contains(",false,ICC -2 < 0.75"));
        Assert.Contains(decisions, d => d.Contains(",NI2N,IAZD,") && d.EndsWith(",false,not in the test-retest table"));
        Assert.StartsWith("filtered: ICC(2,1) ≥ 0.75", report.Settings.Extra!["radiomics.robustness"]);

        var bad = Run("compare", "--baseline", P("visit-0"), "--followup", P("visit-1"), "--psa", "14/03/2022=4", "--out", P("out2"));
        Assert.Equal(CliHost.ExitUsage, bad.Code);
        Assert.Contains("YYYY-MM-DD", bad.Err);
        Assert.False(Directory.Exists(P("out2")));

        var icc = Run("compare", "--baseline", P("visit-0"), "--followup", P("visit-1"), "--radiomics-icc", "0.9", "--out", P("out3"));
        Assert.Equal(CliHost.ExitUsage, icc.Code);
        Assert.Contains("--radiomics-robustness", icc.Err);
        Assert.False(Directory.Exists(P("out3")));
    }
}
