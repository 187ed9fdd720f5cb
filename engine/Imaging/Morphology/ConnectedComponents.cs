using Serimetry.Engine.Core;

namespace Serimetry.Engine.Imaging.Morphology;

/// <summary>6-connected component labelling by iterative flood fill (explicit stack, no recursion).</summary>
public static class ConnectedComponents
{
    /// <summary>Labels non-zero voxels 1..n; <paramref name="sizes"/>[l] is the voxel count of label l (index 0 unused).</summary>
    public static int[] Label(Volume<byte> mask, out long[] sizes)
    {
        var s = mask.Size;
        var labels = new int[mask.Voxels.Length];
        var sizeList = new List<long> { 0 };
        var stack = new Stack<int>();
        int sx = s.X, sxy = s.X * s.Y;
        for (int start = 0; start < labels.Length; start++)
        {
            if (mask.Voxels[start] == 0 || labels[start] != 0) continue;
            int label = sizeList.Count;
            long count = 0;
            labels[start] = label;
            stack.Push(start);
            while (stack.Count > 0)
            {
                int n = stack.Pop();
                count++;
                int i = n % sx, j = n / sx % s.Y, k = n / sxy;
                if (i > 0) Visit(n - 1);
                if (i < s.X - 1) Visit(n + 1);
                if (j > 0) Visit(n - sx);
                if (j < s.Y - 1) Visit(n + sx);
                if (k > 0) Visit(n - sxy);
                if (k < s.Z - 1) Visit(n + sxy);
            }
            sizeList.Add(count);

            void Visit(int m)
            {
                if (mask.Voxels[m] != 0 && labels[m] == 0)
                {
                    labels[m] = label;
                    stack.Push(m);
                }
            }
        }
        sizes = [.. sizeList];
        return labels;
    }
}
