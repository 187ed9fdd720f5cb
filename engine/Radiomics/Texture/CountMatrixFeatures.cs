namespace Serimetry.Engine.Radiomics.Texture;

/// <summary>
/// The feature set shared by the GLRLM (IBSI 3.7), GLSZM (3.8), GLDZM (3.9) and NGLDM (3.11): a count
/// matrix M[i, j] with grey level i = 1..N_g (rows) and a second index j = 1..N_j (run length, zone size,
/// distance or dependence count). Values are written in the IBSI order: short/long j emphasis, low/high
/// grey-level emphasis, the four combinations, grey-level non-uniformity (plain, normalised), j
/// non-uniformity (plain, normalised), percentage N_s/N_v, grey-level variance, j variance, entropy, energy.
/// </summary>
internal static class CountMatrixFeatures
{
    public const int Count = 17;

    /// <summary>
    /// Computes the 17 values of a flat row-major matrix; all NaN when the matrix is empty. Column j stands for
    /// the value <paramref name="jValues"/>[j] when given (a compressed axis holding only occurring zone sizes), else j + 1.
    /// </summary>
    public static void Compute(ReadOnlySpan<double> m, int ng, int nj, double nv, Span<double> result, ReadOnlySpan<double> jValues = default)
    {
        bool mapped = !jValues.IsEmpty;
        double ns = 0;
        foreach (var c in m) ns += c;
        if (ns <= 0) { result[..Count].Fill(double.NaN); return; }
        double sj = 0, lj = 0, lg = 0, hg = 0, sjlg = 0, sjhg = 0, ljlg = 0, ljhg = 0, glnu = 0, mu = 0, entropy = 0, energy = 0;
        Span<double> colSum = nj <= 4096 ? stackalloc double[nj] : new double[nj];
        colSum.Clear();
        for (int i = 0; i < ng; i++)
        {
            double gi = i + 1, gi2 = gi * gi, row = 0;
            var r = m.Slice(i * nj, nj);
            for (int j = 0; j < nj; j++)
            {
                double c = r[j];
                if (c == 0) continue;
                double gj = mapped ? jValues[j] : j + 1, gj2 = gj * gj, p = c / ns;
                row += c;
                colSum[j] += c;
                sj += c / gj2; lj += c * gj2; lg += c / gi2; hg += c * gi2;
                sjlg += c / (gi2 * gj2); sjhg += c * gi2 / gj2; ljlg += c * gj2 / gi2; ljhg += c * gi2 * gj2;
                entropy -= p * Math.Log2(p);
                energy += p * p;
            }
            glnu += row * row;
            mu += gi * row / ns;
        }
        double jnu = 0, muJ = 0;
        for (int j = 0; j < nj; j++) { jnu += colSum[j] * colSum[j]; muJ += (mapped ? jValues[j] : j + 1) * colSum[j] / ns; }
        double varG = 0, varJ = 0;
        for (int i = 0; i < ng; i++)
        {
            var r = m.Slice(i * nj, nj);
            for (int j = 0; j < nj; j++)
            {
                double c = r[j];
                if (c == 0) continue;
                double p = c / ns;
                varG += (i + 1 - mu) * (i + 1 - mu) * p;
                double gj = mapped ? jValues[j] : j + 1;
                varJ += (gj - muJ) * (gj - muJ) * p;
            }
        }
        result[0] = sj / ns; result[1] = lj / ns; result[2] = lg / ns; result[3] = hg / ns;
        result[4] = sjlg / ns; result[5] = sjhg / ns; result[6] = ljlg / ns; result[7] = ljhg / ns;
        result[8] = glnu / ns; result[9] = glnu / (ns * ns); result[10] = jnu / ns; result[11] = jnu / (ns * ns);
        result[12] = ns / nv; result[13] = varG; result[14] = varJ; result[15] = entropy; result[16] = energy;
    }
}

