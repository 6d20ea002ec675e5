using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// One number per run for comparing candidates: the Fréchet distance of the contract's joint block (a contract has at
/// most one), extrapolated to infinite size, with its delete-one-block jackknife standard error — the same estimate
/// as the block's <c>frechet-max</c> check (<see cref="FrechetExtrapolation"/>; Kansal et al. 2023), computed whether
/// or not that check is stated. Information, not a verdict: it never changes the run's outcome. Lower is closer to
/// the reference; the extrapolated value may fall below zero by noise. Absent (with the reason) when the contract has
/// no joint block, when the reference keeps no covariance moments of it, or when the distance cannot be computed.
/// </summary>
/// <param name="Covers">What the score measures, e.g. <c>Fréchet distance of joint(a,b)</c>; empty when absent.</param>
/// <param name="Value">The extrapolated distance, or NaN when absent.</param>
/// <param name="StandardError">Its jackknife standard error, or NaN when absent.</param>
/// <param name="Absence">Why there is no score, or null when there is one.</param>
internal sealed record GlobalScore(string Covers, double Value, double StandardError, string? Absence)
{
    /// <summary>What a contract without a joint block reports.</summary>
    public static readonly GlobalScore NoJointBlock = Absent("no joint block");

    /// <summary>True when there is a score.</summary>
    public bool HasValue => Absence is null;

    /// <summary>No score, for <paramref name="reason"/>.</summary>
    public static GlobalScore Absent(string reason) => new("", double.NaN, double.NaN, reason);

    /// <summary>One line for people: <c>global score 0.0123 ± 0.0045 (Fréchet distance of joint(a,b))</c>, or <c>no global score (reason)</c>.</summary>
    public string Text => HasValue
        ? $"global score {InvariantNumber.Short(Value)} ± {InvariantNumber.Short(StandardError)} ({Covers}; lower is closer, not a verdict)"
        : $"no global score ({Absence})";

    /// <summary>
    /// The score of <paramref name="joint"/> from the reference's stored moments (<paramref name="reference"/>, null when it
    /// keeps none of this block) and the sample's (<paramref name="sample"/>).
    /// </summary>
    /// <remarks><paramref name="computed"/>, when given, is the estimate of these same moments that the block's <c>frechet-max</c> check reads.</remarks>
    public static GlobalScore Of(JointSpec? joint, AccumulatedJointMoments? reference, AccumulatedJointMoments? sample, Lazy<FrechetEstimate>? computed = null)
    {
        if (joint is null) return NoJointBlock;
        if (reference?.Moments is not { } r)
            return Absent($"the reference keeps no covariance moments of {joint.Name}; rebuild it with 'gatetasks reference build'");
        if (sample?.Moments is not { } s || sample.Rows == 0)
            return Absent($"the sample has no row with every feature of {joint.Name} finite");
        FrechetEstimate estimate;
        try
        {
            estimate = computed?.Value ?? FrechetExtrapolation.Of(r, s);
        }
        catch (ArgumentException e)
        {
            return Absent($"the Fréchet distance of {joint.Name} cannot be computed: {e.Message}");
        }
        if (!double.IsFinite(estimate.Extrapolated) || !double.IsFinite(estimate.StandardError))
            return Absent($"some block of {joint.Name} has no defined Gaussian fit (too few rows, or event weights that cancel)");
        return new GlobalScore($"Fréchet distance of {joint.Name}", estimate.Extrapolated, estimate.StandardError, null);
    }
}
