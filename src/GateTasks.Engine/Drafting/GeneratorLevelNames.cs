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

    /// <summary>The first hint glob the column's name matches, or null.</summary>
    public static string? Match(string column) => Compiled.Patterns.FirstOrDefault(p => p.Matches(column))?.Glob;

    // Built on the first match, not when the globs are read: the draft command's description names them, and the
    // command tree is built on every run, so ten regular expressions would cost every command's start-up.
    private static class Compiled
    {
        public static readonly ColumnPattern[] Patterns = Globs.Select(g => new ColumnPattern(g)).ToArray();
    }
}
