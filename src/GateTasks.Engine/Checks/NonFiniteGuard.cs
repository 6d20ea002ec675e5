using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Refuses a surrogate sample whose features hold NaN or infinite values where the contract does not allow them
/// (GATE2008, at the feature's line): such values come from a broken model or derivation, and counting them apart
/// without a word would let them pass unseen.
/// </summary>
internal static class NonFiniteGuard
{
    public static void Verify(PrecisionContract contract, AccumulatedSample accumulation)
    {
        var offending = Enumerable.Range(0, contract.Features.Count)
            .Where(i => !contract.Features[i].AllowNonFinite && accumulation.Features[i].Summary.NonFiniteCount > 0)
            .ToList();
        if (offending.Count == 0) return;

        var first = contract.Features[offending[0]];
        var s = accumulation.Features[offending[0]].Summary;
        var parts = new List<string>();
        if (s.NanCount > 0) parts.Add($"{InvariantNumber.Count(s.NanCount)} NaN");
        if (s.PositiveInfinityCount > 0) parts.Add($"{InvariantNumber.Count(s.PositiveInfinityCount)} +∞");
        if (s.NegativeInfinityCount > 0) parts.Add($"{InvariantNumber.Count(s.NegativeInfinityCount)} −∞");
        var others = offending.Count == 1 ? ""
            : $" (and so do {string.Join(", ", offending.Skip(1).Select(i => $"'{contract.Features[i].Name}'"))})";
        throw new GateInputException(ErrorCodes.SampleNonFinite,
            $"Feature '{first.Name}' holds {string.Join(", ", parts)} among {InvariantNumber.Count(s.Count + s.NonFiniteCount)} values of the surrogate sample{others}. " +
            "A surrogate should emit finite values: fix the model or the derivation, or set 'non-finite: allow' on the feature (or under defaults) " +
            "to count them apart (NaN outside every bin, ±∞ in the flow cells, neither in the moments).",
            first.NonFiniteLocation ?? first.Location);
    }
}
