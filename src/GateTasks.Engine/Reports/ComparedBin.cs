using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Reports;

/// <summary>
/// One regular bin of a feature as the report draws it: its edges, both histograms' normalised contents with their
/// standard errors (from Σw²), and the ratio the ratio check used. Contents are fractions of each histogram's
/// total Σw; <see cref="Scale"/> turns them into densities for continuous features, whose bins differ in width.
/// </summary>
internal sealed record ComparedBin(
    double Lower,
    double Upper,
    double Reference,
    double ReferenceError,
    double Surrogate,
    double SurrogateError,
    BinRatio? Ratio,
    bool Core)
{
    /// <summary>Divisor from fraction to the plotted value: the bin width (density) or 1 (discrete: fraction).</summary>
    public double Scale { get; init; } = 1;

    /// <summary>The bin's centre.</summary>
    public double Centre => 0.5 * (Lower + Upper);

    /// <summary>Every regular bin of a compared feature, in axis order.</summary>
    public static IReadOnlyList<ComparedBin> Of(FeatureComparison c)
    {
        var reference = c.Reference.Histogram;
        var surrogate = c.Surrogate;
        var axis = reference.Axis;
        var refTotal = reference.TotalSumW;
        var surTotal = surrogate.TotalSumW;
        var density = c.Spec.Kind != FeatureKind.Discrete;
        var bins = new ComparedBin[axis.Count];
        for (var b = 0; b < bins.Length; b++)
        {
            var width = axis.Upper(b) - axis.Lower(b);
            bins[b] = new ComparedBin(
                axis.Lower(b), axis.Upper(b),
                Fraction(reference.BinSumW(b), refTotal), Error(reference.BinSumW2(b), refTotal),
                Fraction(surrogate.BinSumW(b), surTotal), Error(surrogate.BinSumW2(b), surTotal),
                BinRatio.Of(reference, surrogate, b),
                c.CoreBins[b])
            {
                Scale = density && width > 0 ? width : 1,
            };
        }
        return bins;
    }

    private static double Fraction(double sumW, double total) => total > 0 ? sumW / total : 0;

    // The normalisation's own fluctuation is neglected, as usual for plotted error bars.
    private static double Error(double sumW2, double total) => total > 0 ? Math.Sqrt(Math.Max(sumW2, 0)) / total : 0;
}
