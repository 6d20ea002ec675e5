namespace GateTasks.Engine.Diagnostics;

/// <summary>Finds the valid name closest to a misspelt one, for "did you mean" hints.</summary>
internal static class NearestName
{
    /// <summary>
    /// The candidate with the smallest case-insensitive Levenshtein (1966) edit distance to <paramref name="name"/>,
    /// or null when none is within a third of the name's length (plus one): a wild guess helps nobody.
    /// </summary>
    public static string? Find(string name, IEnumerable<string> candidates)
    {
        string? best = null;
        var bestDistance = int.MaxValue;
        foreach (var candidate in candidates)
        {
            var d = Distance(name.ToLowerInvariant(), candidate.ToLowerInvariant());
            if (d < bestDistance)
            {
                bestDistance = d;
                best = candidate;
            }
        }
        return best is not null && bestDistance <= name.Length / 3 + 1 ? best : null;
    }

    /// <summary>" (did you mean 'x'?)" or the empty string.</summary>
    public static string Hint(string name, IEnumerable<string> candidates) =>
        Find(name, candidates) is { } s ? $" (did you mean '{s}'?)" : "";

    internal static int Distance(string a, string b)
    {
        var previous = new int[b.Length + 1];
        var current = new int[b.Length + 1];
        for (var j = 0; j <= b.Length; j++) previous[j] = j;
        for (var i = 1; i <= a.Length; i++)
        {
            current[0] = i;
            for (var j = 1; j <= b.Length; j++)
            {
                var cost = a[i - 1] == b[j - 1] ? 0 : 1;
                current[j] = Math.Min(Math.Min(current[j - 1] + 1, previous[j] + 1), previous[j - 1] + cost);
            }
            (previous, current) = (current, previous);
        }
        return previous[b.Length];
    }
}
