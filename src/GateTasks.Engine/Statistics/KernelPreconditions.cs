using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Preconditions shared by the statistics kernels. An empty histogram and mismatched binnings are user-fixable input
/// (<see cref="GateInputException"/>); a non-finite value means the caller did not validate its data and is
/// reported as <see cref="ArgumentException"/>.
/// </summary>
internal static class KernelPreconditions
{
    internal static void RequireFinite(ReadOnlySpan<double> values, string what)
    {
        for (int i = 0; i < values.Length; i++)
        {
            if (!double.IsFinite(values[i]))
                throw new ArgumentException($"{what}[{i}] is {values[i].ToString(System.Globalization.CultureInfo.InvariantCulture)}; statistics need finite values.", what);
        }
    }

    internal static void RequireSameLength(int a, int b, string whatA, string whatB)
    {
        if (a != b)
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"{whatA} has {a} bins but {whatB} has {b}; the histograms must share their binning.");
    }

    /// <summary>
    /// Signed histogram contents (cells may hold negative sums of weights): finite with a positive total; returns the
    /// total. A total of zero or less leaves nothing to normalise by: the sample is empty as a distribution (a sample's
    /// total weight ≤ 0 is refused when it is read, GATE2010, so this guards direct callers).
    /// </summary>
    internal static double RequireSignedContents(ReadOnlySpan<double> contents, string what)
    {
        double sum = 0;
        for (int i = 0; i < contents.Length; i++)
        {
            double c = contents[i];
            if (!double.IsFinite(c))
                throw new ArgumentException($"{what}[{i}] is {c.ToString(System.Globalization.CultureInfo.InvariantCulture)}; bin contents must be finite.", what);
            sum += c;
        }
        if (!(sum > 0))
            throw new GateInputException(ErrorCodes.SampleEmpty,
                $"{what} has total weight {sum.ToString(System.Globalization.CultureInfo.InvariantCulture)}; a distribution needs a positive total.");
        return sum;
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

    /// <summary>Rows of one width (taken from the first row when <paramref name="width"/> is negative), none null, every value finite; returns the width.</summary>
    internal static int RequireRowShape(double[][] rows, string what, int width)
    {
        if (width < 0) width = rows.Length > 0 ? rows[0]?.Length ?? 0 : 0;
        if (width == 0)
            throw new ArgumentException($"{what}[0] has no features.", what);
        for (int i = 0; i < rows.Length; i++)
        {
            double[] row = rows[i] ?? throw new ArgumentException($"{what}[{i}] is null.", what);
            if (row.Length != width)
                throw new ArgumentException($"{what}[{i}] has {row.Length} features; expected {width}.", what);
            RequireFinite(row, $"{what}[{i}]");
        }
        return width;
    }

    /// <summary>Optional row weights: one per row, finite.</summary>
    internal static void RequireRowWeights(double[]? weights, int rows, string what)
    {
        if (weights is null) return;
        if (weights.Length != rows)
            throw new ArgumentException($"{what} has {weights.Length} weights for {rows} rows.", what);
        RequireFinite(weights, what);
    }
}
