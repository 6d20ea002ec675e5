using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// A declared pair as the calibration study sees it. Its truth for the correlation checks is a fixed set of points,
/// each equally likely: points of a <see cref="GaussianCopula"/> fitted to the reference's Spearman ρ with the
/// reference histograms as marginals (a reference keeps no rows). A replica draws how many events fall on each point (a multinomial
/// draw, so its cost does not grow with the events), and the real accumulator (<see cref="WeightedCorrelation"/>)
/// takes each point once with its events' summed weight: the co-moments are linear in the weights, so they equal
/// those of the events one by one; Σw² and the count are set to the events'. Ranks for Spearman's ρ come from the
/// reference histograms' CDFs, as the checks take them. The 2-D χ² test draws both 2-D histograms from the
/// reference's stored cells. Every coefficient and test is then measured by the checks' own code.
/// </summary>
internal sealed class PairReplica
{
    private readonly double[] _x, _y, _u, _v, _truth;
    private readonly double[]? _cells;
    private readonly long _referenceEvents;

    private PairReplica(CorrelationSpec spec, double[] x, double[] y, MarginalCdf first, MarginalCdf second, double[]? cells, long referenceEvents, string source)
    {
        Spec = spec;
        Subject = new PairSubject(spec);
        (_x, _y) = (x, y);
        _u = x.Select(first.Evaluate).ToArray();
        _v = y.Select(second.Evaluate).ToArray();
        _truth = Enumerable.Repeat(1.0 / x.Length, x.Length).ToArray();
        _cells = cells is null ? null : MultinomialCounts.Normalised(cells);
        _referenceEvents = referenceEvents;
        Source = source;
    }

    /// <summary>Points of the copula.</summary>
    public const int CopulaPoints = 4000;

    public CorrelationSpec Spec { get; }
    public CheckSubject Subject { get; }

    /// <summary>Where the pair's joint law comes from, for the report.</summary>
    public string Source { get; }

    /// <summary>Every declared pair of the contract, matched to the reference.</summary>
    public static IReadOnlyList<PairReplica> All(PrecisionContract contract, ReferenceHistograms reference, int seed)
    {
        var referenceEvents = (long)Math.Round(reference.EffectiveEvents);
        return contract.Pairs.Select((p, i) =>
        {
            var stored = reference.FindPair(p.First, p.Second) ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference holds no correlation for {p.Name}; rebuild it with 'gatetasks reference build'.", p.Location);
            Histogram Marginal(string name) => (reference.Find(name) ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference has no feature '{name}'; rebuild it with 'gatetasks reference build'.", p.Location)).Histogram;
            var (h1, h2) = (Marginal(p.First), Marginal(p.Second));
            var cells = p.Chi2 is null ? null : stored.Cells2DSumW ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference holds no 2-D histogram for {p.Name}; rebuild it with 'gatetasks reference build'.", p.Location);
            var events = (long)Math.Round(stored.EffectiveCount) is > 0 and var n ? n : referenceEvents;
            var rng = new MathNet.Numerics.Random.Xoshiro256StarStar(unchecked(seed * 7919 + i), threadSafe: false);
            var (x, y) = GaussianCopula.Draw(h1, h2, stored.Spearman, CopulaPoints, rng);
            return new PairReplica(p, x, y, new MarginalCdf(h1), new MarginalCdf(h2), cells, events,
                $"Gaussian copula at Spearman ρ {InvariantNumber.Short(stored.Spearman)} ({CopulaPoints} points)");
        }).ToList();
    }


    /// <summary>Draws one replica (a fresh reference and a surrogate of <paramref name="events"/> events) and measures every check of the pair.</summary>
    public IEnumerable<(CheckSubject, CheckSpec, Measurement)> Measure(long events, WeightLaw weights, DecisionSettings decision, Random rng)
    {
        var measured = new List<(CheckSubject, CheckSpec, Measurement)>();
        if (Spec.Pearson is not null || Spec.Spearman is not null)
        {
            var (refPearson, refSpearman) = Accumulate(_referenceEvents, WeightLaw.Unit, rng);
            var (pearson, spearman) = Accumulate(events, weights, rng);
            var stored = new ReferenceCorrelation(Spec.First, Spec.Second, refPearson.Pearson, refSpearman.Pearson, refPearson.EffectiveCount,
                refPearson.AsymptoticVariance, refSpearman.AsymptoticVariance);
            var sample = new AccumulatedPair(Spec, pearson.Pearson, spearman.Pearson, pearson.EffectiveCount,
                pearson.AsymptoticVariance, spearman.AsymptoticVariance, null);
            foreach (var check in new[] { Spec.Pearson, Spec.Spearman })
                if (check is not null) measured.Add((Subject, check, CorrelationCheck.Evaluate(stored, sample, check, decision, events)));
        }
        if (Spec.Chi2 is { } chi2 && _cells is not null)
        {
            var reference = MultinomialCounts.Draw(_cells, _referenceEvents, rng).Select(k => (double)k).ToArray();
            var counts = MultinomialCounts.Draw(_cells, events, rng);
            var sumW = counts.Select(k => weights.SignedSum(k, rng)).ToArray();
            var sumW2 = counts.Select(k => (double)k).ToArray();
            Measurement m;
            try
            {
                m = ChiSquareCheck.Evaluate(new CellContents(reference, (double[])reference.Clone()), new CellContents(sumW, sumW2));
            }
            catch (ArgumentException e)
            {
                // As a feature's kernel refusal is taken (CheckEvaluator): undecided, never a fail.
                m = Measurement.Impossible($"{chi2.Key} on these histograms: {e.Message}", []);
            }
            measured.Add((Subject, chi2, m));
        }
        return measured;
    }

    /// <summary>Pearson and rank accumulations of one replica of n events with signs drawn from <paramref name="weights"/>.</summary>
    private (WeightedCorrelation Pearson, WeightedCorrelation Spearman) Accumulate(long n, WeightLaw weights, Random rng)
    {
        var counts = MultinomialCounts.Draw(_truth, n, rng);
        var w = new double[counts.Length];
        for (var i = 0; i < counts.Length; i++) w[i] = weights.SignedSum(counts[i], rng);
        return (Events(_x, _y, w, n), Events(_u, _v, w, n));
    }

    /// <summary>The accumulation of n events of weight ±1 sitting on the points with summed weights w (see the class remarks).</summary>
    internal static WeightedCorrelation Events(double[] x, double[] y, double[] w, long n)
    {
        var points = new WeightedCorrelation();
        points.AddBatch(x, y, w);
        var state = points.State();
        (state[0], state[1]) = (n, n); // n events, each w² = 1
        var events = new WeightedCorrelation();
        events.Restore(state);
        return events;
    }
}
