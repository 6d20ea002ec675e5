using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// What must hold between the numbers of an accumulation whatever the sample was: counts are not negative, every
/// feature's histogram (with its NaN and spike tallies) counts each event once and its cells add up to the event
/// totals, Σw² is never negative, with unit weights Σw and Σw² are the same whole counts, without negative weights
/// no cell's Σw² exceeds its (Σw)², and (Σw)² never exceeds N·Σw². A partial file read back is checked with it, so a
/// number edited by hand (and resealed) is caught unless every number it touches was edited to match.
/// </summary>
internal static class AccumulationConsistency
{
    /// <summary>
    /// Cells and totals are the same weights summed in other groupings (each batch in doubles, then exactly), so they agree
    /// to rounding: below n·ε·Σ|w| for a batch of n ≤ 65 536 rows (Higham 2002, Accuracy and Stability of Numerical
    /// Algorithms, §4.2), about 1e-11 relative. 1e-9 leaves room and still catches a changed digit.
    /// </summary>
    private const double Relative = 1e-9;

    /// <summary>What contradicts what, or null when the numbers fit together.</summary>
    public static string? Find(PrecisionContract contract, AccumulatedSample a)
    {
        var unit = contract.Sample.Weight is null;
        var positive = a.NegativeWeightEvents == 0;
        if (a.Events < 0) return $"the event total is negative ({a.Events})";
        if (a.NegativeWeightEvents < 0 || a.NegativeWeightEvents > a.Events)
            return $"{a.NegativeWeightEvents} events with a negative weight out of {a.Events}";
        if (unit && a.NegativeWeightEvents != 0) return $"{a.NegativeWeightEvents} events with a negative weight, but the contract weighs no event";
        if (!(a.SumW2 >= 0)) return $"the total Σw² is negative ({N(a.SumW2)})";
        if (unit && (a.SumW != a.Events || a.SumW2 != a.Events))
            return $"with unit weights Σw and Σw² equal the event total {a.Events}, here Σw = {N(a.SumW)} and Σw² = {N(a.SumW2)}";
        if (positive && (a.SumW < 0 || Exceeds(a.SumW2, a.SumW * a.SumW)))
            return $"without negative weights the total Σw² is at most (Σw)², here Σw = {N(a.SumW)} and Σw² = {N(a.SumW2)}";
        // Cauchy–Schwarz: (Σw)² ≤ N·Σw² for any weights (the effective number of events never exceeds the number).
        if (Exceeds(a.SumW * a.SumW, a.Events * a.SumW2))
            return $"(Σw)² = {N(a.SumW * a.SumW)} exceeds N·Σw² = {N(a.Events * a.SumW2)}: more effective events than events";
        // Σ|w| ≤ √(N·Σw²) (Cauchy–Schwarz again): the scale of every rounding error of a sum of these weights.
        var toleranceW = unit ? 0 : Relative * Math.Sqrt(a.Events * a.SumW2);
        var toleranceW2 = unit ? 0 : Relative * a.SumW2;

        for (var i = 0; i < contract.Features.Count; i++)
        {
            var feature = contract.Features[i];
            var name = $"feature '{feature.Name}'";
            var h = a.Features[i].Histogram;
            var spike = a.Features[i].Spike;
            var spikeEntries = spike?.Entries ?? 0;
            if (h.Entries < 0 || h.NanEntries < 0 || h.NanEntries > h.Entries || spikeEntries < 0)
                return $"{name} counts {h.Entries} values, {h.NanEntries} of them NaN, and {spikeEntries} at its spike";
            var counted = h.Entries + spikeEntries;
            // A feature with a condition of its own counts only the events that pass it.
            if (feature.Condition is null ? counted != a.Events : counted > a.Events)
                return $"{name} counts {counted} events (histogram {h.Entries}, spike {spikeEntries}), the event total is {a.Events}";
            var summary = a.Features[i].Summary;
            if (summary.Count < 0 || summary.Count + summary.NonFiniteCount != h.Entries)
                return $"{name}: its moments count {summary.Count + summary.NonFiniteCount} values, its histogram {h.Entries}";

            double sumW = 0, sumW2 = 0;
            for (var c = 0; c < h.SumW.Length; c++)
            {
                if (Cell(h.SumW[c], h.SumW2[c], unit, positive) is { } problem) return $"{name}, cell {c}: {problem}";
                sumW += h.SumW[c];
                sumW2 += h.SumW2[c];
            }
            if (Cell(h.NanSumW, h.NanSumW2, unit, positive) is { } nanProblem) return $"{name}, NaN values: {nanProblem}";
            if (unit && h.NanSumW != h.NanEntries) return $"{name}: {h.NanEntries} NaN values weigh {N(h.NanSumW)} with unit weights";
            if (spike is not null && Cell(spike.SumW, spike.SumW2, unit, positive) is { } spikeProblem) return $"{name}, spike: {spikeProblem}";
            sumW += h.NanSumW + (spike?.SumW ?? 0);
            sumW2 += h.NanSumW2 + (spike?.SumW2 ?? 0);
            if (feature.Condition is null && (Math.Abs(sumW - a.SumW) > toleranceW || Math.Abs(sumW2 - a.SumW2) > toleranceW2))
                return $"{name}: its cells hold Σw = {N(sumW)} and Σw² = {N(sumW2)}, the totals are Σw = {N(a.SumW)} and Σw² = {N(a.SumW2)}";
            if (a.Features[i].FarTail is { } tail && !(tail.BelowW2 >= 0 && tail.AboveW2 >= 0 && tail.TotalW2 >= 0))
                return $"{name}: a far-tail Σw² is negative";
        }

        foreach (var pair in a.Pairs)
        {
            if (pair.Cells is not { } cells) continue;
            for (var c = 0; c < cells.SumW.Length; c++)
                if (Cell(cells.SumW[c], cells.SumW2[c], unit, positive) is { } problem) return $"pair {pair.Spec.Name}, 2-D cell {c}: {problem}";
        }

        if (a.JointMoments is { } moments && (moments.Rows + moments.Skipped != a.Events
                || moments.Moments is { } m && m.Count > moments.Rows || moments.Kernel is { } k && k.Sum(s => s.Count) != (moments.KernelRows ?? moments.Rows) || moments.KernelRows > moments.Rows))
            return $"the joint moments hold {moments.Rows} rows and {moments.Skipped} skipped, the event total is {a.Events}";
        if (a.Sliced is { } sliced && (sliced.Rows < 0 || sliced.Skipped < 0 || sliced.Rows + sliced.Skipped != a.Events))
            return $"the sliced histograms hold {sliced.Rows} rows and {sliced.Skipped} skipped, the event total is {a.Events}";
        return null;
    }

    private static string? Cell(double sumW, double sumW2, bool unit, bool positive)
    {
        if (!(sumW2 >= 0)) return $"Σw² = {N(sumW2)} is negative";
        if (unit && (sumW != sumW2 || sumW < 0 || sumW != Math.Floor(sumW)))
            return $"with unit weights Σw and Σw² are the same whole count, here Σw = {N(sumW)} and Σw² = {N(sumW2)}";
        if (positive && (sumW < 0 || Exceeds(sumW2, sumW * sumW)))
            return $"without negative weights Σw ≥ 0 and Σw² ≤ (Σw)², here Σw = {N(sumW)} and Σw² = {N(sumW2)}";
        return null;
    }

    // a > b beyond rounding.
    private static bool Exceeds(double a, double b) => a > b * (1 + Relative) + double.Epsilon;

    private static string N(double v) => InvariantNumber.Short(v);
}
