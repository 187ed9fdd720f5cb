using Serimetry.Engine.Core;
using Serimetry.Engine.Measures;
using Serimetry.Engine.Repeatability;
using Xunit;

namespace Serimetry.Tests.Measures;

/// <summary>Empty and missing inputs, failing plugins, the registry and plugin loading.</summary>
public class BadInputAndRegistryTests
{
    private static readonly Geometry G = Geometry.Axial(new Size3(10, 10, 4), new Vec3(1, 1, 3), Vec3.Zero);

    [Fact]
    public void EmptyOrMissingInputsAreNotApplicableWithAReason()
    {
        var empty = new VisitContext(0, new DateOnly(2024, 1, 1), new Volume<float>(G))
        {
            LesionMask = new Volume<byte>(G),
            GlandMask = new Volume<byte>(G),
            Adc = new Volume<float>(G),
        };
        var registry = MeasureRegistry.CreateDefault();
        var values = MeasureRunner.Run(registry.All, empty);
        foreach (var (id, v) in values)
        {
            Assert.Equal(MeasureStatus.NotApplicable, v.Status);
            Assert.Null(v.Value);
            Assert.False(string.IsNullOrWhiteSpace(v.Reason), id);
        }
        Assert.Contains("empty", values["lesion.volume"].Reason);
        Assert.Contains("PSA", values["psa.density"].Reason);
        var noAdc = new VisitContext(0, new DateOnly(2024, 1, 1), new Volume<float>(G)) { LesionMask = Ones() };
        Assert.Contains("no ADC", MeasureRunner.RunOne(registry.Find("lesion.adc.median")!, noAdc).Reason);
    }

    [Fact]
    public void AllNaNAdcInLesionIsNotApplicable()
    {
        var adc = new Volume<float>(G);
        Array.Fill(adc.Voxels, float.NaN);
        var ctx = new VisitContext(0, new DateOnly(2024, 1, 1), new Volume<float>(G)) { LesionMask = Ones(), Adc = adc };
        var v = MeasureRunner.RunOne(MeasureRegistry.CreateDefault().Find("lesion.adc.mean")!, ctx);
        Assert.Equal(MeasureStatus.NotApplicable, v.Status);
        Assert.Contains("no finite ADC", v.Reason);
    }

    [Fact]
    public void AThrowingMeasureBecomesFailed()
    {
        var v = MeasureRunner.RunOne(new ThrowingMeasure(), new VisitContext(0, new DateOnly(2024, 1, 1), new Volume<float>(G)));
        Assert.Equal(MeasureStatus.Failed, v.Status);
        Assert.Contains("boom", v.Reason);
    }

    [Fact]
    public void BuiltInIdsAreTheDocumentedOnes()
    {
        // Src: issue 5 lists these ids as the stable minimum; docs/measures.md lists the rest.
        var ids = MeasureRegistry.CreateDefault().All.Select(m => m.Id).ToHashSet();
        foreach (var id in new[] { "lesion.volume", "gland.volume", "lesion.diameter.max", "lesion.volume.ellipsoid", "gland.volume.ellipsoid",
                     "lesion.adc.mean", "lesion.adc.median", "lesion.adc.p10", "lesion.adc.p25", "lesion.adc.sd", "lesion.adc.skewness",
                     "lesion.adc.kurtosis", "lesion.conspicuity.t2w", "lesion.conspicuity.adc", "lesion.conspicuity.t2w.cnr",
                     "lesion.conspicuity.adc.cnr", "psa.density", "lesion.diameter.ap", "lesion.diameter.lr", "lesion.diameter.cc" })
            Assert.Contains(id, ids);
        Assert.Equal(20, ids.Count);
    }

    [Fact]
    public void DuplicateAndMalformedIdsAreRefused()
    {
        var r = MeasureRegistry.CreateDefault();
        var dup = Assert.Throws<InvalidParameterException>(() => r.Register(new ThrowingMeasure("lesion.volume")));
        Assert.Contains("already registered", dup.Message);
        Assert.Throws<InvalidParameterException>(() => r.Register(new ThrowingMeasure("Lesion Volume")));
    }

    [Fact]
    public void PluginsLoadFromAFolderAndBadAssembliesAreReported()
    {
        var dir = Directory.CreateTempSubdirectory("serimetry-plugins-");
        try
        {
            // The test assembly itself carries one public parameterless measure (TestPluginMeasure).
            File.Copy(typeof(TestPluginMeasure).Assembly.Location, Path.Combine(dir.FullName, "TestPlugin.dll"));
            var r = MeasureRegistry.CreateDefault();
            var added = r.LoadPlugins(dir.FullName);
            Assert.Equal(["test.plugin.voxels"], added);
            var ctx = new VisitContext(0, new DateOnly(2024, 1, 1), new Volume<float>(G)) { LesionMask = Ones() };
            Assert.Equal(G.VoxelCount, MeasureRunner.RunOne(r.Find("test.plugin.voxels")!, ctx).Value);

            File.WriteAllBytes(Path.Combine(dir.FullName, "Broken.dll"), [1, 2, 3, 4]);
            var ex = Assert.Throws<InputFormatException>(() => MeasureRegistry.CreateDefault().LoadPlugins(dir.FullName));
            Assert.Equal("Broken.dll", ex.Where);
        }
        finally
        {
            dir.Delete(true);
        }
        Assert.Throws<InvalidParameterException>(() => MeasureRegistry.CreateDefault().LoadPlugins(Path.Combine(dir.FullName, "missing")));
    }

    private static Volume<byte> Ones()
    {
        var m = new Volume<byte>(G);
        Array.Fill(m.Voxels, (byte)1);
        return m;
    }

    private sealed class ThrowingMeasure(string id = "test.throws") : IMeasure
    {
        public string Id => id;
        public string Unit => "1";
        public string Description => "throws";
        public MeasureInputs Inputs => MeasureInputs.None;
        public ErrorScale ErrorScale => ErrorScale.Absolute;
        public MeasureValue Measure(VisitContext context) => throw new InvalidOperationException("boom");
    }
}

/// <summary>The one public measure of the test assembly, found by <see cref="MeasureRegistry.LoadPlugins"/>.</summary>
public sealed class TestPluginMeasure : IMeasure
{
    public string Id => "test.plugin.voxels";
    public string Unit => "1";
    public string Description => "Number of lesion-mask voxels (test plugin).";
    public MeasureInputs Inputs => MeasureInputs.LesionMask;
    public ErrorScale ErrorScale => ErrorScale.Absolute;
    public MeasureValue Measure(VisitContext context) =>
        context.LesionMask is null ? MeasureValue.NotApplicable(this, "no lesion mask") : MeasureValue.Ok(this, context.LesionMask.Voxels.Count(v => v != 0));
}
