namespace GateTasks.Engine.Statistics;

/// <summary>
/// Streaming weighted Pearson correlation of two variables with its distribution-free large-sample variance: the
/// weighted means and central co-moments of order up to 4 (<see cref="CoMoments"/>), mergeable across shards, plus the
/// Kish (1965) effective count. Positive and negative weights are accumulated apart and joined when read: the
/// moment update divides by the running Σw, which signed weights can take through zero (a +1 and a −1 event), so
/// each sign's Σw only moves away from zero. When all the weights cancel exactly the moments are undefined (NaN).
/// </summary>
internal sealed class WeightedCorrelation
{
    private readonly CoMoments _positive = new(), _negative = new();
    private double _sumW2;

    /// <summary>How many numbers <see cref="State"/> gives: count, Σw², then each sign's co-moments.</summary>
    public const int StateLength = 2 + 2 * CoMoments.StateLength;

    private static readonly Func<double, bool> IsPositive = w => w > 0, IsNegative = w => w < 0;

    /// <summary>Pairs added with non-zero weight.</summary>
    public long Count { get; private set; }

    /// <summary>Σw.</summary>
    public double SumOfWeights => _positive.SumOfWeights + _negative.SumOfWeights;

    /// <summary>Kish effective count (Σw)²/Σw².</summary>
    public double EffectiveCount => KishCount.Of(SumOfWeights, _sumW2);

    /// <summary>Adds one pair.</summary>
    public void Add(double x, double y, double w = 1.0)
    {
        if (w == 0) return;
        Count++;
        _sumW2 += w * w;
        (w > 0 ? _positive : _negative).Add(x, y, w);
    }

    /// <summary>Adds a batch of pairs (weights empty: unit weights; zero weights are skipped as in <see cref="Add"/>).</summary>
    public void AddBatch(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> weights)
    {
        var negatives = false;
        if (weights.IsEmpty)
        {
            // Unit weights: Count and Σw² grow by the batch's length (an exact sum of ones, as one by one).
            Count += x.Length;
            _sumW2 += x.Length;
            _positive.AddBatch(x, y, weights, IsPositive);
            return;
        }
        for (var i = 0; i < x.Length; i++)
        {
            var w = weights.IsEmpty ? 1.0 : weights[i];
            if (w == 0) continue;
            Count++;
            _sumW2 += w * w;
            negatives |= w < 0;
        }
        _positive.AddBatch(x, y, weights, IsPositive);
        if (negatives) _negative.AddBatch(x, y, weights, IsNegative);
    }

    /// <summary>
    /// Adds a batch of <paramref name="count"/> pairs of unit weight given as their means and twelve central co-moments
    /// (<see cref="CoMoments.AddCentral"/>), found as <see cref="AddBatch"/> finds them: the same state to the bit.
    /// </summary>
    public void AddUnitCentral(int count, double meanX, double meanY, ReadOnlySpan<double> central)
    {
        Count += count;
        _sumW2 += count;
        if (count > 0) _positive.AddCentral(count, meanX, meanY, central);
    }

    /// <summary>Adds another accumulation; agrees with one pass to rounding.</summary>
    public void Merge(WeightedCorrelation other)
    {
        Count += other.Count;
        _sumW2 += other._sumW2;
        _positive.Merge(other._positive);
        _negative.Merge(other._negative);
    }

    /// <summary>The whole state as numbers, for a partial file (<see cref="Restore"/> reads it back).</summary>
    public double[] State()
    {
        var s = new double[StateLength];
        (s[0], s[1]) = (Count, _sumW2);
        _positive.WriteState(s.AsSpan(2, CoMoments.StateLength));
        _negative.WriteState(s.AsSpan(2 + CoMoments.StateLength, CoMoments.StateLength));
        return s;
    }

    /// <summary>Sets the state <see cref="State"/> gave; false when the numbers are not of that form (an older partial).</summary>
    public bool Restore(ReadOnlySpan<double> s)
    {
        if (s.Length != StateLength) return false;
        (Count, _sumW2) = ((long)s[0], s[1]);
        _positive.Restore(s.Slice(2, CoMoments.StateLength));
        _negative.Restore(s.Slice(2 + CoMoments.StateLength, CoMoments.StateLength));
        return true;
    }

    /// <summary>Both signs joined; null when the weights cancel exactly (no mean to centre on).</summary>
    private CoMoments? Joined()
    {
        if (_negative.SumOfWeights == 0) return _positive;
        if (_positive.SumOfWeights + _negative.SumOfWeights == 0) return null;
        var joined = _positive.Copy();
        joined.Merge(_negative);
        return joined;
    }

    /// <summary>Pearson's r, or NaN when either variable is constant or the weights cancel exactly.</summary>
    public double Pearson => Joined() is { } m ? PearsonOf(m) : double.NaN;

    private static double PearsonOf(CoMoments m) =>
        m.M(2, 0) > 0 && m.M(0, 2) > 0 ? Math.Clamp(m.M(1, 1) / Math.Sqrt(m.M(2, 0) * m.M(0, 2)), -1, 1) : double.NaN;

    /// <summary>
    /// n·Var(r), the asymptotic variance of the sample correlation for any law with finite fourth moments (the delta
    /// method on the moments; Hsu 1949, Steiger &amp; Hakstian 1982, Anderson 2003 §4.2.3):
    /// ρ²/4 (μ40 + μ04 + 2μ22) − ρ (μ31 + μ13) + μ22, with μ_pq the standardized central moments; it is
    /// (1 − ρ²)² for a bivariate normal. Equivalently the variance of z_x z_y − ρ/2 (z_x² + z_y²). With weights the
    /// moments are the weighted ones; NaN when r is undefined.
    /// </summary>
    public double AsymptoticVariance
    {
        get
        {
            if (Joined() is not { } m) return double.NaN;
            var r = PearsonOf(m);
            if (double.IsNaN(r)) return double.NaN;
            var w = m.SumOfWeights;
            var sx = Math.Sqrt(m.M(2, 0) / w);
            var sy = Math.Sqrt(m.M(0, 2) / w);
            double Mu(int p, int q) => m.M(p, q) / w / (Math.Pow(sx, p) * Math.Pow(sy, q));
            var v = r * r / 4 * (Mu(4, 0) + Mu(0, 4) + 2 * Mu(2, 2)) - r * (Mu(3, 1) + Mu(1, 3)) + Mu(2, 2);
            return Math.Max(v, 0);
        }
    }

    /// <summary>
    /// Large-sample standard error of a coefficient, √(n·Var(r) / n_eff), from <see cref="AsymptoticVariance"/>. With
    /// weights, n_eff is the Kish (1965) effective count: an approximation that treats the weighted moments as those
    /// of n_eff unweighted events (exact for equal weights). Infinite when there is too little to say.
    /// </summary>
    public static double StandardError(double asymptoticVariance, double effectiveCount) =>
        effectiveCount > 3 && double.IsFinite(asymptoticVariance) ? Math.Sqrt(asymptoticVariance / effectiveCount) : double.PositiveInfinity;
}
