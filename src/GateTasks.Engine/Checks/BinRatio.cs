using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// One bin's ratio of normalised contents, surrogate over reference, and what judging it needs. The uncertainty is
/// taken from the count expected under the ratio being judged, never from the observed surrogate content (an empty or
/// low surrogate bin would otherwise get no error at all): for a true ratio ρ, the surrogate's normalised content has
/// variance ρ·f/nₛ (f the reference's share of the bin, nₛ the surrogate's Kish effective size) and the reference's
/// share its own Σw²/(Σw)², so σ²(ρ) = ρ/(f·nₛ) + ρ²·Σw²ᵣ/(Σw)ᵣ². Large bins use this normal form (a score interval,
/// solved for ρ, as Wilson 1927 does for a proportion); bins with a small count use the exact conditional binomial
/// treatment of a ratio of Poisson means (<see cref="PoissonRatio"/>) on effective counts, each sample's Σw scaled by
/// its Σw/Σw² (Kish 1965; exact for unit weights, an approximation for weighted samples).
/// </summary>
internal readonly record struct BinRatio(double Ratio, double SigmaReference, double SigmaSurrogate)
{
    /// <summary>Below this many effective events in the two bins together, the bin is judged by the exact conditional binomial.</summary>
    public const double ExactBelow = 1000;

    /// <summary>The combined standard error of the ratio (at the ratio of a faithful surrogate, 1).</summary>
    public double Sigma => Math.Sqrt(SigmaReference * SigmaReference + SigmaSurrogate * SigmaSurrogate);

    /// <summary>The reference's share of its total weight in the bin.</summary>
    public double Share { get; init; }

    /// <summary>Σw²/(Σw)² of the reference bin: the relative variance of its share.</summary>
    public double ReferenceRelativeVariance { get; init; }

    /// <summary>The surrogate's Kish effective size.</summary>
    public double SurrogateEffective { get; init; }

    /// <summary>The reference's Kish effective size.</summary>
    public double ReferenceEffective { get; init; }

    /// <summary>The surrogate bin's effective count (Σw scaled by the sample's Σw/Σw², negative sums taken as 0).</summary>
    public double SurrogateCount { get; init; }

    /// <summary>The reference bin's effective count (Σw scaled by the reference's Σw/Σw²).</summary>
    public double ReferenceCount { get; init; }

    /// <summary>True when the bin is judged by the exact conditional binomial rather than its normal form.</summary>
    public bool Exact => SurrogateCount + ReferenceCount < ExactBelow;

    /// <summary>The reference and surrogate parts of the ratio's standard error if the true ratio were <paramref name="rho"/>.</summary>
    public (double Reference, double Surrogate) SigmaAt(double rho)
    {
        rho = Math.Max(rho, 0);
        return (rho * Math.Sqrt(ReferenceRelativeVariance), SurrogateEffective > 0 && Share > 0 ? Math.Sqrt(rho / (Share * SurrogateEffective)) : double.PositiveInfinity);
    }

    /// <summary>One-sided bounds on the true ratio at <paramref name="confidence"/> each (so both together at 2·confidence − 1).</summary>
    public (double Lower, double Upper) Bounds(double confidence)
    {
        if (Exact)
        {
            var (lo, hi) = PoissonRatio.Bounds(SurrogateCount, SurrogateCount + ReferenceCount, confidence);
            return (PoissonRatio.Ratio(lo, SurrogateEffective, ReferenceEffective), PoissonRatio.Ratio(hi, SurrogateEffective, ReferenceEffective));
        }
        // Score interval: the ρ with (r − ρ)² = z²·(ρ·a + ρ²·b).
        var z = Normal.InvCDF(0, 1, confidence);
        var r = Math.Max(Ratio, 0);
        var a = 1 / (Share * SurrogateEffective);
        var b = ReferenceRelativeVariance;
        var qa = 1 - z * z * b;
        if (!(qa > 0)) return (0, double.PositiveInfinity);
        var qb = 2 * r + z * z * a;
        var root = Math.Sqrt(Math.Max(0, qb * qb - 4 * qa * r * r));
        return (Math.Max(0, (qb - root) / (2 * qa)), (qb + root) / (2 * qa));
    }

    /// <summary>
    /// The p-value of "|ρ − 1| ≤ tolerance": the tail probability of the observed ratio at the nearer edge of that
    /// range (the least favourable ratio the hypothesis allows), with the uncertainty that edge implies.
    /// </summary>
    public double PValueWithin(double tolerance)
    {
        var high = 1 + tolerance;
        var low = 1 - tolerance;
        if (Ratio > high) return Exact ? PoissonRatio.UpperTail(SurrogateCount, SurrogateCount + ReferenceCount, PoissonRatio.Share(high, SurrogateEffective, ReferenceEffective)) : Tail(Ratio - high, high);
        if (low > 0 && Ratio < low) return Exact ? PoissonRatio.LowerTail(SurrogateCount, SurrogateCount + ReferenceCount, PoissonRatio.Share(low, SurrogateEffective, ReferenceEffective)) : Tail(low - Ratio, low);
        return 1;
    }

    private double Tail(double distance, double rho)
    {
        var (sr, ss) = SigmaAt(rho);
        var s = Math.Sqrt(sr * sr + ss * ss);
        return s > 0 ? Normal.CDF(0, 1, -distance / s) : 0;
    }

    /// <summary>
    /// The ratio in regular bin <paramref name="bin"/>, each histogram normalised by its total Σw (flows included);
    /// null when the reference bin holds no positive weight, where no ratio can be formed.
    /// </summary>
    public static BinRatio? Of(Histogram reference, Histogram surrogate, int bin)
    {
        var rw = reference.BinSumW(bin);
        if (!(rw > 0)) return null;
        double refTotal = reference.TotalSumW, refTotal2 = reference.TotalSumW2;
        double surTotal = surrogate.TotalSumW, surTotal2 = surrogate.TotalSumW2;
        var sw = surrogate.BinSumW(bin);
        var fraction = rw / refTotal;
        var ratio = surTotal > 0 ? sw / surTotal / fraction : 0;
        var surEffective = KishCount.Of(surTotal, surTotal2);
        var relRef = Math.Max(reference.BinSumW2(bin), 0) / (rw * rw);
        var expected = new BinRatio(ratio, 0, 0)
        {
            Share = fraction,
            ReferenceRelativeVariance = relRef,
            SurrogateEffective = surEffective,
            ReferenceEffective = KishCount.Of(refTotal, refTotal2),
            SurrogateCount = surTotal2 > 0 ? Math.Max(sw, 0) * surTotal / surTotal2 : 0,
            ReferenceCount = refTotal2 > 0 ? rw * refTotal / refTotal2 : 0,
        };
        // The plotted error: the one a faithful surrogate (ρ = 1) would have in this bin.
        var (sigmaRef, sigmaSur) = expected.SigmaAt(1);
        return expected with { SigmaReference = sigmaRef, SigmaSurrogate = sigmaSur };
    }
}
