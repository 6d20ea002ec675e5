using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Two-sample Kolmogorov–Smirnov test of the binned distributions with the Kolmogorov limiting distribution at
/// the effective counts of the two CDFs (<see cref="KolmogorovSmirnov.CdfEffectiveCount"/>; signed weights allowed;
/// binning makes it conservative). A goodness-of-fit test: its p-value joins the family.
/// </summary>
internal static class KolmogorovSmirnovTestCheck
{
    public static Measurement Evaluate(FeatureComparison c)
    {
        var reference = c.Reference.Histogram;
        var d = KolmogorovSmirnov.BinnedDistance(reference.SumW, c.Surrogate.SumW);
        var p = KolmogorovSmirnov.BinnedPValue(d,
            KolmogorovSmirnov.CdfEffectiveCount(reference.SumW, reference.SumW2),
            KolmogorovSmirnov.CdfEffectiveCount(c.Surrogate.SumW, c.Surrogate.SumW2));
        return new Measurement(d, double.NaN, double.NaN, p,
            $"KS distance {InvariantNumber.Short(d)}, p-value {InvariantNumber.Short(p)}",
            [new("distance", InvariantNumber.Exact(d))]);
    }
}
