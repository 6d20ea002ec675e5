using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Preconditions shared by the statistics kernels. Empty samples and bad weights are user-fixable input
/// (<see cref="GateInputException"/>); a non-finite value or mismatched lengths mean the caller did not
/// validate its data and are reported as <see cref="ArgumentException"/>.
/// </summary>
internal static class SampleChecks
{
    internal static void RequireNonEmpty(ReadOnlySpan<double> values, string what)
    {
        if (values.IsEmpty)
            throw new GateInputException(ErrorCodes.SampleEmpty, $"{what} has no entries; a statistic needs at least one.");
    }

    internal static void RequireFinite(ReadOnlySpan<double> values, string what)
    {
        for (int i = 0; i < values.Length; i++)
        {
            if (!double.IsFinite(values[i]))
                throw new ArgumentException($"{what}[{i}] is {values[i].ToString(System.Globalization.CultureInfo.InvariantCulture)}; statistics need finite values.", what);
        }
    }

    /// <summary>Weights must be finite and non-negative with a positive sum; returns the sum.</summary>
    internal static double RequireWeights(ReadOnlySpan<double> weights, int expectedLength, string what)
    {
        if (weights.Length != expectedLength)
            throw new ArgumentException($"{what} has {weights.Length} entries but its sample has {expectedLength}.", what);
        double sum = 0;
        for (int i = 0; i < weights.Length; i++)
        {
            double w = weights[i];
            if (!double.IsFinite(w) || w < 0)
                throw new GateInputException(ErrorCodes.SampleBadWeight,
                    $"{what}[{i}] is {w.ToString(System.Globalization.CultureInfo.InvariantCulture)}; this statistic needs finite, non-negative weights.");
            sum += w;
        }
        if (!(sum > 0))
            throw new GateInputException(ErrorCodes.SampleBadWeight, $"{what} sum to zero; there is no distribution to compare.");
        return sum;
    }

    internal static void RequireSameLength(int a, int b, string whatA, string whatB)
    {
        if (a != b)
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"{whatA} has {a} bins but {whatB} has {b}; the histograms must share their binning.");
    }

    /// <summary>Histogram contents: finite and non-negative with a positive total; returns the total.</summary>
    internal static double RequireContents(ReadOnlySpan<double> contents, string what)
    {
        double sum = 0;
        for (int i = 0; i < contents.Length; i++)
        {
            double c = contents[i];
            if (!double.IsFinite(c) || c < 0)
                throw new ArgumentException($"{what}[{i}] is {c.ToString(System.Globalization.CultureInfo.InvariantCulture)}; bin contents must be finite and non-negative.", what);
            sum += c;
        }
        if (!(sum > 0))
            throw new GateInputException(ErrorCodes.SampleEmpty, $"{what} is empty (total content 0).");
        return sum;
    }

    internal static double[] SortedCopy(ReadOnlySpan<double> values, string what)
    {
        RequireNonEmpty(values, what);
        RequireFinite(values, what);
        double[] copy = values.ToArray();
        Array.Sort(copy);
        return copy;
    }

    /// <summary>Sorted copy of values with their weights carried along; returns the weight total.</summary>
    internal static double SortedWeightedCopy(ReadOnlySpan<double> values, ReadOnlySpan<double> weights, string what,
        out double[] sortedValues, out double[] sortedWeights)
    {
        RequireNonEmpty(values, what);
        RequireFinite(values, what);
        double total = RequireWeights(weights, values.Length, what + " weights");
        sortedValues = values.ToArray();
        sortedWeights = weights.ToArray();
        Array.Sort(sortedValues, sortedWeights);
        return total;
    }

    /// <summary>The values sorted with their weights (unit weights when none are given), and the total weight.</summary>
    internal static (double[] Values, double[] Weights, double Total) SortedWithWeights(ReadOnlySpan<double> values,
        ReadOnlySpan<double> weights, string what)
    {
        if (weights.IsEmpty)
        {
            double[] sorted = SortedCopy(values, what);
            var unit = new double[sorted.Length];
            Array.Fill(unit, 1.0);
            return (sorted, unit, sorted.Length);
        }
        double total = SortedWeightedCopy(values, weights, what, out double[] v, out double[] w);
        return (v, w, total);
    }
}
