using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Checks;

/// <summary>
/// One bin's ratio of normalised contents, surrogate over reference, with the standard errors each histogram
/// contributes (delta method on Σw²). The ratio check decides on these numbers and the report plots them.
/// </summary>
internal readonly record struct BinRatio(double Ratio, double SigmaReference, double SigmaSurrogate)
{
    /// <summary>The combined standard error of the ratio.</summary>
    public double Sigma => Math.Sqrt(SigmaReference * SigmaReference + SigmaSurrogate * SigmaSurrogate);

    /// <summary>
    /// The ratio in regular bin <paramref name="bin"/>, each histogram normalised by its total Σw (flows included);
    /// null when the reference bin is empty, where no ratio can be formed.
    /// </summary>
    public static BinRatio? Of(Histogram reference, Histogram surrogate, int bin, double refTotal, double surTotal, double surEffective)
    {
        var rw = reference.BinSumW(bin);
        if (rw <= 0) return null;
        var sw = surrogate.BinSumW(bin);
        var fraction = rw / refTotal;
        var ratio = surTotal > 0 ? sw / surTotal / fraction : 0;
        // Relative variances of the two normalised contents; an empty surrogate bin takes the variance expected from the reference.
        var relRef = reference.BinSumW2(bin) / (rw * rw);
        var relSur = sw > 0 ? surrogate.BinSumW2(bin) / (sw * sw) : 1 / Math.Max(fraction * surEffective, 1e-300);
        return new BinRatio(ratio, Math.Max(ratio, 1e-12) * Math.Sqrt(relRef), Math.Max(ratio, 1e-12) * Math.Sqrt(relSur));
    }
}
