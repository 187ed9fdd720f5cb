namespace Serimetry.Engine.Io.Dicom.Codecs;

/// <summary>One component of a lossless scan: its plane in the sample buffer and its DC Huffman table.</summary>
internal readonly record struct JpegScanComponent(int Plane, JpegHuffmanTable Table);

/// <summary>
/// Decodes the entropy-coded data of one lossless scan (ITU-T T.81 Annex H) into per-component sample planes:
/// Huffman-coded differences (H.1.2.2, with SSSS = 16 meaning 32768 and no extra bits), the seven predictors
/// of Table H.1, the start-of-line and start-of-restart-interval rules of H.1.2.1, reconstruction modulo 2^16.
/// Components must have sampling factors 1x1 when interleaved, so one MCU holds one sample of each.
/// </summary>
internal static class JpegLosslessScan
{
    public static int Decode(ReadOnlySpan<byte> data, int start, ReadOnlySpan<JpegScanComponent> components, int[] planes,
        int width, int height, int precision, int predictor, int pointTransform, int restartInterval, string codec)
    {
        var reader = new JpegBitReader(data, start, codec);
        int planeSize = width * height;
        int initial = 1 << (precision - pointTransform - 1);
        int mcusUntilRestart = restartInterval;
        int restartIndex = 0;
        bool reset = true;          // next sample of each component gets the initial prediction
        for (int y = 0; y < height; y++)
        {
            bool firstLine = y == 0;
            for (int x = 0; x < width; x++)
            {
                if (restartInterval > 0)
                {
                    if (mcusUntilRestart == 0)
                    {
                        reader.ReadRestartMarker(restartIndex++);
                        mcusUntilRestart = restartInterval;
                        reset = true;
                    }
                    mcusUntilRestart--;
                }
                if (reset) firstLine = true;
                for (int c = 0; c < components.Length; c++)
                {
                    int rowStart = components[c].Plane * planeSize + y * width;
                    int prediction = reset ? initial : Predict(planes, rowStart, x, width, firstLine, predictor);
                    int difference = DecodeDifference(ref reader, components[c].Table, codec);
                    planes[rowStart + x] = (prediction + difference) & 0xFFFF;
                }
                reset = false;
            }
        }
        return reader.FindNextMarker();
    }

    private static int Predict(int[] planes, int rowStart, int x, int width, bool firstLine, int predictor)
    {
        if (firstLine) return planes[rowStart + x - 1];
        int above = rowStart - width + x;
        if (x == 0) return planes[above];
        int ra = planes[rowStart + x - 1], rb = planes[above], rc = planes[above - 1];
        return predictor switch
        {
            1 => ra,
            2 => rb,
            3 => rc,
            4 => ra + rb - rc,
            5 => ra + ((rb - rc) >> 1),
            6 => rb + ((ra - rc) >> 1),
            _ => (ra + rb) >> 1,
        };
    }

    /// <summary>One Huffman-coded difference: category SSSS then SSSS extra bits (T.81 F.2.2.1 EXTEND), read from one window.</summary>
    private static int DecodeDifference(ref JpegBitReader reader, JpegHuffmanTable table, string codec)
    {
        uint window = reader.Peek32();
        int category = table.Match((int)(window >> 16), out int length, codec, reader.Position);
        if (category == 0 || category == 16)
        {
            reader.Skip(length);
            return category == 0 ? 0 : 32768;
        }
        if (category > 16)
            throw CodecErrors.Malformed(codec, $"difference category SSSS = {category} (lossless allows 0..16)", reader.Position);
        int bits = (int)((window << length) >> (32 - category));
        reader.Skip(length + category);
        return bits < 1 << (category - 1) ? bits - (1 << category) + 1 : bits;
    }
}
