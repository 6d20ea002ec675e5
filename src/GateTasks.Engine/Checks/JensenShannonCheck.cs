using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>Jensen–Shannon divergence (Lin 1991, natural logarithm) of the normalised cell contents, flows included.</summary>
internal static class JensenShannonCheck
{
    public static CheckOutcome Evaluate(FeatureComparison c, Contracts.CheckSpec spec)
    {
        var jsd = JensenShannon.Divergence(c.Reference.Histogram.Storage.SumW, c.Surrogate.Storage.SumW);
        return CheckOutcome.Decide(c.Spec, spec, jsd,
            $"JS divergence {InvariantNumber.Short(jsd)} {(jsd <= spec.Limit ? "≤" : ">")} {InvariantNumber.Short(spec.Limit)} nats",
            [new("divergence_nats", InvariantNumber.Exact(jsd))]);
    }
}
