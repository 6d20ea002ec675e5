using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Calibration;

/// <summary>Summary statistics of a replica histogram at bin centres (flows at the axis ends), for moment checks in replicas.</summary>
internal static class BinnedSummary
{
    public static FeatureSummary Of(Histogram h)
    {
        var axis = h.Axis;
        double w = 0, w2 = 0, m1 = 0;
        for (var c = 0; c < h.SumW.Length; c++)
        {
            w += h.SumW[c];
            w2 += h.SumW2[c];
            m1 += h.SumW[c] * Position(axis, c);
        }
        var mean = w > 0 ? m1 / w : double.NaN;
        double m2 = 0;
        for (var c = 0; c < h.SumW.Length; c++)
        {
            var d = Position(axis, c) - mean;
            m2 += h.SumW[c] * d * d;
        }
        return new FeatureSummary(h.Entries, w, w2, mean, w > 0 ? Math.Sqrt(m2 / w) : double.NaN, axis.Edges[0], axis.Edges[^1], 0);
    }

    private static double Position(Axis axis, int cell) =>
        cell == 0 ? axis.Edges[0] : cell == axis.Count + 1 ? axis.Edges[^1] : axis.Centre(cell - 1);
}
