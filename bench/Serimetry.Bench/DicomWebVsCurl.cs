using System.Diagnostics;
using System.Globalization;
using Serimetry.Engine.Io.DicomWeb;
using Serimetry.Engine.Phantoms;
using Serimetry.Tests.Shared;

namespace Serimetry.Bench;

/// <summary>
/// <c>dicomweb-vs-curl</c>: fetch speed of our DICOMweb client against curl on the same server, in the same run.
/// Orthanc (Debian orthanc + orthanc-dicomweb) is started on loopback and given one phantom DICOM study at clinical
/// size (T2w 384x384x24, DWI/ADC 128x128x24); then, alternately, (a) <see cref="DicomWebStudyFetcher"/> (QIDO-RS, WADO-RS
/// per series, each part streamed, checked and renamed) and (b) curl retrieving the whole study as one multipart
/// body to a single file (no parsing, no checks). Reports the median of each and the ratio.
/// </summary>
internal static class DicomWebVsCurl
{
    public static int Run(string[] args)
    {
        int repeats = args.Length > 0 ? int.Parse(args[0], CultureInfo.InvariantCulture) : 5;
        var root = Directory.CreateTempSubdirectory("serimetry-bench-dicomweb-").FullName;
        try
        {
            using var orthanc = new OrthancServer();
            var spec = new PhantomSpec() with
            {
                Visits = 1,
                T2Grid = new PhantomGrid(384, 384, 24, 0.5, 0.5, 3.0),
                DwiGrid = new PhantomGrid(128, 128, 24, 1.5, 1.5, 3.0),
            };
            PhantomDicomWriter.Write(Path.Combine(root, "phantom"), PhantomGenerator.Generate(spec));
            var exam = Path.Combine(root, "phantom", "visit-0", "dicom");
            var files = Directory.GetFiles(exam, "*.dcm", SearchOption.AllDirectories);
            long bytes = files.Sum(f => new FileInfo(f).Length);
            using var client = new DicomWebClient(DicomWebOptions.Create(orthanc.DicomWebRoot, orthanc.Authorization));
            client.StoreAsync(files).GetAwaiter().GetResult();
            var study = client.SearchStudiesAsync().GetAwaiter().GetResult()[0].GetString(Engine.Io.Dicom.DicomTags.StudyInstanceUID)!;

            var ours = new List<double>();
            var curl = new List<double>();
            for (int i = 0; i < repeats; i++)
            {
                var dir = Path.Combine(root, $"fetch-{i}");
                var clock = Stopwatch.StartNew();
                DicomWebStudyFetcher.FetchAsync(client, study, dir).GetAwaiter().GetResult();
                ours.Add(clock.Elapsed.TotalSeconds);
                Directory.Delete(dir, recursive: true);

                var file = Path.Combine(root, $"curl-{i}.bin");
                clock.Restart();
                RunCurl(orthanc, study, file);
                curl.Add(clock.Elapsed.TotalSeconds);
                File.Delete(file);
            }
            double a = Median(ours), b = Median(curl);
            var inv = CultureInfo.InvariantCulture;
            Console.WriteLine(string.Create(inv, $"study: {files.Length} instances, {bytes / 1048576.0:0.0} MiB; {repeats} runs each, medians"));
            Console.WriteLine(string.Create(inv, $"serimetry fetch (QIDO + WADO per series, checked): {a:0.000} s ({bytes / 1048576.0 / a:0} MiB/s)"));
            Console.WriteLine(string.Create(inv, $"curl (one WADO study request, raw):                {b:0.000} s ({bytes / 1048576.0 / b:0} MiB/s)"));
            Console.WriteLine(string.Create(inv, $"ratio serimetry / curl: {a / b:0.00}"));
            return 0;
        }
        finally
        {
            Directory.Delete(root, recursive: true);
        }
    }

    private static void RunCurl(OrthancServer orthanc, string study, string file)
    {
        var psi = new ProcessStartInfo("curl") { UseShellExecute = false, RedirectStandardError = true };
        foreach (var a in new[] { "-sf", "-o", file, "-H", "Authorization: " + orthanc.Authorization,
                     "-H", "Accept: multipart/related; type=\"application/dicom\"; transfer-syntax=1.2.840.10008.1.2.1",
                     $"{orthanc.DicomWebRoot}/studies/{study}" })
            psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        p.StandardError.ReadToEnd();
        p.WaitForExit();
        if (p.ExitCode != 0) throw new InvalidOperationException($"curl exited with {p.ExitCode}");
    }

    private static double Median(List<double> v)
    {
        var s = v.Order().ToList();
        return s.Count % 2 == 1 ? s[s.Count / 2] : (s[s.Count / 2 - 1] + s[s.Count / 2]) / 2;
    }
}
