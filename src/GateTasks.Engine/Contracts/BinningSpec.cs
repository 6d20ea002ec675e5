using System.Globalization;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>How the bins of a feature are chosen.</summary>
internal enum BinningMode
{
    /// <summary>Equal-probability bins from the reference's own quantiles.</summary>
    Quantile,

    /// <summary>Equal-width bins over a stated range.</summary>
    Uniform,

    /// <summary>Edges written out in the contract.</summary>
    Edges,

    /// <summary>One bin per integer value seen in the reference (discrete features).</summary>
    Categories,
}

/// <summary>A feature's binning request as the contract states it.</summary>
internal sealed record BinningSpec(BinningMode Mode, int Bins, double Lower, double Upper, IReadOnlyList<double> Edges, SourceLocation Location)
{
    /// <summary>
    /// Canonical text of the request. The reference stores it, and a check refuses a reference
    /// built from another request, so a binning edit cannot go unnoticed.
    /// </summary>
    public string Canonical => Mode switch
    {
        BinningMode.Quantile => $"quantile:{Bins}",
        BinningMode.Uniform => string.Create(CultureInfo.InvariantCulture, $"uniform:{Bins}:{Lower:R}:{Upper:R}"),
        BinningMode.Edges => "edges:" + string.Join(",", Edges.Select(e => e.ToString("R", CultureInfo.InvariantCulture))),
        _ => "categories",
    };
}
