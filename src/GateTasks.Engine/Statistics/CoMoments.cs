namespace GateTasks.Engine.Statistics;

/// <summary>
/// Streaming weighted central co-moments of two variables, M_pq = Σ w (x − x̄)^p (y − ȳ)^q for p + q ≤ 4, with the
/// weighted means: updated a pair or a batch at a time and mergeable (the pairwise update of Pébay 2008, SAND2008-6212,
/// written for mixed moments as the binomial expansion of each part's deviations about the combined mean). The update
/// divides by the combined Σw, so <see cref="WeightedCorrelation"/> keeps one of these per sign of weight, whose Σw
/// moves away from zero only, and joins them once when it reads the moments.
/// </summary>
internal sealed class CoMoments
{
    // M_pq at index p * Order + q for p, q ≤ 4 (entries with p + q > 4 stay zero). M_00 is Σw, M_10 = M_01 = 0.
    internal const int Order = 5;
    private readonly double[] _m = new double[Order * Order];
    private double _meanX, _meanY;

    /// <summary>How many numbers <see cref="WriteState"/> writes: Σw, the two means and the 12 co-moments of order 2–4.</summary>
    public const int StateLength = 3 + 12;

    private static readonly (int P, int Q)[] Stored =
        [(2, 0), (1, 1), (0, 2), (3, 0), (2, 1), (1, 2), (0, 3), (4, 0), (3, 1), (2, 2), (1, 3), (0, 4)];

    private static readonly double[,] Binomial =
    {
        { 1, 0, 0, 0, 0 }, { 1, 1, 0, 0, 0 }, { 1, 2, 1, 0, 0 }, { 1, 3, 3, 1, 0 }, { 1, 4, 6, 4, 1 },
    };

    /// <summary>Σw.</summary>
    public double SumOfWeights => _m[0];

    /// <summary>M_pq.</summary>
    public double M(int p, int q) => _m[p * Order + q];

    /// <summary>Adds one pair.</summary>
    public void Add(double x, double y, double w)
    {
        if (w == 0) return;
        if (_m[0] == 0)
        {
            (_m[0], _meanX, _meanY) = (w, x, y);
            return;
        }
        Combine(w, x - _meanX, y - _meanY, null);
    }

    /// <summary>
    /// Adds the pairs of a batch whose weight <paramref name="select"/> accepts (weights empty: unit weights): the
    /// batch's own weighted means, then its central co-moments about them in a second pass, joined to the running ones
    /// once. The same moments as pair-by-pair updates to rounding, at a few multiplications per pair.
    /// </summary>
    public void AddBatch(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> weights, Func<double, bool> select)
    {
        // Unit weights (none given) take loops without the weight and the selection per pair: the same sums to the bit,
        // since 1·v is v.
        var unit = weights.IsEmpty;
        if (unit && !select(1.0)) return;
        double sw = 0, sx = 0, sy = 0;
        for (var i = 0; i < x.Length; i++)
        {
            if (unit)
            {
                sw += 1.0;
                sx += x[i];
                sy += y[i];
                continue;
            }
            var w = weights[i];
            if (w == 0 || !select(w)) continue;
            sw += w;
            sx += w * x[i];
            sy += w * y[i];
        }
        if (sw == 0) return; // nothing selected: one sign's weights cannot cancel
        var mx = sx / sw;
        var my = sy / sw;
        // The twelve sums in locals rather than an array, in the order of M_pq's storage.
        double m20 = 0, m11 = 0, m02 = 0, m30 = 0, m21 = 0, m12 = 0, m03 = 0, m40 = 0, m31 = 0, m22 = 0, m13 = 0, m04 = 0;
        if (unit)
        {
            for (var i = 0; i < x.Length; i++)
            {
                var dx = x[i] - mx;
                var dy = y[i] - my;
                double dx2 = dx * dx, dy2 = dy * dy, dxy = dx * dy;
                m20 += dx2;
                m11 += dxy;
                m02 += dy2;
                m30 += dx2 * dx;
                m21 += dx2 * dy;
                m12 += dxy * dy;
                m03 += dy2 * dy;
                m40 += dx2 * dx2;
                m31 += dx2 * dxy;
                m22 += dx2 * dy2;
                m13 += dxy * dy2;
                m04 += dy2 * dy2;
            }
        }
        else
        {
            for (var i = 0; i < x.Length; i++)
            {
                var w = weights[i];
                if (w == 0 || !select(w)) continue;
                var dx = x[i] - mx;
                var dy = y[i] - my;
                double dx2 = dx * dx, dy2 = dy * dy, dxy = dx * dy;
                m20 += w * dx2;
                m11 += w * dxy;
                m02 += w * dy2;
                m30 += w * dx2 * dx;
                m21 += w * dx2 * dy;
                m12 += w * dxy * dy;
                m03 += w * dy2 * dy;
                m40 += w * dx2 * dx2;
                m31 += w * dx2 * dxy;
                m22 += w * dx2 * dy2;
                m13 += w * dxy * dy2;
                m04 += w * dy2 * dy2;
            }
        }
        AddCentral(sw, mx, my, [m20, m11, m02, m30, m21, m12, m03, m40, m31, m22, m13, m04]);
    }

    /// <summary>
    /// Adds a batch given as its Σw, its means and its twelve central co-moments in the order of <see cref="Stored"/>
    /// (M_20, M_11, M_02, M_30, …, M_04), as <see cref="AddBatch"/> finds them; Σw must not be zero.
    /// </summary>
    internal void AddCentral(double sw, double mx, double my, ReadOnlySpan<double> central)
    {
        var batch = new double[Order * Order];
        for (var i = 0; i < Stored.Length; i++) batch[Stored[i].P * Order + Stored[i].Q] = central[i];
        batch[0] = sw;
        if (_m[0] == 0)
        {
            Array.Copy(batch, _m, _m.Length);
            (_meanX, _meanY) = (mx, my);
            return;
        }
        Combine(sw, mx - _meanX, my - _meanY, batch);
    }

    /// <summary>Adds another accumulation. The combined Σw must not be zero (the moments about its mean would be undefined).</summary>
    public void Merge(CoMoments other)
    {
        if (other._m[0] == 0) return;
        if (_m[0] == 0)
        {
            Array.Copy(other._m, _m, _m.Length);
            (_meanX, _meanY) = (other._meanX, other._meanY);
            return;
        }
        Combine(other._m[0], other._meanX - _meanX, other._meanY - _meanY, other._m);
    }

    /// <summary>A copy.</summary>
    public CoMoments Copy()
    {
        var c = new CoMoments();
        Array.Copy(_m, c._m, _m.Length);
        (c._meanX, c._meanY) = (_meanX, _meanY);
        return c;
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

    /// <summary>The state as numbers (<see cref="Restore"/> reads it back).</summary>
    public void WriteState(Span<double> s)
    {
        (s[0], s[1], s[2]) = (_m[0], _meanX, _meanY);
        for (var i = 0; i < Stored.Length; i++) s[3 + i] = M(Stored[i].P, Stored[i].Q);
    }

    /// <summary>Sets the state <see cref="WriteState"/> gave.</summary>
    public void Restore(ReadOnlySpan<double> s)
    {
        Array.Clear(_m);
        (_m[0], _meanX, _meanY) = (s[0], s[1], s[2]);
        for (var i = 0; i < Stored.Length; i++) _m[Stored[i].P * Order + Stored[i].Q] = s[3 + i];
    }
}
