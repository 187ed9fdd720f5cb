using Serimetry.Engine.Core;
using Serimetry.Engine.Radiomics.Preparation;

namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>Runs the texture families with their IBSI aggregation methods and emits named features.</summary>
internal static class TextureFamilies
{
    public static void Run(RoiData roi, RadiomicsSettings settings, FeatureSink sink)
    {
        var t = settings.Texture;
        var dims = t.Dimensions;
        var families = settings.Families;
        if (t.GlcmDistance < 1 || t.GlcmDistance > 10)
            throw new InvalidParameterException($"GLCM distance {t.GlcmDistance} must be 1..10", "texture.glcmDistance");
        if (families.Contains(FeatureFamily.Glcm))
            TextureAggregation.RunDirectional(roi, new Glcm(roi), dims, t.GlcmDistance,
                (agg, v) => EmitNamed(sink, FamilyNames.Glcm, Glcm.Names, agg, v));
        if (families.Contains(FeatureFamily.Glrlm))
            TextureAggregation.RunDirectional(roi, new Glrlm(roi), dims, 1,
                (agg, v) => CountMatrixFamily.Glrlm.Emit(sink, agg, v));
        if (families.Contains(FeatureFamily.Glszm) || families.Contains(FeatureFamily.Gldzm))
        {
            var zones = new Zones(roi);
            if (families.Contains(FeatureFamily.Glszm))
                TextureAggregation.RunRegion(roi, new ZoneMatrix(roi, zones, byDistance: false), dims,
                    (agg, v) => CountMatrixFamily.Glszm.Emit(sink, agg, v));
            if (families.Contains(FeatureFamily.Gldzm))
                TextureAggregation.RunRegion(roi, new ZoneMatrix(roi, zones, byDistance: true), dims,
                    (agg, v) => CountMatrixFamily.Gldzm.Emit(sink, agg, v));
        }
        if (families.Contains(FeatureFamily.Ngtdm))
            TextureAggregation.RunRegion(roi, new Ngtdm(roi, t.NeighbourhoodDistance), dims,
                (agg, v) => EmitNamed(sink, FamilyNames.Ngtdm, Ngtdm.Names, agg, v));
        if (families.Contains(FeatureFamily.Ngldm))
            TextureAggregation.RunRegion(roi, new Ngldm(roi, t.NeighbourhoodDistance, t.NgldmCoarseness), dims,
                (agg, v) => CountMatrixFamily.Ngldm.Emit(sink, agg, v));
    }

    private static void EmitNamed(FeatureSink sink, string family, (string Name, string Code)[] names, string agg, ReadOnlySpan<double> v)
    {
        for (int f = 0; f < names.Length; f++) sink.Add(family, names[f].Name, names[f].Code, agg, v[f]);
    }
}
