namespace GateTasks.Engine.Checks;

/// <summary>
/// Splits a two-sample standard error into its reference and sample parts in proportion to each side's 1/n_eff, the
/// leading order of a smooth statistic's variance from two independent samples, so that <see cref="NeededEvents"/> can
/// let the sample's part shrink as the sample grows. The split is an estimate for planning; the decision uses the total.
/// </summary>
internal static class JointErrorSplit
{
    /// <summary>The reference and sample parts of <paramref name="standardError"/> (their squares add up to its square).</summary>
    public static (double Reference, double Sample) Of(double standardError, double referenceEffective, double sampleEffective)
    {
        var r = referenceEffective > 0 ? 1 / referenceEffective : 0;
        var s = sampleEffective > 0 ? 1 / sampleEffective : 0;
        if (!(r + s > 0)) return (0, standardError);
        return (standardError * Math.Sqrt(r / (r + s)), standardError * Math.Sqrt(s / (r + s)));
    }
}
