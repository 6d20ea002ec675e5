using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// Orders checked candidates by three keys in turn: fewer failed checks, then fewer inconclusive checks, then a
/// higher worst margin (<see cref="Margin"/>: the check that came closest to, or went furthest past, its tolerance).
/// Candidates equal on all three, or whose worst margins differ by no more than their noise, share a rank
/// (competition ranking: 1, 1, 3); a chain of such ties shares one rank. Candidates that could not be checked
/// come last, unranked. Equal candidates keep the order they were given in.
/// </summary>
internal static class CandidateRanking
{
    public static IReadOnlyList<RankedCandidate> Rank(IReadOnlyList<CandidateResult> results)
    {
        var checkedOnes = results.Where(r => r.Error is null)
            .OrderBy(r => r.Failed)
            .ThenBy(r => r.Inconclusive)
            .ThenByDescending(r => CandidateResult.RankValue(r.WorstMargin))
            .ToList(); // OrderBy is stable: full ties stay in input order
        var ranked = new List<RankedCandidate>(results.Count);
        for (var i = 0; i < checkedOnes.Count; i++)
        {
            var r = checkedOnes[i];
            if (i == 0)
            {
                ranked.Add(new RankedCandidate(1, r, RankDecision.First, "first"));
                continue;
            }
            var (decision, reason) = Compare(checkedOnes[i - 1], r);
            var rank = decision is RankDecision.Tie or RankDecision.TieWithinNoise ? ranked[i - 1].Rank : i + 1;
            ranked.Add(new RankedCandidate(rank, r, decision, reason));
        }
        foreach (var r in results.Where(r => r.Error is not null))
            ranked.Add(new RankedCandidate(null, r, RankDecision.NotChecked, $"not checked: {r.Error!.Code} {r.Error.Message}"));
        return ranked;
    }

    /// <summary>The key that puts <paramref name="below"/> under <paramref name="above"/> (already in that order), in words.</summary>
    public static (RankDecision Decision, string Reason) Compare(CandidateResult above, CandidateResult below)
    {
        var name = above.Candidate;
        if (below.Failed != above.Failed)
            return (RankDecision.FailedChecks, $"more failed checks than {name} ({below.Failed} vs {above.Failed})");
        if (below.Inconclusive != above.Inconclusive)
            return (RankDecision.InconclusiveChecks,
                $"as many failed checks as {name} ({below.Failed}), more inconclusive ({below.Inconclusive} vs {above.Inconclusive})");

        var a = above.WorstMargin;
        var b = below.WorstMargin;
        var va = CandidateResult.RankValue(a);
        var vb = CandidateResult.RankValue(b);
        if (va == vb)
            return (RankDecision.Tie, $"tied with {name}: same failed ({below.Failed}), inconclusive ({below.Inconclusive}) and worst margin ({InvariantNumber.Short(vb)})");
        var gap = va - vb;
        var noise = DifferenceNoise(a, b);
        if (noise is { } n && gap <= n)
            return (RankDecision.TieWithinNoise,
                $"tied with {name}: same failed ({below.Failed}) and inconclusive ({below.Inconclusive}); worst margins {InvariantNumber.Short(vb)} and {InvariantNumber.Short(va)} " +
                $"differ by {InvariantNumber.Short(gap)}, within their noise {InvariantNumber.Short(n)}");
        var apart = noise is { } s ? $", apart by {InvariantNumber.Short(gap)} > noise {InvariantNumber.Short(s)}" : "";
        return (RankDecision.WorstMargin,
            $"same failed ({below.Failed}) and inconclusive ({below.Inconclusive}) as {name}; lower worst margin ({InvariantNumber.Short(vb)} vs {InvariantNumber.Short(va)}{apart})");
    }

    /// <summary>
    /// Standard deviation of the difference of two worst margins, from the noise figures they have (tests' margins
    /// have none); null when neither has one, or either is infinite. It treats the two estimates as independent:
    /// their shared reference makes the true spread of the difference smaller, so this errs towards calling a tie.
    /// </summary>
    public static double? DifferenceNoise(Margin a, Margin b)
    {
        if (!double.IsFinite(a.Value) || !double.IsFinite(b.Value)) return null;
        var na = double.IsFinite(a.Noise) ? a.Noise : double.NaN;
        var nb = double.IsFinite(b.Noise) ? b.Noise : double.NaN;
        if (double.IsNaN(na) && double.IsNaN(nb)) return null;
        var sum = (double.IsNaN(na) ? 0 : na * na) + (double.IsNaN(nb) ? 0 : nb * nb);
        return Math.Sqrt(sum);
    }
}
