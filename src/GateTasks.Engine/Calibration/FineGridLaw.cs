using System.Collections.Concurrent;
using GateTasks.Engine.Accumulation;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// A feature's true law on the reference's fine equal-probability grid (<see cref="FineGridCells"/>), so the
/// simulation studies measure W1 on the grid a check uses rather than on the coarse bins: the probability of every fine
/// cell (flows included) and, for the mass in each flow, its mean distance beyond the outermost edge and mean squared
/// distance. The truth is the reference's fine grid; a <see cref="Drift"/> distorts it as
/// <see cref="DriftedDistribution"/> distorts the coarse cells. Drifted laws are cached per drift (replicas run in
/// parallel, so the cache is concurrent). The replicas use the reference's grid with its inner cells merged
/// <see cref="MergedCells"/> at a time (its outermost <see cref="KeptCells"/> cells at each end, the tails' finer
/// levels among them, kept as they are): each check in a replica bootstraps every cell hundreds of times, and a plan
/// measures thousands of replicas, so the full grid would cost tens of times the coarse bins' time. Merging 64 cells
/// (about 1.6% of the events each) planned a lognormal energy's W1 one size step (×1.19) above merging 8, at a sixth
/// of the time; both far below the coarse bins' plan, which overstated the size about 30 times.
/// </summary>
internal sealed class FineGridLaw
{
    private readonly FineGridCells _reference;
    private readonly double[] _coarseEdges;
    private readonly double[] _coarseTruth;
    private readonly Func<Drift, double[]> _coarse;
    private readonly Func<double> _mean;
    private readonly ConcurrentDictionary<Drift, Law> _laws = new();

    /// <summary>Inner cells of the reference's grid merged into one replica cell.</summary>
    public const int MergedCells = 64;

    /// <summary>Cells at each end of the reference's grid kept unmerged.</summary>
    public const int KeptCells = 16;

    /// <param name="reference">The reference's fine grid (its edges are the replicas' edges).</param>
    /// <param name="coarseEdges">The coarse bins' edges.</param>
    /// <param name="coarse">The coarse cell probabilities (flows included) under a drift, as the replicas draw them.</param>
    /// <param name="mean">The feature's mean, about which a width drift widens.</param>
    public FineGridLaw(FineGridCells reference, double[] coarseEdges, Func<Drift, double[]> coarse, Func<double> mean)
    {
        _reference = Merged(reference);
        _coarseEdges = coarseEdges;
        _coarse = coarse;
        _coarseTruth = coarse(Drift.Null);
        _mean = mean;
        Truth = FromReference(_reference);
    }

    /// <summary>The replicas' grid: the reference's fine grid with its inner cells merged (contents summed, tails as they are).</summary>
    public FineGridCells Grid => _reference;

    private static FineGridCells Merged(FineGridCells g)
    {
        var e = g.Edges;
        var keep = new List<int>();
        for (var i = 0; i < e.Length; i++)
            if (i <= KeptCells || i >= e.Length - 1 - KeptCells || (i - KeptCells) % MergedCells == 0) keep.Add(i);
        var edges = keep.Select(i => e[i]).ToArray();
        // Cell c of the merged grid (1 ≤ c < edges.Length) gathers the reference's cells keep[c-1]+1 … keep[c].
        var (w, w2) = (new double[edges.Length + 1], new double[edges.Length + 1]);
        (w[0], w2[0], w[^1], w2[^1]) = (g.SumW[0], g.SumW2[0], g.SumW[^1], g.SumW2[^1]);
        for (var c = 1; c < edges.Length; c++)
            for (var i = keep[c - 1] + 1; i <= keep[c]; i++)
            {
                w[c] += g.SumW[i];
                w2[c] += g.SumW2[i];
            }
        return g with { Edges = edges, SumW = w, SumW2 = w2 };
    }

    /// <summary>The undistorted law: the reference's fine grid, normalised.</summary>
    public Law Truth { get; }

    /// <summary>
    /// The law of cell probabilities <see cref="Law.P"/> (underflow first, overflow last) with, per unit of flow
    /// probability, the mean distance beyond the edge and the mean squared distance.
    /// </summary>
    internal sealed record Law(double[] P, double BelowMean, double BelowSquare, double AboveMean, double AboveSquare);

