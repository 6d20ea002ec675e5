using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// Event weights of a simulated surrogate: each event independently weighs −1 with probability
/// <see cref="NegativeFraction"/> and +1 otherwise, as an event generator with negative-weight events writes them. The
/// weighted law keeps the truth's shape (every cell's expected Σw is (1 − 2f) times its expected count), and n events
/// carry the Kish (1965) effective count (Σw)²/Σw² ≈ n (1 − 2f)². Drawn cell by cell: a cell of k events holds a
/// binomial number of negative ones, so Σw = k − 2·negatives and Σw² = k.
/// </summary>
internal sealed record WeightLaw(double NegativeFraction)
{
    /// <summary>All weights one.</summary>
    public static readonly WeightLaw Unit = new(0.0);

    public bool IsUnit => NegativeFraction <= 0;

    /// <summary>The effective events per event, (1 − 2f)² (Kish 1965).</summary>
    public double EffectiveShare => (1 - 2 * NegativeFraction) * (1 - 2 * NegativeFraction);

    public string Label => IsUnit ? "unit" : $"±1, {Diagnostics.InvariantNumber.Short(NegativeFraction * 100)}% negative";

    /// <summary>Σw of k unit events after their signs are drawn.</summary>
    public double SignedSum(long k, Random rng) => IsUnit || k == 0 ? k : k - 2.0 * ReplicaSampler.Binomial(rng, NegativeFraction, k);

    /// <summary>A histogram of counts with its events' signs drawn (Σw² stays the count).</summary>
    public Histogram Apply(Histogram counts, Random rng)
    {
        if (IsUnit) return counts;
        var sumW2 = counts.SumW.ToArray();
        var sumW = sumW2.Select(k => SignedSum((long)k, rng)).ToArray();
        return Histogram.FromCells(counts.Axis, sumW, sumW2, counts.Entries, 0, 0, 0);
    }

    /// <summary>
    /// A replica comparison whose surrogate events (histogram, spike and far-tail counts, fine-grid cells) get their
    /// signs drawn, the surrogate's moments then taken from the signed bins as the unweighted replicas' are. A fine-grid
    /// flow's first moment is scaled by its cell's signed-to-unsigned ratio (every event there taken at the mean distance).
    /// </summary>
    public FeatureComparison Apply(FeatureComparison c, Random rng)
    {
        if (IsUnit) return c;
        var h = Apply(c.Surrogate, rng);
        var spike = c.SampleSpike is { } s ? s with { SumW = SignedSum(s.Entries, rng), SumW2 = s.Entries } : null;
        FarTailCounts? tail = null;
        if (c.SampleFarTail is { } t)
        {
            var (below, above, total) = ((long)t.BelowW, (long)t.AboveW, (long)t.TotalW);
            var (wBelow, wAbove) = (SignedSum(below, rng), SignedSum(above, rng));
            tail = t with { BelowW = wBelow, AboveW = wAbove, TotalW = wBelow + wAbove + SignedSum(total - below - above, rng) };
        }
        FineGridCells? fine = null;
        if (c.SampleFineGrid is { } g)
        {
            var signed = g.SumW.Select(k => SignedSum((long)k, rng)).ToArray();
            double Scaled(double moment, int cell) => g.SumW[cell] > 0 ? moment * signed[cell] / g.SumW[cell] : 0;
            fine = g with { SumW = signed, BelowMoment = Scaled(g.BelowMoment, 0), AboveMoment = Scaled(g.AboveMoment, signed.Length - 1) };
        }
        return c with
        {
            Surrogate = h, SurrogateSummary = c.SurrogateSummary with { SumW = h.TotalSumW, SumW2 = h.TotalSumW2 }, SampleSpike = spike, SampleFarTail = tail,
            SampleFineGrid = fine,
        };
    }
}
