using System.Globalization;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Multiple-testing corrections for the family of checks in one gate: Holm (1979) step-down,
/// Benjamini &amp; Hochberg (1995) step-up, Bonferroni. Adjusted p-values are returned in input order and
/// capped at 1; a test is rejected when its adjusted p-value is at most the level. Tied p-values always get
/// the same adjusted value, whichever order they arrive in.
/// </summary>
internal static class MultipleTesting
{
    /// <summary>Adjusted p-values, in the order of <paramref name="pValues"/>.</summary>
    /// <exception cref="ArgumentException">A p-value is NaN or outside [0, 1].</exception>
    internal static double[] Adjust(ReadOnlySpan<double> pValues, MultipleTestingMethod method)
    {
        RequirePValues(pValues);
        int m = pValues.Length;
        var adjusted = new double[m];
        switch (method)
        {
            case MultipleTestingMethod.Bonferroni:
                for (int i = 0; i < m; i++)
                    adjusted[i] = Math.Min(1.0, m * pValues[i]);
                break;
            case MultipleTestingMethod.Holm:
            {
                // p̃_(j) = max_{i ≤ j} min(1, (m − i + 1) p_(i)): the running maximum keeps the step-down monotone.
                int[] order = AscendingOrder(pValues);
                double running = 0;
                for (int j = 0; j < m; j++)
                {
                    running = Math.Max(running, Math.Min(1.0, (m - j) * pValues[order[j]]));
                    adjusted[order[j]] = running;
                }
                break;
            }
            case MultipleTestingMethod.BenjaminiHochberg:
            {
                // p̃_(j) = min_{i ≥ j} min(1, m p_(i) / i): the running minimum from the top is the step-up.
                int[] order = AscendingOrder(pValues);
                double running = 1.0;
                for (int j = m - 1; j >= 0; j--)
                {
                    running = Math.Min(running, (double)m * pValues[order[j]] / (j + 1));
                    adjusted[order[j]] = running;
                }
                break;
            }
            default:
                throw new ArgumentOutOfRangeException(nameof(method), method, "Unknown multiple-testing method.");
        }
        return adjusted;
    }

    /// <summary>Which tests are rejected at family level <paramref name="level"/>: adjusted p ≤ level.</summary>
    internal static bool[] Reject(ReadOnlySpan<double> pValues, double level, MultipleTestingMethod method)
    {
        RequireLevel(level);
        double[] adjusted = Adjust(pValues, method);
        var rejected = new bool[adjusted.Length];
        for (int i = 0; i < adjusted.Length; i++)
            rejected[i] = adjusted[i] <= level;
        return rejected;
    }

    /// <summary>
    /// The threshold each raw p-value stands against in the procedure, for reports: Holm level/(m − rank + 1),
    /// Benjamini–Hochberg rank·level/m, Bonferroni level/m (rank 1 = smallest p). Tied p-values
    /// share the rank that decides them together: the first of the tie for Holm (step-down stops there), the
    /// last for Benjamini–Hochberg (step-up starts there). The decision itself is <see cref="Reject"/>'s: a step
    /// procedure can reject a test above its own threshold (step-up) or keep one below it (step-down).
    /// </summary>
    internal static double[] PerTestLevels(ReadOnlySpan<double> pValues, double level, MultipleTestingMethod method)
    {
        RequirePValues(pValues);
        RequireLevel(level);
        int m = pValues.Length;
        var levels = new double[m];
        switch (method)
        {
            case MultipleTestingMethod.Bonferroni:
                Array.Fill(levels, level / m);
                break;
            case MultipleTestingMethod.Holm:
            case MultipleTestingMethod.BenjaminiHochberg:
            {
                int[] order = AscendingOrder(pValues);
                bool holm = method == MultipleTestingMethod.Holm;
                int start = 0;
                while (start < m)
                {
                    int end = start; // tie group is order[start..end]
                    while (end + 1 < m && pValues[order[end + 1]] == pValues[order[start]])
                        end++;
                    double groupLevel = holm ? level / (m - start) : (end + 1) * level / m;
                    for (int j = start; j <= end; j++)
                        levels[order[j]] = groupLevel;
                    start = end + 1;
                }
                break;
            }
            default:
                throw new ArgumentOutOfRangeException(nameof(method), method, "Unknown multiple-testing method.");
        }
        return levels;
    }

    private static int[] AscendingOrder(ReadOnlySpan<double> pValues)
    {
        int[] order = new int[pValues.Length];
        for (int i = 0; i < order.Length; i++)
            order[i] = i;
        double[] keys = pValues.ToArray();
        // Array.Sort is unstable; ties are broken by index only to make the order reproducible, the adjusted
        // values of tied p-values are equal either way.
        Array.Sort(order, (a, b) => keys[a] != keys[b] ? keys[a].CompareTo(keys[b]) : a.CompareTo(b));
        return order;
    }

    private static void RequirePValues(ReadOnlySpan<double> pValues)
    {
        for (int i = 0; i < pValues.Length; i++)
        {
            double p = pValues[i];
            if (!(p >= 0 && p <= 1))
                throw new ArgumentException(
                    $"p-value {i} is {p.ToString(CultureInfo.InvariantCulture)}; a multiple-testing correction needs p-values in [0, 1].",
                    nameof(pValues));
        }
    }

    private static void RequireLevel(double level)
    {
        if (!(level > 0 && level <= 1))
            throw new ArgumentOutOfRangeException(nameof(level), level, "The family level must lie in (0, 1].");
    }
}
