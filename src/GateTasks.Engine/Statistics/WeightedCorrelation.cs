namespace GateTasks.Engine.Statistics;

/// <summary>
/// Streaming weighted Pearson correlation of two variables with its distribution-free large-sample variance: the
/// weighted means and every central co-moment M_pq = Σ w (x − x̄)^p (y − ȳ)^q with p + q ≤ 4, updated one pair at
/// a time and mergeable across shards (the pairwise update of Pébay 2008, SAND2008-6212, written for mixed moments
/// as the binomial expansion of each part's deviations about the combined mean); plus the Kish (1965) effective count.
/// </summary>
internal sealed class WeightedCorrelation
{
    // M_pq at index p * Order + q for p, q ≤ 4 (entries with p + q > 4 stay zero). M_00 is Σw, M_10 = M_01 = 0.
    private const int Order = 5;
    private readonly double[] _m = new double[Order * Order];
    private double _sumW2, _meanX, _meanY;

    /// <summary>How many numbers <see cref="State"/> gives: count, Σw, Σw², the two means and the 12 co-moments of order 2–4.</summary>
    public const int StateLength = 5 + 12;

    private static readonly (int P, int Q)[] Stored =
        [(2, 0), (1, 1), (0, 2), (3, 0), (2, 1), (1, 2), (0, 3), (4, 0), (3, 1), (2, 2), (1, 3), (0, 4)];

    private static readonly double[,] Binomial =
    {
        { 1, 0, 0, 0, 0 }, { 1, 1, 0, 0, 0 }, { 1, 2, 1, 0, 0 }, { 1, 3, 3, 1, 0 }, { 1, 4, 6, 4, 1 },
    };

    public long Count { get; private set; }
    public double SumOfWeights => _m[0];
    public double EffectiveCount => KishCount.Of(_m[0], _sumW2);

    private double M(int p, int q) => _m[p * Order + q];

    public void Add(double x, double y, double w = 1.0)
    {
        if (w == 0) return;
        Count++;
        _sumW2 += w * w;
        if (_m[0] == 0)
        {
            (_m[0], _meanX, _meanY) = (w, x, y);
            return;
        }
        Combine(w, x - _meanX, y - _meanY, null);
    }

    /// <summary>
    /// Adds a batch of pairs (weights empty: unit weights; zero weights are skipped as in <see cref="Add"/>): the batch's
    /// own weighted means, then its central co-moments about them in a second pass over the batch, joined to the
    /// running ones once by the pairwise update. The same moments as pair-by-pair updates to rounding, at a few
    /// multiplications per pair instead of a full update.
    /// </summary>
    public void AddBatch(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> weights)
    {
        double sw = 0, sx = 0, sy = 0, sw2 = 0;
        long n = 0;
        for (var i = 0; i < x.Length; i++)
        {
            var w = weights.IsEmpty ? 1.0 : weights[i];
            if (w == 0) continue;
            n++;
            sw += w;
            sw2 += w * w;
            sx += w * x[i];
            sy += w * y[i];
        }
        if (n == 0) return;
        if (sw == 0)
        {
            // Signed weights that cancel: no mean to centre on, so pair by pair.
            for (var i = 0; i < x.Length; i++) Add(x[i], y[i], weights.IsEmpty ? 1.0 : weights[i]);
            return;
        }
        var mx = sx / sw;
        var my = sy / sw;
        Span<double> batch = stackalloc double[Order * Order];
        for (var i = 0; i < x.Length; i++)
        {
            var w = weights.IsEmpty ? 1.0 : weights[i];
            if (w == 0) continue;
            var dx = x[i] - mx;
            var dy = y[i] - my;
            double dx2 = dx * dx, dy2 = dy * dy, dxy = dx * dy;
            batch[2 * Order + 0] += w * dx2;
            batch[1 * Order + 1] += w * dxy;
            batch[0 * Order + 2] += w * dy2;
            batch[3 * Order + 0] += w * dx2 * dx;
            batch[2 * Order + 1] += w * dx2 * dy;
            batch[1 * Order + 2] += w * dxy * dy;
            batch[0 * Order + 3] += w * dy2 * dy;
            batch[4 * Order + 0] += w * dx2 * dx2;
            batch[3 * Order + 1] += w * dx2 * dxy;
            batch[2 * Order + 2] += w * dx2 * dy2;
            batch[1 * Order + 3] += w * dxy * dy2;
            batch[0 * Order + 4] += w * dy2 * dy2;
        }
        batch[0] = sw;
        Count += n;
        _sumW2 += sw2;
        if (_m[0] == 0)
        {
            batch.CopyTo(_m);
            (_meanX, _meanY) = (mx, my);
            return;
        }
        Combine(sw, mx - _meanX, my - _meanY, batch.ToArray());
    }

