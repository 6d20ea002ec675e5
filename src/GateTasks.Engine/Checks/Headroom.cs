using GateTasks.Engine.Contracts;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// How much of its tolerance a check uses, the figure a user reads after each retraining: <see cref="UpperShare"/> is
/// the one-sided upper bound over the tolerance (above 1: outside it), <see cref="PointShare"/> the point estimate over
/// the tolerance. For a goodness-of-fit test, which has no tolerance, the upper share is the test's level over its
/// adjusted p-value (1 where it would fail) and there is no point share. A measurement that could not be made uses
/// +∞. The same information as <see cref="Margin"/> (upper share = 1 − margin), on the scale reports print.
/// </summary>
internal readonly record struct Headroom(double UpperShare, double PointShare)
{
    /// <summary>The headroom of one outcome under the contract's decision settings.</summary>
    public static Headroom Of(CheckOutcome o, DecisionSettings decision) => FromMargin(Margin.Of(o, decision), decision.Confidence);

    /// <summary>
    /// From a margin and its noise, as the ledger records them: the point share lies z·noise below the upper share
    /// (noise = (upper − estimate) / z / tolerance, see <see cref="Margin"/>), z the one-sided normal quantile at
    /// <paramref name="confidence"/>.
    /// </summary>
    public static Headroom FromMargin(Margin m, double confidence)
    {
        var upper = 1 - m.Value;
        var z = Normal.InvCDF(0, 1, confidence);
        return new(upper, double.IsFinite(m.Noise) && double.IsFinite(upper) ? upper - z * m.Noise : double.NaN);
    }

    /// <summary>Whether the upper share is a number (false for an impossible measurement).</summary>
    public bool IsMeasured => double.IsFinite(UpperShare);
}
