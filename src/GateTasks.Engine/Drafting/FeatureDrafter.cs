using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// Infers a column's kind and tolerances from its profile: a whole-number column with at most
/// <see cref="DraftOptions.MaxCategories"/> distinct values (and a span the reference can bin one category per value)
/// is discrete, whatever share its mode holds; a value holding at least
/// <see cref="DraftOptions.SpikeShare"/> of a continuous column's events is a declared spike; every other column is
/// continuous with equal-probability bins. Tolerances follow <see cref="PrecisionRule"/>.
/// </summary>
internal static class FeatureDrafter
{
    public static FeatureDraft Draft(ColumnProfile p, DraftOptions o)
    {
        var s = p.Summary;
        if (s.Count == 0) return Skipped(p, "no finite value in the trusted sample");
        if (s.Min == s.Max) return Skipped(p, $"takes the single value {InvariantNumber.Short(s.Min)}: nothing to compare");

        var rule = new PrecisionRule(o.DataEvents);
        // One category per whole number between the extremes is how a discrete reference is binned, so the span must fit too.
        if (p.Integral && p.DistinctWeights is { } distinct && distinct.Count <= o.MaxCategories
            && s.Max - s.Min + 1 <= References.ReferenceBuilder.MaxCategories)
        {
            // Categories holding under 1% are left out of the strictest-category rule, or one rare value would set it.
            var shares = distinct.Values.Select(w => w / p.FiniteSumW).ToList();
            var counted = shares.Where(x => x >= 0.01).DefaultIfEmpty(shares.Max()).ToList();
            var least = counted.MinBy(x => Math.Sqrt(x * (1 - x)));
            return new FeatureDraft(p.Column, FeatureKind.Discrete,
                $"discrete: whole numbers, {distinct.Count} distinct values (at most {o.MaxCategories} make categories)",
                null, null,
                // No ratio-max: one relative tolerance for every category would be set by the most populated one and be
                // far below what the rare ones' own noise allows; absolute fractions have no such spread.
                [(CheckKind.Fraction, null, rule.Fraction(o.CoreFraction, least, "the category of at least 1% with the smallest uncertainty"))], null);
        }

        double? spike = null;
        string? spikeReason = null;
        var tolerances = new List<(CheckKind, string?, DraftedTolerance)>();
        if (p.TopValue is { } top && p.TopShare >= o.SpikeShare && p.TopShare < 1)
        {
            spike = top;
            spikeReason = $"{InvariantNumber.Short(100 * p.TopShare)}% of the events hold exactly {InvariantNumber.Short(top)} (a spike from {InvariantNumber.Short(100 * o.SpikeShare)}%)";
            tolerances.Add((CheckKind.Fraction, null, rule.Fraction(o.CoreFraction, p.TopShare, "the spike's share")));
        }
        var why = !p.Integral ? "continuous: fractional values"
            : p.DistinctWeights is null ? $"continuous: whole numbers but more than {o.MaxCategories} distinct values"
            : $"continuous: whole numbers, {p.DistinctWeights.Count} distinct values, but spanning {InvariantNumber.Short(s.Max - s.Min + 1)} (one category each is too many)";
        tolerances.Add((CheckKind.BinRatio, ContractKeys.Core, rule.BinRatio(o.CoreFraction, o.Bins)));
        tolerances.Add((CheckKind.BinRatio, ContractKeys.Tails, rule.BinRatio(o.TailFraction, o.Bins)));
        tolerances.Add((CheckKind.KolmogorovSmirnov, null, rule.CdfDistance(o.CoreFraction)));
        tolerances.Add((CheckKind.MeanShift, null, rule.MeanShift(o.CoreFraction)));
        if (double.IsFinite(s.Kurtosis) && s.Kurtosis > 1)
            tolerances.Add((CheckKind.WidthRatio, null, rule.WidthRatio(o.CoreFraction, s.Kurtosis, spike is null ? "" : " (spike included)")));
        return new FeatureDraft(p.Column, FeatureKind.Continuous, why, spike, spikeReason, tolerances, null);
    }

    private static FeatureDraft Skipped(ColumnProfile p, string why) =>
        new(p.Column, FeatureKind.Continuous, "", null, null, [], why);
}
