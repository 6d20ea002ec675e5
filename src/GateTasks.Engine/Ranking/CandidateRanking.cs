using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// Orders checked candidates by four keys in turn: fewer failed checks, then fewer inconclusive checks, then a lower
/// global score (<see cref="GlobalScore"/>: the joint block's Fréchet distance; candidates with a score before those
/// without one), then a higher worst margin (<see cref="Margin"/>: the check that came closest to, or went furthest
/// past, its tolerance). The score and the margin each decide only where the keys before them are equal; the score
/// never outweighs a count. Neighbours equal on every key, or whose scores (or, with equal or absent scores, worst
/// margins) differ by no more than their noise, share a rank (competition ranking: 1, 1, 3); a chain of such ties
/// shares one rank. Candidates that could not be checked come last, unranked. Equal candidates keep the order they
/// were given in.
/// </summary>
internal static class CandidateRanking
{
    public static IReadOnlyList<RankedCandidate> Rank(IReadOnlyList<CandidateResult> results)
    {
        var given = new Dictionary<CandidateResult, int>(ReferenceEqualityComparer.Instance);
        for (var i = 0; i < results.Count; i++) given[results[i]] = i;
        var checkedOnes = results.Where(r => r.Error is null)
            .OrderBy(r => r.Failed)
            .ThenBy(r => r.Inconclusive)
            .ThenBy(r => r.Score.HasValue ? 0 : 1)
            .ThenBy(r => r.Score.HasValue ? r.Score.Value : 0)
            .ThenByDescending(r => CandidateResult.RankValue(r.WorstMargin))
            .ToList(); // OrderBy is stable: full ties stay in input order
        var ranked = new List<RankedCandidate>(results.Count);
        for (var i = 0; i < checkedOnes.Count; i++)
        {
            var r = checkedOnes[i];
            if (i == 0)
            {
                ranked.Add(new RankedCandidate(1, r, RankDecision.First, "first") { Given = given[r] });
                continue;
            }
            var (decision, reason) = Compare(checkedOnes[i - 1], r);
            var rank = decision is RankDecision.Tie or RankDecision.TieWithinNoise ? ranked[i - 1].Rank : i + 1;
            ranked.Add(new RankedCandidate(rank, r, decision, reason) { Given = given[r] });
        }
        foreach (var r in results.Where(r => r.Error is not null))
            ranked.Add(new RankedCandidate(null, r, RankDecision.NotChecked, $"not checked: {r.Error!.Code} {r.Error.Message}") { Given = given[r] });
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
        if (ScoreDecision(above, below) is { } byScore) return byScore;

        var a = above.WorstMargin;
        var b = below.WorstMargin;
        var va = CandidateResult.RankValue(a);
        var vb = CandidateResult.RankValue(b);
        var scores = above.Score.HasValue ? $", global score ({InvariantNumber.Short(below.Score.Value)})" : "";
        if (va == vb)
            return (RankDecision.Tie, $"tied with {name}: same failed ({below.Failed}), inconclusive ({below.Inconclusive}){scores} and worst margin ({InvariantNumber.Short(vb)})");
        var gap = va - vb;
        var noise = DifferenceNoise(a, b);
        if (noise is { } n && gap <= n)
            return (RankDecision.TieWithinNoise,
                $"tied with {name}: same failed ({below.Failed}) and inconclusive ({below.Inconclusive}){scores}; worst margins {InvariantNumber.Short(vb)} and {InvariantNumber.Short(va)} " +
                $"differ by {InvariantNumber.Short(gap)}, within their noise {InvariantNumber.Short(n)}");
        var apart = noise is { } s ? $", apart by {InvariantNumber.Short(gap)} > noise {InvariantNumber.Short(s)}" : "";
        return (RankDecision.WorstMargin,
            $"same failed ({below.Failed}) and inconclusive ({below.Inconclusive}){scores} as {name}; lower worst margin ({InvariantNumber.Short(vb)} vs {InvariantNumber.Short(va)}{apart})");
    }

    /// <summary>
    /// The global score's part, with the counts equal: null when both scores are equal or neither candidate has one
    /// (the worst margin decides). A gap no larger than √(SE₁² + SE₂²) (the two errors taken as independent: their
    /// shared reference makes the true spread smaller, so this errs towards a tie, as for margins) is a tie.
    /// </summary>
    private static (RankDecision, string)? ScoreDecision(CandidateResult above, CandidateResult below)
    {
        var (a, b) = (above.Score, below.Score);
        var counts = $"same failed ({below.Failed}) and inconclusive ({below.Inconclusive}) as {above.Candidate}";
        if (a.HasValue && !b.HasValue)
            return (RankDecision.GlobalScore, $"{counts}; {b.Text}, placed after those with one");
        if (!a.HasValue || a.Value == b.Value) return null;
        var gap = b.Value - a.Value;
        var noise = Math.Sqrt(a.StandardError * a.StandardError + b.StandardError * b.StandardError);
        if (gap <= noise)
            return (RankDecision.TieWithinNoise,
                $"tied with {above.Candidate}: same failed ({below.Failed}) and inconclusive ({below.Inconclusive}); global scores {InvariantNumber.Short(b.Value)} and " +
                $"{InvariantNumber.Short(a.Value)} differ by {InvariantNumber.Short(gap)}, within their noise {InvariantNumber.Short(noise)}");
        return (RankDecision.GlobalScore,
            $"{counts}; higher global score ({InvariantNumber.Short(b.Value)} ± {InvariantNumber.Short(b.StandardError)} vs " +
            $"{InvariantNumber.Short(a.Value)} ± {InvariantNumber.Short(a.StandardError)}, apart by {InvariantNumber.Short(gap)} > noise {InvariantNumber.Short(noise)})");
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
