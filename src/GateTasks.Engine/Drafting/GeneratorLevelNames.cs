namespace GateTasks.Engine.Drafting;

/// <summary>
/// The naming hint for generator-level columns (truth inputs a surrogate is conditioned on, not outputs it must
/// reproduce): names like <c>gen_pt</c>, <c>pt_gen</c>, <c>genPt</c>, <c>truth_e</c>, <c>mc_eta</c>,
/// <c>true_energy</c>. The draft keeps such columns (a name is only a hint) but says so beside them, so a reviewer
/// leaves generator inputs out with <c>--exclude</c>. Our convention, from common naming in simulation ntuples.
/// </summary>
internal static class GeneratorLevelNames
{
    /// <summary>The hint's globs (<see cref="ColumnPattern"/>), as docs/cli.md lists them.</summary>
    public static IReadOnlyList<string> Globs { get; } = ["gen*", "Gen*", "*_gen", "*_gen_*", "*truth*", "*Truth*", "mc_*", "MC_*", "true_*", "*_true"];

    private static readonly ColumnPattern[] Patterns = Globs.Select(g => new ColumnPattern(g)).ToArray();

    /// <summary>The first hint glob the column's name matches, or null.</summary>
    public static string? Match(string column) => Patterns.FirstOrDefault(p => p.Matches(column))?.Glob;
}
