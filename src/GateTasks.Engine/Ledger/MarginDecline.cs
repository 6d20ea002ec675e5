namespace GateTasks.Engine.Ledger;

/// <summary>
/// The ratchet's rule for one check between two measurements: it compares point margins, 1 − estimate/tolerance (the
/// upper-bound margin would improve with sample size alone), and calls the later one worse when it fell by more than
/// z·√(σ_now² + σ_then²), σ each estimate's standard error over the tolerance and z the one-sided normal quantile at
/// the later measurement's confidence. Both σ include the shared reference's part, so the allowance errs towards no
/// alarm. The ledger guard (GATE4010) and the headroom history use this one rule.
/// </summary>
internal readonly record struct MarginDecline(double PointThen, double PointNow, double Allowed)
{
    /// <summary>Whether the point margin fell by more than its noise allows.</summary>
    public bool IsBeyondNoise => PointNow < PointThen - Allowed;

    /// <summary>
    /// Compares a margin and its noise recorded then (at confidence quantile <paramref name="zThen"/>) with one measured
    /// now (<paramref name="zNow"/>); null when either noise or the earlier margin is unknown, since nothing can then be
    /// said. A margin of −∞ now (a measurement that could not be made) counts as the worst point margin.
    /// </summary>
    public static MarginDecline? Compare(double marginThen, double noiseThen, double zThen, double marginNow, double noiseNow, double zNow)
    {
        if (!double.IsFinite(marginThen) || !double.IsFinite(noiseThen) || !double.IsFinite(noiseNow)) return null;
        var pointThen = marginThen + zThen * noiseThen;
        var pointNow = double.IsFinite(marginNow) ? marginNow + zNow * noiseNow : double.NegativeInfinity;
        return new(pointThen, pointNow, zNow * Math.Sqrt(noiseNow * noiseNow + noiseThen * noiseThen));
    }
}