    /// <summary>The law under <paramref name="drift"/> (cached). A spike-fraction drift of a feature with a declared spike leaves the continuous part alone.</summary>
    public Law Under(Drift drift, bool declaredSpike) =>
        drift.Kind == DriftKind.None || (drift.Kind == DriftKind.SpikeFraction && declaredSpike)
            ? Truth
            : _laws.GetOrAdd(drift, Distorted);

    /// <summary>
    /// A multinomial draw of <paramref name="events"/> unit-weight events on the grid. A flow's first moment is its
    /// count times the mean distance plus a normal term with the per-event variance of the distance (central limit);
    /// its Σd² is the count times the mean squared distance.
    /// </summary>
    public FineGridCells Draw(Law law, long events, Random rng)
    {
        var counts = Array.ConvertAll(MultinomialCounts.Draw(law.P, events, rng), k => (double)k);
        double Moment(double k, double mean, double square) =>
            k > 0 ? Math.Max(0, k * mean + Math.Sqrt(k * Math.Max(0, square - mean * mean)) * Normal.Sample(rng, 0, 1)) : 0;
        var (below, above) = (counts[0], counts[^1]);
        return new FineGridCells(_reference.Edges, counts, (double[])counts.Clone(),
            Moment(below, law.BelowMean, law.BelowSquare), below * law.BelowSquare, Moment(above, law.AboveMean, law.AboveSquare), above * law.AboveSquare);
    }

    /// <summary>The expected contents of <paramref name="events"/> events (no noise).</summary>
    public FineGridCells Expected(Law law, double events)
    {
        var cells = law.P.Select(p => p * events).ToArray();
        return new FineGridCells(_reference.Edges, cells, (double[])cells.Clone(),
            cells[0] * law.BelowMean, cells[0] * law.BelowSquare, cells[^1] * law.AboveMean, cells[^1] * law.AboveSquare);
    }

    private static Law FromReference(FineGridCells g)
    {
        var p = MultinomialCounts.Normalised(g.SumW);
        // Per-event distances of the reference's flows (Σw·d/Σw, Σw²·d²/Σw²). The reference's edges are its own
        // minimum and maximum, so its flows are usually empty (or hold the maximum at distance 0).
        static double Per(double sum, double weight) => weight > 0 ? Math.Max(0, sum / weight) : 0;
        return new Law(p, Per(g.BelowMoment, g.SumW[0]), Per(g.BelowMoment2, g.SumW2[0]), Per(g.AboveMoment, g.SumW[^1]), Per(g.AboveMoment2, g.SumW2[^1]));
    }

    private Law Distorted(Drift drift) => drift.Kind switch
    {
        DriftKind.Scale => Mapped(1 + drift.Size, 0),
        DriftKind.Width => Mapped(1 + drift.Size, _mean()),
        // Tail deficit, and a spike-fraction drift without a declared spike: each fine cell reweighted as its coarse
        // bin is (the core being the coarse bins' as RegionBins.Core defines it).
        _ => Reweighted(_coarse(drift)),
    };

    /// <summary>
    /// Every fine cell's probability times its coarse cell's drifted-to-true ratio (a fine cell across a coarse edge
    /// takes the ratios weighted by overlap); the fine flows take the coarse flows' ratios. Then normalised.
    /// </summary>
    private Law Reweighted(double[] coarse)
    {
        double Ratio(int c) => _coarseTruth[c] > 0 ? coarse[c] / _coarseTruth[c] : 1;
        var edges = _reference.Edges;
        var ce = _coarseEdges;
        var p = (double[])Truth.P.Clone();
        p[0] *= Ratio(0);
        p[^1] *= Ratio(coarse.Length - 1);
        for (var i = 1; i < edges.Length; i++)
        {
            double a = edges[i - 1], b = edges[i], width = b - a;
            if (!(width > 0)) continue;
            // Overlap with below the coarse axis, each coarse bin, and above it.
            var factor = Math.Max(0, Math.Min(b, ce[0]) - a) * Ratio(0) + Math.Max(0, b - Math.Max(a, ce[^1])) * Ratio(coarse.Length - 1);
            for (var c = 0; c < ce.Length - 1; c++)
                factor += Math.Max(0, Math.Min(b, ce[c + 1]) - Math.Max(a, ce[c])) * Ratio(c + 1);
            p[i] *= factor / width;
        }
        var total = p.Sum();
        return Truth with { P = p.Select(x => x / total).ToArray() };
    }