    /// <summary>Adds another accumulation; agrees with one pass to rounding.</summary>
    public void Merge(WeightedCorrelation other)
    {
        Count += other.Count;
        _sumW2 += other._sumW2;
        if (other._m[0] == 0) return;
        if (_m[0] == 0)
        {
            Array.Copy(other._m, _m, _m.Length);
            (_meanX, _meanY) = (other._meanX, other._meanY);
            return;
        }
        Combine(other._m[0], other._meanX - _meanX, other._meanY - _meanY, other._m);
    }

    /// <summary>
    /// Joins a part B of weight <paramref name="wB"/>, means offset by (dx, dy) and co-moments <paramref name="mB"/>
    /// (null: a single point, all co-moments zero) into this part A. Each part's deviation about the combined mean is
    /// its own deviation plus its mean's offset (−w_B/W·d for A, w_A/W·d for B), so
    /// M_pq = Σ_ij C(p,i) C(q,j) [M^A_{p−i,q−j} a^i b^j + M^B_{p−i,q−j} c^i e^j].
    /// </summary>
    private void Combine(double wB, double dx, double dy, double[]? mB)
    {
        var wA = _m[0];
        var total = wA + wB;
        Span<double> aPow = stackalloc double[Order], bPow = stackalloc double[Order], cPow = stackalloc double[Order], ePow = stackalloc double[Order];
        Powers(aPow, -wB / total * dx);
        Powers(bPow, -wB / total * dy);
        Powers(cPow, wA / total * dx);
        Powers(ePow, wA / total * dy);
        Span<double> next = stackalloc double[Order * Order];
        foreach (var (p, q) in Stored)
        {
            var sum = 0.0;
            for (var i = 0; i <= p; i++)
                for (var j = 0; j <= q; j++)
                {
                    var k = (p - i) * Order + (q - j);
                    if (k == Order || k == 1) continue; // M_10 = M_01 = 0
                    var mA = _m[k];
                    var mb = mB is null ? (k == 0 ? wB : 0) : mB[k];
                    sum += Binomial[p, i] * Binomial[q, j] * (mA * aPow[i] * bPow[j] + mb * cPow[i] * ePow[j]);
                }
            next[p * Order + q] = sum;
        }
        foreach (var (p, q) in Stored) _m[p * Order + q] = next[p * Order + q];
        _meanX += wB / total * dx;
        _meanY += wB / total * dy;
        _m[0] = total;
    }

    private static void Powers(Span<double> into, double v)
    {
        into[0] = 1;
        for (var i = 1; i < into.Length; i++) into[i] = into[i - 1] * v;
    }

    /// <summary>The whole state as numbers, for a partial file (<see cref="Restore"/> reads it back).</summary>
    public double[] State()
    {
        var s = new double[StateLength];
        (s[0], s[1], s[2], s[3], s[4]) = (Count, _m[0], _sumW2, _meanX, _meanY);
        for (var i = 0; i < Stored.Length; i++) s[5 + i] = M(Stored[i].P, Stored[i].Q);
        return s;
    }

    /// <summary>Sets the state <see cref="State"/> gave; false when the numbers are not of that form (an older partial).</summary>
    public bool Restore(ReadOnlySpan<double> s)
    {
        if (s.Length != StateLength) return false;
        Array.Clear(_m);
        Count = (long)s[0];
        (_m[0], _sumW2, _meanX, _meanY) = (s[1], s[2], s[3], s[4]);
        for (var i = 0; i < Stored.Length; i++) _m[Stored[i].P * Order + Stored[i].Q] = s[5 + i];
        return true;
    }

    /// <summary>Pearson's r, or NaN when either variable is constant.</summary>
    public double Pearson => M(2, 0) > 0 && M(0, 2) > 0 ? Math.Clamp(M(1, 1) / Math.Sqrt(M(2, 0) * M(0, 2)), -1, 1) : double.NaN;

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
            var r = Pearson;
            if (double.IsNaN(r)) return double.NaN;
            var w = _m[0];
            var sx = Math.Sqrt(M(2, 0) / w);
            var sy = Math.Sqrt(M(0, 2) / w);
            double Mu(int p, int q) => M(p, q) / w / (Math.Pow(sx, p) * Math.Pow(sy, q));
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
