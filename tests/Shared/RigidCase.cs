using Serimetry.Engine.Core;

namespace Serimetry.Tests.Shared;

/// <summary>
/// The seeded rigid accuracy case (synthetic truth): a T2-weighted pelvis and a copy moved by a known random rigid
/// motion, each with its own noise and its own smooth multiplicative bias field, and the gland mask of the fixed image.
/// </summary>
public sealed record RigidCase(Geometry Grid, AffineTransform Truth, Volume<float> Fixed, Volume<float> Moving, Volume<byte> GlandMask)
{
    public static RigidCase Make(int seed)
    {
        var grid = RegistrationPhantom.T2Grid();
        var truth = RegistrationPhantom.RandomRigid(seed);
        return new RigidCase(grid, truth,
            RegistrationPhantom.Render(grid, AffineTransform.Identity, PhantomContrast.T2w, 0.03, seed, bias: 0.15),
            RegistrationPhantom.Render(grid, truth, PhantomContrast.T2w, 0.03, seed + 5000, bias: 0.15),
            RegistrationPhantom.GlandMask(grid));
    }

    /// <summary>Mean gland TRE (mm) of an estimate against <see cref="Truth"/>.</summary>
    public double GlandTre(ISpatialTransform estimate) => RegistrationPhantom.GlandTre(Grid, estimate, Truth);
}
