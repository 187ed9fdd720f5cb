using FsCheck;
using FsCheck.Xunit;
using Serimetry.Engine.Core;
using Serimetry.Engine.Registration;
using Serimetry.Engine.Registration.Transforms;
using Xunit;

namespace Serimetry.Tests.Registration;

/// <summary>Transform algebra: inverse, Jacobian wrt parameters, angle convention.</summary>
public class TransformTests
{
    private static IParametricTransform Make(TransformKind kind, double[] p)
    {
        var t = TransformFactory.Create(kind, new Vec3(10, -20, 30), Vec3.Zero);
        var all = new double[t.ParameterCount];
        t.GetParameters(all);
        for (int i = 0; i < all.Length; i++) all[i] += p[i % p.Length];
        t.SetParameters(all);
        return t;
    }

    [Property(MaxTest = 100)]
    public void TransformThenInverseIsIdentity(NormalFloat a, NormalFloat b, NormalFloat c, NormalFloat x)
    {
        double[] p = [a.Get % 0.5, b.Get % 0.5, c.Get % 0.5, x.Get % 20, 3, -4];
        foreach (var kind in new[] { TransformKind.Rigid, TransformKind.Affine })
        {
            var t = Make(kind, kind == TransformKind.Affine ? p.Select(v => v * 0.1).ToArray() : p).ToAffine();
            var point = new Vec3(x.Get % 100, 17, -42);
            var back = t.Inverse().TransformPoint(t.TransformPoint(point));
            Assert.True((back - point).Norm < 1e-9, $"{kind}: {point} -> {back}");
        }
    }

    [Theory]
    [InlineData(TransformKind.Translation)]
    [InlineData(TransformKind.Rigid)]
    [InlineData(TransformKind.Affine)]
    public void ParameterJacobianMatchesFiniteDifferences(TransformKind kind)
    {
        var t = Make(kind, [0.1, -0.2, 0.15, 2, -3, 4]);
        int n = t.ParameterCount;
        var p0 = new double[n];
        t.GetParameters(p0);
        var x = new Vec3(37, -12, 55);
        var row = new double[n];
        foreach (var axis in new[] { new Vec3(1, 0, 0), new Vec3(0, 1, 0), new Vec3(0, 0, 1) })
        {
            t.SetParameters(p0);
            t.ProjectGradient(x, axis, row);
            for (int k = 0; k < n; k++)
            {
                const double h = 1e-6;
                var q = (double[])p0.Clone();
                q[k] += h; t.SetParameters(q);
                double up = axis.Dot(t.TransformPoint(x));
                q[k] -= 2 * h; t.SetParameters(q);
                double down = axis.Dot(t.TransformPoint(x));
                Assert.Equal((up - down) / (2 * h), row[k], 5);
            }
        }
    }

    [Fact]
    public void EulerAnglesFollowZxyOrder()
    {
        // Src: ITK Euler3DTransform (ComputeZYX off) and elastix EulerTransform use R = Rz·Rx·Ry.
        var r = EulerRigidTransform.RotationOf(0.3, 0.2, 0.1);
        double cx = Math.Cos(0.3), sx = Math.Sin(0.3), cy = Math.Cos(0.2), sy = Math.Sin(0.2), cz = Math.Cos(0.1), sz = Math.Sin(0.1);
        // First row of Rz·Rx·Ry expanded by hand.
        Assert.Equal(cz * cy - sz * sx * sy, r.M00, 12);
        Assert.Equal(-sz * cx, r.M01, 12);
        Assert.Equal(cz * sy + sz * sx * cy, r.M02, 12);
        Assert.True(r.IsOrthonormal(1e-12));
    }
}

/// <summary>Moments initialisation on an object fully in view (asymmetric ellipsoid: principal axes are defined).</summary>
public class MomentsInitializationTests
{
    [Fact]
    public void PrincipalAxesRecoverAKnownRotation()
    {
        var grid = Geometry.Axial(new Size3(64, 64, 64), new Vec3(1, 1, 1), new Vec3(-32, -32, -32));
        var truth = new AffineTransform(EulerRigidTransform.RotationOf(0.1, -0.15, 0.5), new Vec3(3, -2, 4));
        Volume<float> Render(AffineTransform t)
        {
            var inv = t.Inverse();
            var v = new Volume<float>(grid);
            for (int k = 0; k < 64; k++)
                for (int j = 0; j < 64; j++)
                    for (int i = 0; i < 64; i++)
                    {
                        var b = inv.TransformPoint(grid.IndexToPhysical(i, j, k));
                        double r = b.X * b.X / 400 + b.Y * b.Y / 144 + b.Z * b.Z / 49;
                        v[i, j, k] = r <= 1 ? 1 : 0;
                    }
            return v;
        }
        var start = TransformInitializer.Start(InitializationKind.Moments, Render(AffineTransform.Identity), Render(truth));
        Assert.True(start.Linear.MaxAbsDifference(truth.Linear) < 0.03, $"{start.Linear} vs {truth.Linear}");
        var p = new Vec3(5, 5, 5);
        Assert.True((start.TransformPoint(p) - truth.TransformPoint(p)).Norm < 0.5);
        var angles = TransformFactory.EulerAngles(truth.Linear);
        Assert.Equal(0.1, angles.X, 9);
        Assert.Equal(-0.15, angles.Y, 9);
        Assert.Equal(0.5, angles.Z, 9);
    }
}