    /// <summary>
    /// The law after x ↦ centre + k·(x − centre) (a scale change with centre 0, a width change about the mean), the
    /// reference's density uniform within each fine cell: an inner cell's probability is G(upper) − G(lower) with G
    /// the mapped piecewise-linear CDF, and the mass mapped beyond an outermost edge joins that flow with its exact first
    /// moment, k·∫F over the part of the axis that maps there. Its mean squared distance is taken as 4/3 of the squared
    /// mean distance (mass spread evenly from the edge outwards), an approximation that only enters the noise of the
    /// tail term. The reference's own flows move as point masses at their mean distance.
    /// </summary>
    private Law Mapped(double k, double centre)
    {
        var e = _reference.Edges;
        var p = Truth.P;
        var m = e.Length;
        // Cumulative inner probability at each edge (flows excluded).
        var cdf = new double[m];
        for (var i = 1; i < m; i++) cdf[i] = cdf[i - 1] + p[i];
        var inner = cdf[^1];
        double Inverse(double y) => centre + (y - centre) / k;
        double Forward(double x) => centre + k * (x - centre);
        double F(double x)
        {
            if (x <= e[0]) return 0;
            if (x >= e[^1]) return inner;
            var j = Array.BinarySearch(e, x);
            if (j >= 0) return cdf[j];
            j = ~j;
            return cdf[j - 1] + p[j] * (x - e[j - 1]) / (e[j] - e[j - 1]);
        }
        // ∫ from e₀ to x of F (trapezoids, exact for the piecewise-linear F).
        var integral = new double[m];
        for (var i = 1; i < m; i++) integral[i] = integral[i - 1] + (cdf[i - 1] + cdf[i]) / 2 * (e[i] - e[i - 1]);
        double IntegralF(double x)
        {
            if (x <= e[0]) return 0;
            if (x >= e[^1]) return integral[^1] + inner * (x - e[^1]);
            var j = Array.BinarySearch(e, x);
            if (j >= 0) return integral[j];
            j = ~j;
            return integral[j - 1] + (cdf[j - 1] + F(x)) / 2 * (x - e[j - 1]);
        }
        var q = new double[m + 1];
        for (var i = 1; i < m; i++) q[i] = Math.Max(0, F(Inverse(e[i])) - F(Inverse(e[i - 1])));
        // Inner mass mapped below e₀ or at/above e_last, with its first moments.
        var lowCut = Inverse(e[0]);
        var highCut = Inverse(e[^1]);
        var (belowMass, belowMoment) = (F(lowCut), k * IntegralF(lowCut));
        var aboveMass = inner - F(highCut);
        var aboveMoment = k * (inner * (e[^1] - highCut) - (integral[^1] - IntegralF(highCut)));
        if (highCut >= e[^1]) aboveMoment = 0;
        var belowSquare = belowMass > 0 ? 4.0 / 3 * belowMoment * belowMoment / belowMass : 0;
        var aboveSquare = aboveMass > 0 ? 4.0 / 3 * aboveMoment * aboveMoment / aboveMass : 0;
        // The truth's flows as point masses at their mean distance, mapped.
        void Point(double mass, double x, double squareRatio)
        {
            if (!(mass > 0)) return;
            var y = Forward(x);
            if (y < e[0])
            {
                var d = e[0] - y;
                belowMass += mass;
                belowMoment += mass * d;
                belowSquare += mass * d * d * squareRatio;
            }
            else if (y >= e[^1])
            {
                var d = y - e[^1];
                aboveMass += mass;
                aboveMoment += mass * d;
                aboveSquare += mass * d * d * squareRatio;
            }
            else
            {
                var j = Array.BinarySearch(e, y);
                q[j >= 0 ? j + 1 : ~j] += mass;
            }
        }
        static double SquareRatio(double mean, double square) => mean > 0 ? square / (mean * mean) : 1;
        Point(p[0], e[0] - Truth.BelowMean, SquareRatio(Truth.BelowMean, Truth.BelowSquare));
        Point(p[^1], e[^1] + Truth.AboveMean, SquareRatio(Truth.AboveMean, Truth.AboveSquare));
        q[0] = belowMass;
        q[^1] = aboveMass;
        var total = q.Sum();
        for (var i = 0; i < q.Length; i++) q[i] /= total;
        static double Per(double sum, double mass) => mass > 0 ? sum / mass : 0;
        return new Law(q, Per(belowMoment, belowMass), Per(belowSquare, belowMass), Per(aboveMoment, aboveMass), Per(aboveSquare, aboveMass));
    }
}
