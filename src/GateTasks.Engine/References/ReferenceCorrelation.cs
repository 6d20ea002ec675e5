namespace GateTasks.Engine.References;

/// <summary>
/// The correlation of a declared pair in the reference: Pearson's r, Spearman's ρ (ranks by the reference's own
/// marginals), the effective count, each coefficient's asymptotic variance n·Var (from the reference's fourth
/// moments, <see cref="Statistics.WeightedCorrelation.AsymptoticVariance"/>), and the cells of its 2-D histogram (flows
/// included, row-major by the first feature): on the two features' axes when the pair's χ² test is asked for, else on
/// the coarse map grid (<see cref="Accumulation.PairGrid"/>); none in a reference built before every pair kept cells.
/// </summary>
internal sealed record ReferenceCorrelation(string First, string Second, double Pearson, double Spearman, double EffectiveCount,
    double PearsonVariance, double SpearmanVariance,
    double[]? Cells2DSumW = null, double[]? Cells2DSumW2 = null);
