namespace GateTasks.Engine.References;

/// <summary>
/// The correlation of a declared pair in the reference: Pearson's r, Spearman's ρ (ranks by the reference's own
/// marginals), the effective count, each coefficient's asymptotic variance n·Var (from the reference's fourth
/// moments, <see cref="Statistics.WeightedCorrelation.AsymptoticVariance"/>), and — when the pair's χ² test is asked for — the cells of its 2-D histogram on
/// the two features' axes (flows included, row-major by the first feature).
/// </summary>
internal sealed record ReferenceCorrelation(string First, string Second, double Pearson, double Spearman, double EffectiveCount,
    double PearsonVariance, double SpearmanVariance,
    double[]? Cells2DSumW = null, double[]? Cells2DSumW2 = null);
