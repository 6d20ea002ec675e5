namespace GateTasks.Engine.References;

/// <summary>The correlation of a declared pair in the reference: Pearson's r, Spearman's ρ (ranks by the reference's own marginals) and the effective count.</summary>
internal sealed record ReferenceCorrelation(string First, string Second, double Pearson, double Spearman, double EffectiveCount);
