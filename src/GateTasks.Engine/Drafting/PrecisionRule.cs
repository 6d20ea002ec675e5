using System.Globalization;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// Turns "the surrogate's bias stays below a fraction f of the analysis's own statistical uncertainty" into
/// tolerances, each in the unit of its check (docs/contract.md), for N expected data events:
/// <list type="bullet">
/// <item>a bin holding a share p of the events has relative uncertainty 1/√(Np): with B equal-probability bins,
/// ratio-max = f·√(B/N);</item>
/// <item>the data's empirical CDF has standard deviation √(F(1−F)/N) ≤ 0.5/√N: ks-max = f·0.5/√N;</item>
/// <item>the data's mean has uncertainty σ/√N: mean-shift-max (in units of σ) = f/√N;</item>
/// <item>its standard deviation has relative uncertainty √((κ−1)/(4N)) for kurtosis κ (the delta method,
/// as the width-ratio check itself uses, Kendall &amp; Stuart vol. 1 ch. 10): width-ratio-max = f·√((κ−1)/(4N));</item>
/// <item>a fraction p has uncertainty √(p(1−p)/N): fraction-max = f·√(p(1−p)/N).</item>
/// </list>
/// Values are rounded down to two significant digits, so rounding never loosens a tolerance.
/// </summary>
internal sealed class PrecisionRule(long dataEvents)
{
    private readonly double _n = dataEvents;

    public DraftedTolerance BinRatio(double fraction, int bins) =>
        Make(fraction * Math.Sqrt(bins / _n), fraction, $"√({bins} bins / {Count()} data events): the data's relative uncertainty in one equal-probability bin");

    public DraftedTolerance CdfDistance(double fraction) =>
        Make(fraction * 0.5 / Math.Sqrt(_n), fraction, $"0.5/√{Count()}: the largest standard deviation of the data's empirical CDF");

    public DraftedTolerance MeanShift(double fraction) =>
        Make(fraction / Math.Sqrt(_n), fraction, $"1/√{Count()}: the uncertainty of the data's mean, in units of σ");

    public DraftedTolerance WidthRatio(double fraction, double kurtosis, string note = "") =>
        Make(fraction * Math.Sqrt((kurtosis - 1) / (4 * _n)), fraction,
            $"√((κ − 1)/(4 × {Count()})) with the trusted sample's kurtosis κ = {Short(kurtosis)}{note}: the data's relative uncertainty on σ");

    public DraftedTolerance Fraction(double fraction, double share, string what) =>
        Make(fraction * Math.Sqrt(share * (1 - share) / _n), fraction,
            $"√(p(1 − p)/{Count()}) with p = {Short(share)} ({what}): the data's uncertainty on that fraction");

    private string Count() => InvariantNumber.Count(dataEvents);

    private static DraftedTolerance Make(double value, double fraction, string why) =>
        new(RoundDown(value), $"{FractionText(fraction)} × {why}");

    /// <summary>A fraction as a reviewer would write it: 1/3 for a third.</summary>
    internal static string FractionText(double f) => Math.Abs(f - 1.0 / 3) < 1e-9 ? "1/3" : Short(f);

    /// <summary>Two significant digits, rounded towards zero.</summary>
    internal static double RoundDown(double value)
    {
        if (!(value > 0) || !double.IsFinite(value)) return value;
        var scale = Math.Pow(10, Math.Floor(Math.Log10(value)) - 1);
        var rounded = Math.Floor(value / scale * (1 + 1e-12)) * scale;
        return double.Parse(rounded.ToString("G2", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
    }

    private static string Short(double x) => x.ToString("0.###", CultureInfo.InvariantCulture);
}
