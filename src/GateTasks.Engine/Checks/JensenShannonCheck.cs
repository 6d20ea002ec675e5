using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Jensen–Shannon divergence (Lin 1991, natural logarithm) of the normalised cell contents, flows included: bias-corrected
/// and judged against its own noise at the tolerance (<see cref="DistanceDecision"/>), errors by <see cref="HistogramBootstrap"/>.
/// </summary>
internal static class JensenShannonCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var reference = Cells.Of(c.Reference.Histogram);
        var surrogate = Cells.Of(c.Surrogate);
        if (reference.SumW.Any(w => w < 0) || surrogate.SumW.Any(w => w < 0))
            return Measurement.Impossible("a cell has a negative sum of weights, where a divergence of probabilities is undefined; use ratio-max or ks-max", []);
        static double Distance(double[] a, double[] b) => JensenShannon.Divergence(a, b);
        var value = Distance(reference.SumW, surrogate.SumW);
        var seed = HistogramBootstrap.Seed(c.Spec.Name, spec.Key);
        var (se, bias) = HistogramBootstrap.StandardErrorsAndBias(reference, surrogate, Distance, value, seed);
        var boundary = HistogramBootstrap.BoundaryReplicas(reference, surrogate, Distance, value, spec.Tolerance, seed);
        return DistanceDecision.Measure(value, bias, se, boundary, spec, decision, c.Surrogate.Entries,
            $"JS divergence {InvariantNumber.Short(Math.Max(0, value - bias))} nats", [new("divergence_nats", InvariantNumber.Exact(value))]);
    }
}
