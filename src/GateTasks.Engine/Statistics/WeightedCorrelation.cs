namespace GateTasks.Engine.Statistics;

/// <summary>
/// Streaming weighted Pearson correlation of two variables: weighted means, variances and co-moment updated one
/// pair at a time (West 1979, extended to the co-moment), mergeable; plus the Kish (1965) effective count.
/// </summary>
internal sealed class WeightedCorrelation
{
    private double _sumW, _sumW2, _meanX, _meanY, _m2X, _m2Y, _cXY;

    public long Count { get; private set; }
    public double SumOfWeights => _sumW;
    public double EffectiveCount => KishCount.Of(_sumW, _sumW2);

    public void Add(double x, double y, double w = 1.0)
    {
        if (w == 0) return;
        Count++;
        _sumW2 += w * w;
        var newSum = _sumW + w;
        var dx = x - _meanX;
        var dy = y - _meanY;
        _meanX += dx * w / newSum;
        _meanY += dy * w / newSum;
        _m2X += w * dx * (x - _meanX);
        _m2Y += w * dy * (y - _meanY);
        _cXY += w * dx * (y - _meanY);
        _sumW = newSum;
    }

    /// <summary>Adds another accumulation (Chan, Golub &amp; LeVeque 1979, extended to the co-moment); agrees with one pass to rounding.</summary>
    public void Merge(WeightedCorrelation other)
    {
        if (other._sumW == 0) { Count += other.Count; _sumW2 += other._sumW2; return; }
        if (_sumW == 0)
        {
            (_sumW, _sumW2, _meanX, _meanY, _m2X, _m2Y, _cXY) = (other._sumW, _sumW2 + other._sumW2, other._meanX, other._meanY, other._m2X, other._m2Y, other._cXY);
            Count += other.Count;
            return;
        }
        var total = _sumW + other._sumW;
        var dx = other._meanX - _meanX;
        var dy = other._meanY - _meanY;
        var f = _sumW * other._sumW / total;
        _m2X += other._m2X + dx * dx * f;
        _m2Y += other._m2Y + dy * dy * f;
        _cXY += other._cXY + dx * dy * f;
        _meanX += dx * other._sumW / total;
        _meanY += dy * other._sumW / total;
        _sumW = total;
        _sumW2 += other._sumW2;
        Count += other.Count;
    }

    /// <summary>The whole state as numbers, for a partial file (<see cref="Restore"/> reads it back).</summary>
    public double[] State() => [Count, _sumW, _sumW2, _meanX, _meanY, _m2X, _m2Y, _cXY];

    public void Restore(ReadOnlySpan<double> s)
    {
        Count = (long)s[0];
        (_sumW, _sumW2, _meanX, _meanY, _m2X, _m2Y, _cXY) = (s[1], s[2], s[3], s[4], s[5], s[6], s[7]);
    }

    /// <summary>Pearson's r, or NaN when either variable is constant.</summary>
    public double Pearson => _m2X > 0 && _m2Y > 0 ? Math.Clamp(_cXY / Math.Sqrt(_m2X * _m2Y), -1, 1) : double.NaN;

    /// <summary>
    /// Large-sample standard error of r, (1 − r²)/√(n − 3), from Fisher's (1915) z transform for a bivariate normal;
    /// for Spearman's coefficient Fieller, Hartley &amp; Pearson (1957) give a factor √1.06 on top.
    /// </summary>
    public static double StandardError(double r, double effectiveCount, bool spearman) =>
        effectiveCount > 3 ? (1 - r * r) / Math.Sqrt(effectiveCount - 3) * (spearman ? Math.Sqrt(1.06) : 1) : double.PositiveInfinity;
}
