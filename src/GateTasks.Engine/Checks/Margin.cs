using GateTasks.Engine.Contracts;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// How far inside its tolerance a check landed, on one scale for every check so that checks and candidate samples can
/// be compared: 1 is perfect agreement, 0 the edge of the tolerance, negative outside it.
/// Effect checks: 1 − upper bound / tolerance, with the noise of the estimate in the same units, σ/tolerance (σ from
/// the distance between the estimate and its one-sided upper bound, estimate + z·σ). Goodness-of-fit tests:
/// 1 − level / adjusted p-value (0 where the test fails, near 1 far from significance), with no noise figure: under
/// the null a p-value spreads over the whole unit interval. A measurement that could not be made has margin −∞.
/// </summary>
internal readonly record struct Margin(double Value, double Noise)
{
    /// <summary>The margin of one outcome under the contract's decision settings.</summary>
    public static Margin Of(CheckOutcome o, DecisionSettings decision)
    {
        var m = o.Measured;
        if (o.Check is ToleranceCheck { Tolerance: var t } && double.IsFinite(t) && t > 0)
        {
            if (!double.IsFinite(m.Upper) || !double.IsFinite(m.Estimate)) return new(double.NegativeInfinity, double.NaN);
            var z = Normal.InvCDF(0, 1, decision.Confidence);
            return new(1 - m.Upper / t, Math.Max(0, m.Upper - m.Estimate) / z / t);
        }
        if (double.IsNaN(m.PValue)) return new(double.NegativeInfinity, double.NaN);
        return o.AdjustedPValue > 0 ? new(1 - o.Level / o.AdjustedPValue, double.NaN) : new(double.NegativeInfinity, double.NaN);
    }
}
