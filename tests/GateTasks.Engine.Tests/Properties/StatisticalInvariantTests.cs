using FsCheck;
using FsCheck.Fluent;
using FsCheck.Xunit;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.Properties;

/// <summary>
/// Invariants the statistics must keep for any input FsCheck 3.6 draws (fixed replay seed, 200 cases each, so CI
/// runs the same cases every time): the definitions they follow from are cited per property. Values are kept
/// finite and moderate where a property is about arithmetic, not about overflow.
/// </summary>
public class StatisticalInvariantTests
{
    private const string Seed = "(20261202,13)";
    private static readonly Axis Binning = new VariableAxis([-3, -1, -0.5, 0, 0.25, 1, 2.5]);

    private static double[] Finite(double[] xs) => xs.Where(double.IsFinite).Select(x => Math.Clamp(x, -1e6, 1e6)).ToArray();

    private static double[] Cells(Histogram h) => [.. h.SumW.ToArray(), h.NanEntries];

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Filling_is_invariant_under_permutation(double[] values, int seed)
    {
        // A histogram counts values into cells: the order they come in cannot matter (unit weights, exact counts).
        var shuffled = values.ToArray();
        new Random(seed).Shuffle(shuffled);
        var a = new Histogram(Binning);
        var b = new Histogram(Binning);
        a.Fill(values, []);
        b.Fill(shuffled, []);
        return Cells(a).SequenceEqual(Cells(b));
    }

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Adding_histograms_is_commutative_and_splitting_a_fill_changes_nothing(double[] values, NonNegativeInt cut)
    {
        var at = values.Length == 0 ? 0 : cut.Get % (values.Length + 1);
        var whole = new Histogram(Binning);
        whole.Fill(values, []);
        Histogram Part(int from, int to) { var h = new Histogram(Binning); h.Fill(values.AsSpan(from, to - from), []); return h; }
        var ab = Part(0, at);
        ab.Add(Part(at, values.Length));
        var ba = Part(at, values.Length);
        ba.Add(Part(0, at));
        return Cells(whole).SequenceEqual(Cells(ab)) && Cells(ab).SequenceEqual(Cells(ba));
    }

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Exact_merging_of_weighted_shards_is_associative_and_commutative(double[] values, double[] weights)
    {
        // Shewchuk (1997) exact sums: the merged cells cannot depend on how shards are grouped or ordered.
        var x = Finite(values);
        var w = Finite(weights).Concat(Enumerable.Repeat(0.3, x.Length)).Take(x.Length).ToArray();
        var third = x.Length / 3;
        ExactHistogram Shard(int from, int to)
        {
            var h = new Histogram(Binning);
            h.Fill(x.AsSpan(from, to - from), w.AsSpan(from, to - from));
            var e = new ExactHistogram(Binning);
            e.Absorb(h);
            return e;
        }
        var left = Shard(0, third);
        left.Add(Shard(third, 2 * third));
        left.Add(Shard(2 * third, x.Length));
        var right = Shard(2 * third, x.Length);
        var middle = Shard(third, 2 * third);
        middle.Add(Shard(0, third));
        right.Add(middle);
        var (l, r) = (left.ToHistogram(), right.ToHistogram());
        return l.SumW.ToArray().SequenceEqual(r.SumW.ToArray())
               && l.SumW2.ToArray().SequenceEqual(r.SumW2.ToArray());
    }

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Scaling_weights_by_a_power_of_two_scales_sum_w_exactly(double[] values, int power)
    {
        // Multiplying by 2^k is exact in binary floating point (IEEE 754), so Σw scales by 2^k and Σw² by 4^k exactly.
        var x = Finite(values);
        var factor = Math.Pow(2, power % 8);
        var w = x.Select((_, i) => 0.25 + (i % 7) * 0.5).ToArray();
        var plain = new Histogram(Binning);
        var scaled = new Histogram(Binning);
        plain.Fill(x, w);
        scaled.Fill(x, w.Select(v => v * factor).ToArray());
        return plain.SumW.ToArray().Select(v => v * factor).SequenceEqual(scaled.SumW.ToArray())
               && plain.SumW2.ToArray().Select(v => v * factor * factor).SequenceEqual(scaled.SumW2.ToArray());
    }

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Two_sample_KS_is_symmetric_and_bounded(PositiveInt[] a, PositiveInt[] b)
    {
        // D = sup|F_m − G_n| (Kolmogorov 1933; Smirnov 1939), here over the bin boundaries of two histograms with the
        // same bins: symmetric in the samples, within [0, 1], 0 on itself.
        var n = Math.Min(a.Length, b.Length);
        if (n == 0) return true;
        var p = a.Take(n).Select(v => (double)v.Get).ToArray();
        var q = b.Take(n).Select(v => (double)v.Get).ToArray();
        var xy = KolmogorovSmirnov.BinnedDistance(p, q);
        var yx = KolmogorovSmirnov.BinnedDistance(q, p);
        var self = KolmogorovSmirnov.BinnedDistance(p, p);
        var pValue = KolmogorovSmirnov.BinnedPValue(xy, p.Sum(), q.Sum());
        return xy == yx && xy is >= 0 and <= 1 && pValue is >= 0 and <= 1 && self == 0;
    }

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Jensen_Shannon_distance_is_symmetric_bounded_and_zero_on_itself(PositiveInt[] a, PositiveInt[] b)
    {
        // JSD (Lin 1991) is symmetric and at most ln 2 (natural log); its square root is a metric.
        var n = Math.Min(a.Length, b.Length);
        if (n == 0) return true;
        var p = a.Take(n).Select(v => (double)v.Get).ToArray();
        var q = b.Take(n).Select(v => (double)v.Get).ToArray();
        var pq = JensenShannon.Divergence(p, q);
        var qp = JensenShannon.Divergence(q, p);
        return Math.Abs(pq - qp) <= 1e-12 && pq >= -1e-15 && pq <= Math.Log(2) + 1e-12 && Math.Abs(JensenShannon.Divergence(p, p)) <= 1e-12;
    }

    [Property(Replay = Seed, MaxTest = 200)]
    public bool Moments_do_not_depend_on_how_a_sample_is_cut_into_batches(double[] values, NonNegativeInt cut)
    {
        // Chan, Golub & LeVeque (1979): batch moments merged equal the moments of the whole, to rounding.
        var x = Finite(values);
        var at = x.Length == 0 ? 0 : cut.Get % (x.Length + 1);
        var whole = new FeatureStatistics();
        whole.Add(x, []);
        var parts = new FeatureStatistics();
        parts.Add(x.AsSpan(0, at), []);
        parts.Add(x.AsSpan(at), []);
        var (a, b) = (whole.Summary(), parts.Summary());
        if (a.Count == 0) return b.Count == 0;
        var scale = 1 + Math.Abs(a.Mean) + a.StandardDeviation;
        return a.Count == b.Count && Math.Abs(a.Mean - b.Mean) <= 1e-9 * scale
               && Math.Abs(a.StandardDeviation - b.StandardDeviation) <= 1e-9 * scale && a.Min == b.Min && a.Max == b.Max;
    }
}
