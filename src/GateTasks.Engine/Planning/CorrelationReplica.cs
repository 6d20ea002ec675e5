using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Planning;

/// <summary>
/// A declared pair's correlation checks as the plan simulates them. Each coefficient of a replica — a fresh reference
/// of the reference's effective size and a surrogate of n events — is drawn from its large-sample normal law about the
/// reference's value, with the variance the check itself uses: n·Var(r) from the fourth moments of every reference
/// event (<see cref="Statistics.WeightedCorrelation.AsymptoticVariance"/>; Hsu 1949, Steiger &amp; Hakstian 1982), so
/// a heavy-tailed pair is planned at its true spread. The drawn coefficients are then measured by the check's own code
/// (<see cref="CorrelationCheck"/>). A drift moves the surrogate's coefficients towards zero by its size (past zero if larger).
/// </summary>
internal sealed class CorrelationReplica
{
    private readonly ReferenceCorrelation _stored;

    private CorrelationReplica(CorrelationSpec spec, ReferenceCorrelation stored)
    {
        Spec = spec;
        Subject = new PairSubject(spec);
        _stored = stored;
    }

    public CorrelationSpec Spec { get; }
    public CheckSubject Subject { get; }

    /// <summary>The pair's tolerance checks (Pearson, Spearman), in the order <see cref="Measure"/> gives them.</summary>
    public IReadOnlyList<ToleranceCheck> Checks => new[] { Spec.Pearson, Spec.Spearman }.OfType<ToleranceCheck>().ToList();

    /// <summary>Every declared pair with a tolerance check, matched to the reference.</summary>
    public static IReadOnlyList<CorrelationReplica> All(PrecisionContract contract, ReferenceHistograms reference) =>
        contract.Pairs.Where(p => p.Pearson is not null || p.Spearman is not null).Select(p => new CorrelationReplica(p,
            reference.FindPair(p.First, p.Second) ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference holds no correlation for {p.Name}; rebuild it with 'gatetasks reference build'.", p.Location))).ToList();

    /// <summary>The largest drift searched: a coefficient moved by 1 (from 0.5 to −0.5, say).</summary>
    public const double LargestDrift = 1.0;

    /// <summary>Draws one replica of <paramref name="events"/> surrogate events and measures the pair's tolerance checks.</summary>
    public IEnumerable<(CheckSubject, CheckSpec, Measurement)> Measure(double drift, long events, DecisionSettings decision, Random rng)
    {
        var referenceEvents = Math.Max(4, _stored.EffectiveCount);
        double Draw(double value, double variance, double n) =>
            Math.Clamp(value + Math.Sqrt(Math.Max(variance, 0) / n) * Normal.Sample(rng, 0, 1), -1, 1);
        // Towards zero (and past it when the drift is larger): the coefficient differs from the reference's by the drift.
        double Moved(double value) => value - (value < 0 ? -drift : drift);
        var reference = _stored with
        {
            Pearson = Draw(_stored.Pearson, _stored.PearsonVariance, referenceEvents),
            Spearman = Draw(_stored.Spearman, _stored.SpearmanVariance, referenceEvents),
        };
        var sample = new AccumulatedPair(Spec, Draw(Moved(_stored.Pearson), _stored.PearsonVariance, events),
            Draw(Moved(_stored.Spearman), _stored.SpearmanVariance, events), events, _stored.PearsonVariance, _stored.SpearmanVariance, null);
        return Checks.Select(check => (Subject, (CheckSpec)check, CorrelationCheck.Evaluate(reference, sample, check, decision, events)));
    }

    /// <summary>The effect a drift makes without noise: the coefficients differ from the reference's by it.</summary>
    public static double Effect(double drift) => drift;
}
