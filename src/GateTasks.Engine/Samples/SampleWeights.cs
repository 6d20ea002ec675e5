using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>
/// What event weights must satisfy before a sample can be compared as a distribution. Single weights may be negative
/// (next-to-leading-order generators write them) or zero; what cannot be used is a sample whose weights sum to zero
/// or below, which has no normalisation, or one whose weights are all too small for their squares to be doubles.
/// </summary>
internal static class SampleWeights
{
    /// <summary>
    /// The smallest largest-weight magnitude accepted, 2^−511: below it every w² is below the smallest normal double
    /// (2^−1022), so Σw² — and with it the effective count (Σw)²/Σw² (Kish 1965) and every uncertainty — loses
    /// precision or becomes 0.
    /// </summary>
    /// <remarks>
    /// Every check compares normalised distributions and uses the effective count, both unchanged when all weights
    /// are multiplied by one constant; such a sample therefore means the same as its rescaled self, and rescaling
    /// would be the statistically right way to use it. It is refused with a clear error instead, because the scale
    /// would have to be chosen before the first event is read and be the same for every file and every shard merged
    /// later from partial files, which store Σw and Σw² as they are; and because physical event weights (cross
    /// sections in any unit, generator weights) are nowhere near 10^−154, so weights that small mean a unit or
    /// arithmetic error upstream that the user should see. Tiny weights among normal ones are used as they are: their
    /// squares' lost bits are far below the rounding of the larger terms.
    /// </remarks>
    public const double SmallestUsableMagnitude = 1.4916681462400413e-154; // 2^-511

    /// <summary>
    /// GATE2011 when the largest weight magnitude <paramref name="largest"/> seen in a pass over
    /// <paramref name="files"/> is non-zero but below <see cref="SmallestUsableMagnitude"/>.
    /// </summary>
    public static void RequireRepresentableSquares(double largest, string weightColumn, IReadOnlyList<string> files, SourceLocation where)
    {
        if (largest == 0 || largest >= SmallestUsableMagnitude) return;
        throw new GateInputException(ErrorCodes.SampleWeightsTooSmall,
            $"every weight in column '{weightColumn}' of {Describe(files)} is at most {InvariantNumber.Short(largest)} in magnitude: "
            + "the weights' squares fall below the smallest normal double (2.2E-308), so the effective event count and the "
            + "uncertainties cannot be computed; multiply the weights by a constant (the checks compare normalised "
            + "distributions, so a common factor changes nothing)",
            where);
    }

    /// <summary>
    /// GATE2010 when the weights of a whole sample (<paramref name="sumW"/>, <paramref name="sumW2"/> over
    /// <paramref name="events"/> events) sum to zero or below: there is no distribution to compare.
    /// </summary>
    public static void RequireNormalisable(double sumW, double sumW2, long events, string weightColumn, string what, IReadOnlyList<string> files, SourceLocation where)
    {
        if (sumW > 0) return;
        var why = sumW2 == 0
            ? $"every one of its {InvariantNumber.Count(events)} weights is 0"
            : $"its {InvariantNumber.Count(events)} weights sum to {InvariantNumber.Short(sumW)}";
        throw new GateInputException(ErrorCodes.SampleWeightsNotNormalisable,
            $"weight column '{weightColumn}' of the {what} ({Describe(files)}) cannot normalise it: {why}; "
            + "a sample's weights must sum to a positive total (single negative weights are allowed)",
            where);
    }

    private static string Describe(IReadOnlyList<string> files) =>
        files.Count == 1 ? $"'{files[0]}'" : $"{files.Count} files, '{files[0]}' first";
}
