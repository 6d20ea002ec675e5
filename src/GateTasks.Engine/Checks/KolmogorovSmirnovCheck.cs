using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Kolmogorov–Smirnov distance of the binned distributions (Kolmogorov 1933, Smirnov 1939) as an effect size, with
/// a confidence band from the Dvoretzky–Kiefer–Wolfowitz inequality with Massart's (1990) constant: each empirical
/// CDF is within ε(α) = √(ln(2/α)/2n) of its truth with probability 1 − α, so the true distance is within
/// ε₁ + ε₂ of the observed one (α split evenly). Weighted samples, negative weights included, enter at the effective
/// count of their CDF (<see cref="KolmogorovSmirnov.CdfEffectiveCount"/>: each boundary's variance from the cells'
/// Σw², delta method), an approximation: DKW is proven for unit weights.
/// </summary>
internal static class KolmogorovSmirnovCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var reference = c.Reference.Histogram;
        var d = KolmogorovSmirnov.BinnedDistance(reference.SumW, c.Surrogate.SumW);
        var n1 = KolmogorovSmirnov.CdfEffectiveCount(reference.SumW, reference.SumW2);
        var n2 = KolmogorovSmirnov.CdfEffectiveCount(c.Surrogate.SumW, c.Surrogate.SumW2);
        var alpha = 1 - decision.Confidence;
        var half = DkwBound.TwoSampleHalfWidth(n1, n2, alpha);
        // ε(α) = K·√ln(4/α) with K = (1/√n₁ + 1/√n₂)/√2, so "distance above tolerance" has p = 4·exp(−((D − tol)/K)²).
        var k = (1 / Math.Sqrt(n1) + 1 / Math.Sqrt(n2)) / Math.Sqrt(2);
        var p = d > spec.Tolerance ? Math.Min(1, 4 * Math.Exp(-Math.Pow((d - spec.Tolerance) / k, 2))) : 1.0;
        var upper = d + half;
        return new Measurement(d, Math.Max(0, d - half), upper, p,
            $"KS distance {InvariantNumber.Short(d)}, {Percent(decision)} band [{InvariantNumber.Short(Math.Max(0, d - half))}, {InvariantNumber.Short(upper)}], tolerance {InvariantNumber.Short(spec.Tolerance)}",
            [new("distance", InvariantNumber.Exact(d)), new("band_half_width", InvariantNumber.Exact(half)),
             new("reference_effective_events", InvariantNumber.Exact(n1)), new("sample_effective_events", InvariantNumber.Exact(n2))])
        {
            Band = new KsBand(d, n1, n2),
            PartsEvents = c.Surrogate.Entries,
        };
    }

    internal static string Percent(DecisionSettings d) => (d.Confidence * 100).ToString("0.#", System.Globalization.CultureInfo.InvariantCulture) + "%";
}
