using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// What the 2-D map of a declared pair shows, on the pair's map grid (<see cref="PairGrid"/>): per regular cell the
/// reference's and the surrogate's share of the pair's weight as a density (divided by the cell's area; a discrete
/// axis counts each value's bin as width 1), and the pull of the surrogate's share against the reference's, with the
/// flows' shares said apart. Cells gathered on the features' own axes (for a χ² test) are added into the map grid first.
/// </summary>
internal sealed record PairMap(
    CorrelationSpec Spec,
    double[] XEdges,
    double[] YEdges,
    double[,] Reference,
    double[,] Surrogate,
    double[,] Pull,
    double ReferenceOutside,
    double SurrogateOutside)
{
    /// <summary>The map of <paramref name="spec"/> in <paramref name="report"/>, or null when either side holds no 2-D cells for it.</summary>
    public static PairMap? Of(RunResult report, CorrelationSpec spec)
    {
        var stored = report.Reference.FindPair(spec.First, spec.Second);
        var sample = report.Pairs.FirstOrDefault(p => p.Spec.First == spec.First && p.Spec.Second == spec.Second);
        var first = report.Reference.Find(spec.First);
        var second = report.Reference.Find(spec.Second);
        if (stored?.Cells2DSumW is not { } rw || stored.Cells2DSumW2 is not { } rw2 || sample?.Cells is not { } cells || first is null || second is null)
            return null;
        return From(spec, first.Histogram.Axis, second.Histogram.Axis, first.Kind == FeatureKind.Discrete, second.Kind == FeatureKind.Discrete,
            new CellSums(rw, rw2), cells);
    }

    /// <summary>
    /// The map from both sides' cells, each either on the features' axes <paramref name="x"/> × <paramref name="y"/> or
    /// already on the map grid; null when a side has neither layout.
    /// </summary>
    public static PairMap? From(CorrelationSpec spec, Axis x, Axis y, bool xDiscrete, bool yDiscrete, CellSums reference, CellSums surrogate)
    {
        var mapX = PairGrid.MapAxis(x);
        var mapY = PairGrid.MapAxis(y);
        var mapCells = (mapX.Count + 2) * (mapY.Count + 2);
        double[]? OnMap(double[] cells) => cells.Length == mapCells ? cells : PairGrid.Coarsen(cells, x, y);
        if (OnMap(reference.SumW) is not { } rw || OnMap(reference.SumW2) is not { } rw2 || OnMap(surrogate.SumW) is not { } sw || OnMap(surrogate.SumW2) is not { } sw2)
            return null;
        var (nx, ny) = (mapX.Count, mapY.Count);
        var rTotal = rw.Sum();
        var sTotal = sw.Sum();
        var (refMap, surMap, pull) = (new double[nx, ny], new double[nx, ny], new double[nx, ny]);
        double rInside = 0, sInside = 0;
        for (var i = 0; i < nx; i++)
            for (var j = 0; j < ny; j++)
            {
                var c = (i + 1) * (ny + 2) + (j + 1);
                var area = (xDiscrete ? 1 : mapX.Upper(i) - mapX.Lower(i)) * (yDiscrete ? 1 : mapY.Upper(j) - mapY.Lower(j));
                refMap[i, j] = rTotal > 0 ? rw[c] / rTotal / area : double.NaN;
                surMap[i, j] = sTotal > 0 ? sw[c] / sTotal / area : double.NaN;
                pull[i, j] = CellPull(sw[c], sw2[c], sTotal, rw[c], rw2[c], rTotal);
                rInside += rw[c];
                sInside += sw[c];
            }
        return new PairMap(spec, mapX.Edges.ToArray(), mapY.Edges.ToArray(), refMap, surMap, pull,
            rTotal > 0 ? 1 - rInside / rTotal : double.NaN, sTotal > 0 ? 1 - sInside / sTotal : double.NaN);
    }

    /// <summary>
    /// The pull of one cell: the difference of the surrogate's and the reference's shares over its standard deviation,
    /// (s/S − r/R) / √(Σw²ₛ/S² + Σw²ᵣ/R²), the two samples independent and each cell's variance its Σw² (the variance
    /// of a sum of weighted Poisson events; Gagunashvili 2010, NIM A 614, 287); a pull as Demortier &amp; Lyons (2002,
    /// CDF note 5776) define it. The totals' own fluctuation is neglected, as for the 1-D plots' error bars. NaN when
    /// neither side has weight in the cell.
    /// </summary>
    public static double CellPull(double s, double s2, double sTotal, double r, double r2, double rTotal)
    {
        if (!(sTotal > 0) || !(rTotal > 0)) return double.NaN;
        var variance = Math.Max(s2, 0) / (sTotal * sTotal) + Math.Max(r2, 0) / (rTotal * rTotal);
        return variance > 0 ? (s / sTotal - r / rTotal) / Math.Sqrt(variance) : double.NaN;
    }

    /// <summary>What stands in place of the map when the reference holds no 2-D cells for the pair.</summary>
    public static string MissingNote(CorrelationSpec spec) =>
        $"No 2-D map of {spec.Name}: the reference holds no 2-D cells for this pair (it was built before every declared pair kept them); rebuild it with 'gatetasks reference build' to see the map.";
}
