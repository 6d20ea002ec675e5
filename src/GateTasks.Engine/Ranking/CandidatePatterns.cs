using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// Turns the candidates named on a command line into the samples to rank: a file or a folder is one candidate (a
/// folder's sample files read together, as <c>check --sample</c> reads them); a glob (<c>*</c>, <c>**</c>,
/// <c>?</c>) is one candidate per file it matches, in ordinal order. Paths are relative to the working directory.
/// </summary>
internal static class CandidatePatterns
{
    /// <summary>
    /// The candidates, each once (a file named twice, or matched by two patterns, keeps its first place). A
    /// pattern that matches nothing, or a file or folder that does not exist, is GATE2001 naming it: nothing is
    /// checked until every pattern resolves.
    /// </summary>
    public static IReadOnlyList<string> Expand(IEnumerable<string> patterns)
    {
        var cwd = Directory.GetCurrentDirectory();
        var seen = new HashSet<string>(OperatingSystem.IsWindows() ? StringComparer.OrdinalIgnoreCase : StringComparer.Ordinal);
        var candidates = new List<string>();
        foreach (var pattern in patterns)
        {
            var files = SampleFiles.Resolve(pattern, cwd); // throws GATE2001 naming the pattern when nothing is there
            if (pattern.IndexOfAny(['*', '?']) < 0)
            {
                if (seen.Add(Path.GetFullPath(pattern, cwd))) candidates.Add(pattern);
                continue;
            }
            foreach (var file in files)
            {
                if (!seen.Add(file)) continue;
                var relative = Path.GetRelativePath(cwd, file);
                candidates.Add(Path.IsPathRooted(pattern) || relative.StartsWith("..", StringComparison.Ordinal) ? file : relative);
            }
        }
        return candidates;
    }
}
