using System.Text.Json;
using System.Xml.Linq;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Ranking;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Ranking;

/// <summary>
/// The global score as a ranking key, on hand-made results: it decides only between candidates with equal failed and
/// inconclusive counts, lower first; candidates without a score follow those with one; scores within their noise tie.
/// These compare the program with the ranking rule it documents (docs/cli.md, "Ranking candidates"), not with an
/// outside source; the score's own value is checked against numpy and scipy in the command-line tests.
/// </summary>
public class GlobalScoreRankingTests
{
    private static CandidateCheck Check(Verdict verdict, double margin, double noise = 0.01) =>
        new("x", "ks-max", verdict, new Margin(margin, noise));

    private static CandidateResult Result(string name, GlobalScore score, params CandidateCheck[] checks) =>
        new(name, [name], 1000, checks, checks.All(c => c.Verdict == Verdict.Pass) ? RunOutcome.Passed : RunOutcome.Failed) { Score = score };

    private static GlobalScore Score(double value, double error) => new("Fréchet distance of joint(x,y)", value, error, null);

    [Fact]
    public void Equal_counts_are_ordered_by_the_lower_score_before_the_worst_margin()
    {
        var ranked = CandidateRanking.Rank([
            Result("far", Score(0.30, 0.01), Check(Verdict.Pass, 0.9)),
            Result("near", Score(0.01, 0.01), Check(Verdict.Pass, 0.2)),
            Result("middle", Score(0.10, 0.01), Check(Verdict.Pass, 0.5)),
        ]);
        // The worst margins alone would give far, middle, near; the scores reverse it (docs/cli.md).
        Assert.Equal(["near", "middle", "far"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([1, 2, 3], ranked.Select(r => r.Rank!.Value));
        Assert.Equal([RankDecision.First, RankDecision.GlobalScore, RankDecision.GlobalScore], ranked.Select(r => r.DecidedBy));
        Assert.Equal("global-score", ranked[1].DecidedByKey);
        Assert.Contains("higher global score (0.1 ± 0.01 vs 0.01 ± 0.01, apart by 0.09 > noise 0.01414)", ranked[1].Reason); // √(0.01² + 0.01²)
        Assert.Equal([1, 2, 0], ranked.Select(r => r.Given)); // where each was given: far 0, near 1, middle 2
    }

    [Fact]
    public void The_score_never_overrides_failed_or_inconclusive_counts()
    {
        var ranked = CandidateRanking.Rank([
            Result("failed-but-closest", Score(0.001, 0.001), Check(Verdict.Fail, -0.1), Check(Verdict.Pass, 0.9)),
            Result("inconclusive-close", Score(0.002, 0.001), Check(Verdict.Inconclusive, -0.01), Check(Verdict.Pass, 0.9)),
            Result("passing-far", Score(5, 0.1), Check(Verdict.Pass, 0.1), Check(Verdict.Pass, 0.9)),
            Result("passing-without-score", GlobalScore.Absent("the reference keeps no covariance moments of joint(x,y)"), Check(Verdict.Pass, 0.05)),
        ]);
        Assert.Equal(["passing-far", "passing-without-score", "inconclusive-close", "failed-but-closest"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([RankDecision.First, RankDecision.GlobalScore, RankDecision.InconclusiveChecks, RankDecision.FailedChecks], ranked.Select(r => r.DecidedBy));
    }

    [Fact]
    public void Candidates_without_a_score_follow_those_with_one_and_are_ordered_among_themselves_by_the_worst_margin()
    {
        var none = GlobalScore.Absent("the sample has no row with every feature of joint(x,y) finite");
        var ranked = CandidateRanking.Rank([
            Result("no-score-low-margin", none, Check(Verdict.Pass, 0.2)),
            Result("scored-far", Score(0.5, 0.01), Check(Verdict.Pass, 0.1)),
            Result("no-score-high-margin", none, Check(Verdict.Pass, 0.8)),
            Result("scored-near", Score(0.05, 0.01), Check(Verdict.Pass, 0.1)),
        ]);
        Assert.Equal(["scored-near", "scored-far", "no-score-high-margin", "no-score-low-margin"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([RankDecision.First, RankDecision.GlobalScore, RankDecision.GlobalScore, RankDecision.WorstMargin], ranked.Select(r => r.DecidedBy));
        Assert.Contains("no global score (the sample has no row with every feature of joint(x,y) finite), placed after those with one", ranked[2].Reason);
        // The same input in another order gives the same ranking: deterministic whatever the order given.
        var again = CandidateRanking.Rank([
            Result("scored-near", Score(0.05, 0.01), Check(Verdict.Pass, 0.1)),
            Result("no-score-high-margin", none, Check(Verdict.Pass, 0.8)),
            Result("no-score-low-margin", none, Check(Verdict.Pass, 0.2)),
            Result("scored-far", Score(0.5, 0.01), Check(Verdict.Pass, 0.1)),
        ]);
        Assert.Equal(ranked.Select(r => r.Result.Candidate), again.Select(r => r.Result.Candidate));
    }

    [Fact]
    public void Scores_within_their_noise_share_a_rank()
    {
        var ranked = CandidateRanking.Rank([
            Result("a", Score(0.100, 0.02), Check(Verdict.Pass, 0.3)),
            Result("b", Score(0.120, 0.02), Check(Verdict.Pass, 0.9)), // 0.02 apart, noise √(0.02² + 0.02²) = 0.0283: a tie
            Result("c", Score(0.300, 0.02), Check(Verdict.Pass, 0.9)),
        ]);
        Assert.Equal(["a", "b", "c"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([1, 1, 3], ranked.Select(r => r.Rank!.Value));
        Assert.Equal(RankDecision.TieWithinNoise, ranked[1].DecidedBy);
        Assert.Contains("global scores 0.12 and 0.1 differ by 0.02, within their noise 0.02828", ranked[1].Reason);
    }

    [Fact]
    public void Without_any_score_the_ranking_is_the_worst_margin_one()
    {
        var none = GlobalScore.NoJointBlock;
        var ranked = CandidateRanking.Rank([
            Result("low", none, Check(Verdict.Pass, 0.2)),
            Result("high", none, Check(Verdict.Pass, 0.8)),
        ]);
        Assert.Equal(["high", "low"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal(RankDecision.WorstMargin, ranked[1].DecidedBy);
    }

    private static double Number(string s) => double.Parse(s, System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>The x of a text placed by <c>transform="translate(x,y)…"</c>, as OxyPlot's SVG export writes it.</summary>
    private static double TranslateX(XElement text)
    {
        var transform = text.Attribute("transform")?.Value ?? "";
        var open = transform.IndexOf("translate(", StringComparison.Ordinal);
        return open < 0 ? double.NaN : Number(transform[(open + 10)..transform.IndexOf(',', open)]);
    }

    private static RankingReport Report(params CandidateResult[] results)
    {
        var contract = ContractLoader.Parse("""
            contract-version: 1
            sample: s.csv
            reference: r.parquet
            features:
              - name: x
                checks: { ks-max: 0.1 }
            """, "contract.yaml");
        return new RankingReport(contract, "r.parquet", CandidateRanking.Rank(results));
    }

    [Fact]
    public void The_plot_has_one_point_per_scored_candidate_in_the_order_given_and_marks_one_without_a_score()
    {
        var report = Report(
            Result("epoch-1", Score(0.4, 0.05), Check(Verdict.Pass, 0.5)),
            Result("epoch-2", GlobalScore.Absent("the sample has no row with every feature of joint(x,y) finite"), Check(Verdict.Pass, 0.5)),
            Result("epoch-3", Score(0.1, 0.02), Check(Verdict.Pass, 0.5)),
            Result("epoch-4", Score(-0.01, 0.02), Check(Verdict.Pass, 0.5)));
        // The Markdown's file parsed as XML by System.Xml.Linq (SVG 1.1 namespace); OxyPlot draws each point as an
        // ellipse and each candidate's label as a text under it, at the same x.
        var svg = XDocument.Parse(ScorePlot.SvgDocument(report));
        XNamespace ns = "http://www.w3.org/2000/svg";
        var labels = svg.Descendants(ns + "text").Select(t => (Text: t.Value, X: TranslateX(t))).Where(t => t.Text.StartsWith("epoch-", StringComparison.Ordinal)).ToList();
        Assert.Equal(["epoch-1", "epoch-2", "epoch-3", "epoch-4"], labels.Select(l => l.Text));
        Assert.True(labels.Zip(labels.Skip(1)).All(p => p.First.X < p.Second.X), string.Join(",", labels));
        var points = svg.Descendants(ns + "ellipse").Select(e => (X: Number(e.Attribute("cx")!.Value), Y: Number(e.Attribute("cy")!.Value))).ToList();
        // One point per candidate with a score, under its label; none for epoch-2, which has a "no score" text instead.
        Assert.Equal(["epoch-1", "epoch-3", "epoch-4"], points.Select(p => labels.Single(l => Math.Abs(l.X - p.X) < 0.01).Text));
        Assert.True(points[0].Y < points[1].Y && points[1].Y < points[2].Y, string.Join(",", points)); // SVG's y grows downwards: 0.4 above 0.1 above -0.01
        Assert.Contains(svg.Descendants(ns + "text"), t => t.Value == "no score" && Math.Abs(TranslateX(t) - labels[1].X) < 0.01);

        // The inline form holds the same drawing without the XML declaration.
        var inline = ScorePlot.SvgElement(report);
        Assert.StartsWith("<svg", inline.TrimStart());
        Assert.Equal(3, XDocument.Parse(inline).Descendants(ns + "ellipse").Count());

        // The JSON carries each score and its error, and null with the reason where there is none (never a zero).
        using var stream = new MemoryStream();
        RankingJson.Write(stream, report);
        var candidates = JsonDocument.Parse(stream.ToArray()).RootElement.GetProperty("candidates").EnumerateArray().ToList();
        var byName = candidates.ToDictionary(c => c.GetProperty("candidate").GetString()!);
        Assert.Equal(0.1, byName["epoch-3"].GetProperty("global_score").GetDouble());
        Assert.Equal(0.02, byName["epoch-3"].GetProperty("global_score_standard_error").GetDouble());
        Assert.Equal(JsonValueKind.Null, byName["epoch-2"].GetProperty("global_score").ValueKind);
        Assert.Equal("the sample has no row with every feature of joint(x,y) finite", byName["epoch-2"].GetProperty("global_score_absence").GetString());
        Assert.Equal(1, byName["epoch-2"].GetProperty("given").GetInt32());
    }
}