/// <summary>The IBSI names and codes of a count-matrix family, in <see cref="CountMatrixFeatures"/> order.</summary>
internal sealed record CountMatrixFamily(string Family, (string Name, string Code)[] Features)
{
    public static readonly CountMatrixFamily Glrlm = new(FamilyNames.Glrlm,
    [
        ("Short runs emphasis", "22OV"), ("Long runs emphasis", "W4KF"), ("Low grey level run emphasis", "V3SW"),
        ("High grey level run emphasis", "G3QZ"), ("Short run low grey level emphasis", "HTZT"),
        ("Short run high grey level emphasis", "GD3A"), ("Long run low grey level emphasis", "IVPO"),
        ("Long run high grey level emphasis", "3KUM"), ("Grey level non-uniformity", "R5YN"),
        ("Normalised grey level non-uniformity", "OVBL"), ("Run length non-uniformity", "W92Y"),
        ("Normalised run length non-uniformity", "IC23"), ("Run percentage", "9ZK5"), ("Grey level variance", "8CE5"),
        ("Run length variance", "SXLW"), ("Run entropy", "HJ9O"),
    ]);

    public static readonly CountMatrixFamily Glszm = new(FamilyNames.Glszm,
    [
        ("Small zone emphasis", "5QRC"), ("Large zone emphasis", "48P8"), ("Low grey level zone emphasis", "XMSY"),
        ("High grey level zone emphasis", "5GN9"), ("Small zone low grey level emphasis", "5RAI"),
        ("Small zone high grey level emphasis", "HW1V"), ("Large zone low grey level emphasis", "YH51"),
        ("Large zone high grey level emphasis", "J17V"), ("Grey level non-uniformity", "JNSA"),
        ("Normalised grey level non-uniformity", "Y1RO"), ("Zone size non-uniformity", "4JP3"),
        ("Normalised zone size non-uniformity", "VB3A"), ("Zone percentage", "P30P"), ("Grey level variance", "BYLV"),
        ("Zone size variance", "3NSA"), ("Zone size entropy", "GU8N"),
    ]);

    public static readonly CountMatrixFamily Gldzm = new(FamilyNames.Gldzm,
    [
        ("Small distance emphasis", "0GBI"), ("Large distance emphasis", "MB4I"), ("Low grey level zone emphasis", "S1RA"),
        ("High grey level zone emphasis", "K26C"), ("Small distance low grey level emphasis", "RUVG"),
        ("Small distance high grey level emphasis", "DKNJ"), ("Large distance low grey level emphasis", "A7WM"),
        ("Large distance high grey level emphasis", "KLTH"), ("Grey level non-uniformity", "VFT7"),
        ("Normalised grey level non-uniformity", "7HP3"), ("Zone distance non-uniformity", "V294"),
        ("Normalised zone distance non-uniformity", "IATH"), ("Zone percentage", "VIWW"), ("Grey level variance", "QK93"),
        ("Zone distance variance", "7WT1"), ("Zone distance entropy", "GBDU"),
    ]);

    public static readonly CountMatrixFamily Ngldm = new(FamilyNames.Ngldm,
    [
        ("Low dependence emphasis", "SODN"), ("High dependence emphasis", "IMOQ"), ("Low grey level count emphasis", "TL9H"),
        ("High grey level count emphasis", "OAE7"), ("Low dependence low grey level emphasis", "EQ3F"),
        ("Low dependence high grey level emphasis", "JA6D"), ("High dependence low grey level emphasis", "NBZI"),
        ("High dependence high grey level emphasis", "9QMG"), ("Grey level non-uniformity", "FP8K"),
        ("Normalised grey level non-uniformity", "5SPA"), ("Dependence count non-uniformity", "Z87G"),
        ("Normalised dependence count non-uniformity", "OKJI"), ("Dependence count percentage", "6XV8"),
        ("Grey level variance", "1PFV"), ("Dependence count variance", "DNX2"), ("Dependence count entropy", "FCBV"),
        ("Dependence count energy", "CAS9"),
    ]);

    public void Emit(FeatureSink sink, string aggregation, ReadOnlySpan<double> values)
    {
        for (int f = 0; f < Features.Length; f++)
            sink.Add(Family, Features[f].Name, Features[f].Code, aggregation, values[f]);
    }
}
