using System.Buffers.Binary;
using System.Net;
using System.Net.Sockets;
using Serimetry.Engine.Io.Dicom;
using Serimetry.Engine.Phantoms;
using Serimetry.Tests.Shared;

namespace Serimetry.Api.Tests;

/// <summary>
/// dcmtk command-line tools (Debian's dcmtk, installed by scripts/test.sh) run as real DICOM peers, and a small DICOM
/// phantom (engine phantom generator, two visits) made once per test run.
/// </summary>
internal static class DicomTools
{
    public const string PatientId = "PHI-DIMSE-58Q2";

    /// <summary>Runs a tool; returns its exit code and combined output.</summary>
    public static (int Exit, string Output) Run(string tool, params string[] args)
    {
        var (exit, stdout, stderr) = ToolProcess.Run(tool, args);
        return (exit, stdout + stderr);
    }

    /// <summary>Runs a tool and asserts exit code 0.</summary>
    public static string Ok(string tool, params string[] args)
    {
        var (exit, output) = Run(tool, args);
        Assert.True(exit == 0, $"{tool} {string.Join(' ', args)} exited {exit}:\n{output}");
        return output;
    }

    /// <summary>An element value as dcmtk's dcmdump prints it (the text between the brackets; UIDs as numbers, -Un).</summary>
    public static string Dcmdump(string file, string tag)
    {
        string line = Ok("dcmdump", "-q", "+P", tag, "-Un", file).Trim();
        int a = line.IndexOf('['), b = line.IndexOf(']');
        return a >= 0 && b > a ? line[(a + 1)..b] : "";
    }

    /// <summary>The bytes after the File Meta Information of a Part 10 file (PS3.10 7.1: group length at offset 140).</summary>
    public static byte[] DatasetBytes(string file)
    {
        var b = File.ReadAllBytes(file);
        int start = 144 + (int)BinaryPrimitives.ReadUInt32LittleEndian(b.AsSpan(140));
        return b[start..];
    }

    public static int FreePort()
    {
        using var l = new TcpListener(IPAddress.Loopback, 0);
        l.Start();
        return ((IPEndPoint)l.LocalEndpoint).Port;
    }

    private static readonly Lazy<string> Phantom = new(() =>
    {
        var spec = PhantomCache.TwoVisits(PatientId, seed: 23);
        return PhantomCache.Folder("dicom-phantom", spec, "spec.json", tmp => PhantomDicomWriter.Write(tmp, PhantomGenerator.Generate(spec)));
    });

    /// <summary>The DICOM folder of visit <paramref name="k"/> (t2w/, dwi/, adc/ series of MR Image Storage files).</summary>
    public static string VisitDicom(int k) => Path.Combine(Phantom.Value, $"visit-{k}", "dicom");

    public static string VisitMask(int k, string name) => Path.Combine(Phantom.Value, $"visit-{k}", "masks", name + ".nii.gz");

    public static string[] VisitFiles(int k) =>
        Directory.GetFiles(VisitDicom(k), "*.dcm", SearchOption.AllDirectories).Order(StringComparer.Ordinal).ToArray();

    /// <summary>SOP Instance UID of a file as the engine's reader gives it (used to find the stored copy by name).</summary>
    public static string SopInstanceUid(string file) => DicomFile.ReadHeader(file).Dataset.GetString(DicomTags.SOPInstanceUID);
}
