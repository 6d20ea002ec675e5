using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// A declared pair of features whose correlation the surrogate must reproduce: tolerances on |Δ Pearson r| and
/// |Δ Spearman ρ| (either may be absent), and optionally a χ² homogeneity test of the pair's 2-D histograms.
/// Locations point at the pair and at each tolerance.
/// </summary>
internal sealed record CorrelationSpec(string First, string Second, ToleranceCheck? Pearson, ToleranceCheck? Spearman, SourceLocation Location, GoodnessOfFitTest? Chi2 = null)
{
    /// <summary>Name used in reports, e.g. <c>e_lead~e_sublead</c>.</summary>
    public string Name => $"{First}~{Second}";

    /// <summary>The pair's checks in report order: Pearson, Spearman, then the 2-D χ² test; those the contract leaves out are absent.</summary>
    public IEnumerable<CheckSpec> Checks => new CheckSpec?[] { Pearson, Spearman, Chi2 }.OfType<CheckSpec>();
}
