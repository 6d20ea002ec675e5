using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// The joint block as the calibration study sees it: its truth is the empirical law of the reference's stored
/// subsample, and a replica resamples both subsamples from it with replacement (the bootstrap, Efron 1979) — the
/// reference's at the stored size, the surrogate's at the size a check keeps (the block's subsample, or all events
/// when fewer) — and runs the real test (<see cref="JointCheck"/>) on them. The rows carry no weights, as the
/// subsample a check keeps carries none.
/// </summary>
internal sealed class JointReplica(JointSpec spec, double[][] rows)
{
    public JointSpec Spec { get; } = spec;
    public CheckSubject Subject { get; } = new JointSubject(spec);

    /// <summary>The contract's joint block matched to the reference's stored subsample; null without a block.</summary>
    public static JointReplica? Of(PrecisionContract contract, ReferenceHistograms reference)
    {
        // Only the energy test is replicated; the streamed tolerance checks are not (see CalibrationStudy).
        if (contract.Joint is not { Test: not null } spec) return null;
        var stored = reference.Joint is { } rj && rj.Features.SequenceEqual(spec.Features)
            ? rj
            : throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference holds no subsample of {spec.Name}; rebuild it with 'gatetasks reference build'.", spec.Location);
        return new JointReplica(spec, stored.Rows);
    }

    public (CheckSubject, CheckSpec, Measurement) Measure(long events, int familySize, DecisionSettings decision, Random rng)
    {
        var reference = Resample(rows.Length, rng);
        var sample = Resample((int)Math.Min(events, Spec.Subsample), rng);
        return (Subject, Spec.Test!, JointCheck.Evaluate(reference, Ones(reference.Length), sample, Ones(sample.Length), Spec, Spec.PermutationsFor(familySize, decision.FalseAlarm)));
    }

    /// <summary>Unit weights: the replicas resample rows as events of the law, each counting once.</summary>
    private static double[] Ones(int n) => Enumerable.Repeat(1.0, n).ToArray();

    private double[][] Resample(int n, Random rng)
    {
        var drawn = new double[n][];
        for (var i = 0; i < n; i++) drawn[i] = rows[rng.Next(rows.Length)];
        return drawn;
    }
}
