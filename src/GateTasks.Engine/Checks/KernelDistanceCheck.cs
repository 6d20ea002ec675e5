using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// <c>kernel-distance-max</c>: the unbiased squared maximum mean discrepancy (Gretton et al. 2012, JMLR 13:723;
/// Bińkowski et al. 2018, ICLR) with the cubic polynomial kernel (x·y/d + 1)³ of Kansal et al. (2023, Phys. Rev. D
/// 107, 076017), between the standardised joint features of reference and sample, each event with its weight, from
/// feature-map sums (<see cref="UnbiasedKernelDistance.FromSums"/>): the reference's over every row, the sample's over
/// its seeded subsample of at most K rows (<see cref="KernelSubsample"/>, <c>kernel-rows</c>). Its standard error is
/// that of the <see cref="Accumulation.JointMoments.Blocks"/> block estimates (block b of the reference against block b
/// of the subsample, both sides' noise in each): their standard deviation over √B, right when the laws differ and
/// conservative when they agree (<see cref="KernelDistanceEstimate.BlockStandardError"/>). Decided as every tolerance check.
/// <para>
/// Why the subsample keeps the estimate unbiased. MMD²ᵤ = K̄xx + K̄yy − 2K̄xy is a sum of three means, each normalised
/// by its own weights: K̄xx over the reference's pairs i ≠ j, K̄yy over the subsample's pairs i ≠ j (Σ_{i≠j} wᵢwⱼ k /
/// Σ_{i≠j} wᵢwⱼ, from the subsample's sums alone), K̄xy over every reference row against every subsample row
/// (Σ wᵢvⱼ k / (Σw · Σv), each Σ over its own rows). The rows are kept by a hash of their values, a function blind to
/// the order and to anything the reference holds; for rows drawn independently from the sample's law the kept rows are
/// then themselves a draw from that law (a simple random sample of the distinct rows, hash values acting as
/// independent uniform keys), independent of the reference. So E[K̄yy] is the sample law's within-pair mean (a
/// U-statistic on the kept rows, Hoeffding 1948) and E[K̄xy] the cross mean, as with every row; only the variance grows,
/// and the block estimates, cut from the subsample by other bits of the same hash, carry it. Rows with equal values
/// are kept or dropped together, which is exact when the joint rows take at most K distinct values (every row is then
/// kept) and for continuous features, where rows are distinct.
/// </para>
/// </summary>
internal static class KernelDistanceCheck
{
    public static Measurement Evaluate(AccumulatedJointMoments reference, AccumulatedJointMoments sample, ToleranceCheck spec, DecisionSettings decision, long sampleEvents)
    {
        if (reference.Kernel is not { } r || sample.Kernel is not { } s || r.Count != s.Count || r.Count < 2)
            return Measurement.Impossible("no joint kernel sums were gathered", []);
        var d = r[0].Width;
        var blocks = r.Count;
        var estimates = new double[blocks];
        double full;
        var (referenceAll, sampleAll) = (new CubicKernelFeatureSums(d), new CubicKernelFeatureSums(d));
        try
        {
            for (var b = 0; b < blocks; b++)
            {
                estimates[b] = UnbiasedKernelDistance.FromSums(r[b], s[b]);
                referenceAll.Merge(r[b]);
                sampleAll.Merge(s[b]);
            }
            full = UnbiasedKernelDistance.FromSums(referenceAll, sampleAll);
        }
        catch (ArgumentException e)
        {
            return Measurement.Impossible(
                $"a block's kernel means are undefined ({InvariantNumber.Count(reference.Rows)} reference and {InvariantNumber.Count(sample.Rows)} sample rows in {blocks} blocks): {e.Message}", []);
        }
        var mean = estimates.Average();
        var sd = Math.Sqrt(estimates.Sum(e => (e - mean) * (e - mean)) / (blocks - 1));
        var se = sd / Math.Sqrt(blocks);
        var details = new List<KeyValuePair<string, string>>
        {
            new("standard_error", InvariantNumber.Exact(se)),
            new("block_mean", InvariantNumber.Exact(mean)), new("blocks", InvariantNumber.Count(blocks)),
            new("reference_rows", InvariantNumber.Count(reference.Rows)), new("sample_rows", InvariantNumber.Count(sample.Rows)),
            new("sample_rows_skipped", InvariantNumber.Count(sample.Skipped)),
            new("kernel_sample_rows", InvariantNumber.Count(sample.KernelRows ?? sample.Rows)),
        };
        if (sample.KernelLimit is { } limit) details.Add(new("kernel_rows_limit", InvariantNumber.Count(limit)));
        if (!double.IsFinite(full) || !double.IsFinite(se))
            return Measurement.Impossible("the kernel sums overflow (standardised features too far out)", details);
        var (seReference, seSample) = JointErrorSplit.Of(se,
            KishCount.Of(referenceAll.WeightSum, referenceAll.WeightSquareSum), KishCount.Of(sampleAll.WeightSum, sampleAll.WeightSquareSum));
        var effect = new EffectIntersection(spec.Tolerance, decision, sampleEvents);
        effect.Add(full, seReference, seSample);
        return effect.ToMeasurement(full,
            $"kernel distance (unbiased MMD², cubic kernel) {InvariantNumber.Short(full)} ± {InvariantNumber.Short(se)}, sample side on {InvariantNumber.Count(sample.KernelRows ?? sample.Rows)} of {InvariantNumber.Count(sample.Rows)} rows, " +
            $"upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }
}
