namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>A family whose matrices are built per direction (GLCM, GLRLM).</summary>
internal interface IDirectionalMatrix
{
    int Length { get; }
    int FeatureCount { get; }

    /// <summary>Adds the counts of direction (dx, dy, dz) to <paramref name="m"/>; slice −1 = whole volume.</summary>
    void Accumulate(int slice, int dx, int dy, int dz, double[] m);

    void Features(double[] m, Span<double> result);
}

/// <summary>A family with one matrix per slice or volume (GLSZM, GLDZM, NGTDM, NGLDM).</summary>
internal interface IRegionMatrix
{
    int Length { get; }
    int FeatureCount { get; }

    /// <summary>Adds the counts of one slice (or the volume when −1) to <paramref name="m"/>; returns the voxels counted.</summary>
    double Accumulate(int slice, double[] m);

    void Features(double[] m, double voxelCount, Span<double> result);
}
