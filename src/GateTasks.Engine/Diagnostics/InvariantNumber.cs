using System.Globalization;

namespace GateTasks.Engine.Diagnostics;

/// <summary>Numbers as text for people and reports: invariant culture, always '.' as decimal separator.</summary>
internal static class InvariantNumber
{
    /// <summary>Four significant digits, e.g. 0.01234 or 1.235e+06.</summary>
    public static string Short(double x) =>
        double.IsNaN(x) ? "NaN" : double.IsInfinity(x) ? (x > 0 ? "inf" : "-inf") : x.ToString("G4", CultureInfo.InvariantCulture);

    /// <summary>Round-trip precision, for machine-read properties.</summary>
    public static string Exact(double x) => x.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>An integer count.</summary>
    public static string Count(long n) => n.ToString(CultureInfo.InvariantCulture);

    /// <summary>Parses with the invariant culture.</summary>
    public static bool TryParse(string s, out double x) =>
        double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out x);
}
