using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// The 2-D cells every declared pair gathers, in the reference and in the sample: on the two features' own axes when
/// the pair's χ² test is asked for (the test needs them), else on the map grid — each axis coarsened to at most
/// <see cref="MapBins"/> bins by keeping every k-th edge (first and last kept), so at most (12 + 2)² = 196 cells with
/// the flows, whatever the features' binnings. Because the map grid's edges are a subset of the feature's, cells on the
/// features' axes add up exactly into map cells (<see cref="Coarsen"/>).
/// </summary>
internal static class PairGrid
{
    /// <summary>Most regular bins per axis of a pair map.</summary>
    public const int MapBins = 12;

    /// <summary>The per-batch 2-D histogram of <paramref name="spec"/> on its grid.</summary>
    public static Histogram2D For(CorrelationSpec spec, Axis first, Axis second) =>
        spec.Chi2 is not null ? new Histogram2D(first, second) : new Histogram2D(MapAxis(first), MapAxis(second));

    /// <summary>Every k-th edge of <paramref name="axis"/>, k = ⌈n / <see cref="MapBins"/>⌉, its last edge always kept.</summary>
    public static Axis MapAxis(Axis axis)
    {
        var step = Step(axis.Count);
        if (step == 1) return axis;
        var edges = axis.Edges;
        var kept = new List<double>();
        for (var i = 0; i < axis.Count; i += step) kept.Add(edges[i]);
        kept.Add(edges[^1]);
        return new VariableAxis(kept);
    }

    /// <summary>
    /// For each storage cell of <paramref name="axis"/> (0 the underflow, n + 1 the overflow), its storage cell on
    /// <see cref="MapAxis"/>: the flows stay flows, regular bin b goes to map bin ⌊b / k⌋.
    /// </summary>
    public static int[] MapCellOf(Axis axis)
    {
        var step = Step(axis.Count);
        var mapCount = (axis.Count + step - 1) / step;
        var map = new int[axis.Count + 2];
        map[0] = 0;
        for (var b = 0; b < axis.Count; b++) map[b + 1] = b / step + 1;
        map[^1] = mapCount + 1;
        return map;
    }

    /// <summary>
    /// Cells on the axes <paramref name="first"/> × <paramref name="second"/> (row-major by the first, flows included)
    /// added into the map grid's cells; null when their count is not that of these axes.
    /// </summary>
    public static double[]? Coarsen(double[] cells, Axis first, Axis second)
    {
        var (nx, ny) = (first.Count + 2, second.Count + 2);
        if (cells.Length != nx * ny) return null;
        var mx = MapCellOf(first);
        var my = MapCellOf(second);
        var mapNy = my[^1] + 1;
        var result = new double[(mx[^1] + 1) * mapNy];
        for (var i = 0; i < nx; i++)
            for (var j = 0; j < ny; j++)
                result[mx[i] * mapNy + my[j]] += cells[i * ny + j];
        return result;
    }

    /// <summary>
    /// For each storage cell of <paramref name="fine"/>, its storage cell on <paramref name="coarse"/>, when every edge
    /// of the coarse axis is one of the fine axis's and the two share their first and last edges (then each fine cell
    /// lies in one coarse cell, flows in flows); null otherwise.
    /// </summary>
    public static int[]? CellMap(Axis fine, Axis coarse)
    {
        var f = fine.Edges;
        var c = coarse.Edges;
        if (f[0] != c[0] || f[^1] != c[^1]) return null;
        var map = new int[f.Length + 1];
        map[^1] = c.Length;
        var k = 0;
        for (var b = 0; b < f.Length - 1; b++)
        {
            if (f[b] == c[k]) k++;
            else if (f[b] > c[k]) return null; // a coarse edge between two fine ones
            map[b + 1] = k;
        }
        return k == c.Length - 1 ? map : null;
    }

    private static int Step(int count) => Math.Max(1, (count + MapBins - 1) / MapBins);
}
