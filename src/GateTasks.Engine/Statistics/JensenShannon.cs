namespace GateTasks.Engine.Statistics;

/// <summary>
/// Jensen–Shannon divergence (Lin 1991, IEEE Trans. Inf. Theory 37:145):
/// JSD(P, Q) = ½ KL(P ‖ M) + ½ KL(Q ‖ M), M = ½(P + Q), with 0·log 0 = 0.
/// Bounded by log_b 2; its square root is a metric (Endres &amp; Schindelin 2003).
/// </summary>
internal static class JensenShannon
{
    /// <summary>
    /// JSD of two non-negative, unnormalised vectors (each normalised to unit sum here), in units of
    /// log base <paramref name="logBase"/> (e: nats, 2: bits). Returns the divergence, not its root.
    /// </summary>
    internal static double Divergence(ReadOnlySpan<double> p, ReadOnlySpan<double> q, double logBase = Math.E)
    {
        KernelPreconditions.RequireSameLength(p.Length, q.Length, nameof(p), nameof(q));
        if (!(logBase > 0) || logBase == 1 || double.IsInfinity(logBase))
            throw new ArgumentOutOfRangeException(nameof(logBase), "The log base must be positive, finite and not 1.");
        double tp = KernelPreconditions.RequireContents(p, nameof(p));
        double tq = KernelPreconditions.RequireContents(q, nameof(q));
        double sum = 0;
        for (int i = 0; i < p.Length; i++)
        {
            double pi = p[i] / tp, qi = q[i] / tq;
            double mi = 0.5 * (pi + qi);
            if (pi > 0) sum += pi * Math.Log(pi / mi);
            if (qi > 0) sum += qi * Math.Log(qi / mi);
        }
        // Rounding can leave a tiny negative value for identical inputs.
        return Math.Max(0.0, 0.5 * sum / Math.Log(logBase));
    }
}
