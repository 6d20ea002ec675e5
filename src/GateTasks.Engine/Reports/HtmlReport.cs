using System.Globalization;
using System.Net;
using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Reports;

/// <summary>
/// A self-contained single-file HTML report of one check run: the run's facts and verdict at the top, an overview
/// of every feature by verdict, then one section per feature — failing first — with its plot (inline SVG from
/// <see cref="FeaturePlot"/>) and a row per check, and the goodness-of-fit tests' readings in a section of their own
/// (diagnostics beside the verdict, worded "distinguishable at this size" or not, never pass or fail). Style and script are inline; it loads nothing, so it works
/// offline and as a CI artefact. Passing features start collapsed.
/// </summary>
internal static class HtmlReport
{
    public static void Write(string path, RunResult report) => AtomicFile.WriteText(path, Render(report));

    public static string Render(RunResult report)
    {
        var subjects = FeatureOutcomes.Group(report);
        var ids = Ids(subjects);
        var sb = new StringBuilder(1 << 20);
        var verdict = report.Outcome.Word();
        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
          .Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
          .Append("<meta name=\"generator\" content=\"GateTasks ").Append(E(ToolVersion.Current)).Append("\">\n")
          .Append("<title>").Append(E($"{verdict} · {report.Contract.DisplayName} · GateTasks check")).Append("</title>\n")
          .Append("<style>").Append(Style).Append(PairMapPlot.Style).Append("</style>\n</head>\n")
          .Append("<body data-verdict=\"").Append(report.Outcome.Token()).Append("\">\n");
        Header(sb, report);
        Overview(sb, subjects, ids);
        sb.Append("<main>\n");
        foreach (var s in subjects) Section(sb, report, s, ids[s.Name]);
        sb.Append(PairMapPlot.Section(report));
        Readings(sb, report);
        sb.Append("</main>\n");
        sb.Append("<footer>").Append(E(ResultTable.DecisionRule(report)))
          .Append(" Error bars and ratio uncertainties are ±1σ from Σw² of both histograms; bands are 1 ± each ratio-max tolerance over its region's bins.")
          .Append(" Written by GateTasks ").Append(E(ToolVersion.Current)).Append(".</footer>\n");
        sb.Append("<script>").Append(Script).Append("</script>\n</body>\n</html>\n");
        return sb.ToString();
    }

    private static void Header(StringBuilder sb, RunResult r)
    {
        var passed = r.Outcomes.Count(o => o.Verdict == Verdict.Pass);
        var css = r.Outcome switch { RunOutcome.Passed => "pass", RunOutcome.Undecided => "inconclusive", _ => "fail" };
        var stamp = r.Outcome.Word();
        sb.Append("<header class=\"run ").Append(css).Append("\">\n")
          .Append("<div class=\"headline\"><span class=\"stamp ").Append(css).Append("\" id=\"overall\">").Append(stamp).Append("</span>")
          .Append("<h1>").Append(E(r.Contract.DisplayName)).Append("</h1></div>\n")
          .Append("<p class=\"counts\">")
          .Append(Count("fail", r.Failures, "failed")).Append(Count("inconclusive", r.Inconclusive, "inconclusive")).Append(Count("pass", passed, "passed"))
          .Append("<span class=\"total\">of ").Append(r.Outcomes.Count).Append(" checks on ").Append(r.Contract.Features.Count).Append(" features</span>")
          .Append("</p>\n");
        Binding(sb, r);
        sb.Append("<dl class=\"facts\">\n");
        Fact(sb, "contract", Code(r.Contract.FilePath));
        Fact(sb, "reference", Code(r.ReferencePath) + $" <span class=\"sha\" title=\"sha256\">sha256 {E(r.ReferenceSha256)}</span>");
        Fact(sb, "reference events", E(InvariantNumber.Count(r.Reference.Events)));
        Fact(sb, r.SampleFiles.Count == 1 ? "sample file" : $"sample files ({r.SampleFiles.Count})", string.Join("<br>", r.SampleFiles.Select(Code)));
        Fact(sb, "sample events", E($"{InvariantNumber.Count(r.Events)} (effective {r.EffectiveEvents.ToString("0", CultureInfo.InvariantCulture)})"));
        if (r.Contract.Selection is { } selection) Fact(sb, "selection", Code(selection.Text));
        // The acceptance ledger's findings: a run whose accepted state was not respected must not look green.
        if (r.Acceptance.Count > 0)
            Fact(sb, "acceptance ledger", string.Join("<br>", r.Acceptance.Select(f =>
                $"<span class=\"ledger {(f.IsError ? "fail" : "inconclusive")}\">{E(f.IsError ? "error" : "warning")} {E(f.Code)}</span> {E(f.Message)}")));
        // Subjects only tests cover: nothing shows them within a tolerance, which is why such a run is not PASSED.
        if (r.UncoveredSubjects.Count > 0)
            Fact(sb, "no tolerance check", string.Join("<br>", r.UncoveredSubjects.Select(s =>
                $"<span class=\"ledger inconclusive\">{E(ErrorCodes.SubjectWithoutTolerance)}</span> {E(RunDiagnostics.UncoveredText(s))}")));
        // The global score: information for comparing candidates, shown without a verdict badge.
        Fact(sb, "global score", $"<span id=\"global-score\">{E(r.Score.HasValue ? $"{InvariantNumber.Short(r.Score.Value)} ± {InvariantNumber.Short(r.Score.StandardError)}" : "none")}</span> " +
            $"<small>{E(r.Score.HasValue ? $"{r.Score.Covers}; lower is closer; not a verdict" : $"no global score ({r.Score.Absence})")}</small>");
        if (r.Readings.Count > 0)
            Fact(sb, "goodness-of-fit diagnostics", $"<a href=\"#diagnostics\">{E(DiagnosticsCount(r))}</a>");
        Fact(sb, "checked", E($"{r.StartedUtc.UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", CultureInfo.InvariantCulture)} UTC in {r.Elapsed.TotalSeconds.ToString("0.0", CultureInfo.InvariantCulture)} s"));
        sb.Append("</dl>\n</header>\n");
    }

    /// <summary>The checks closest to their tolerance, right under the verdict (<see cref="BindingChecks"/>).</summary>
    private static void Binding(StringBuilder sb, RunResult r)
    {
        var binding = BindingChecks.Of(r);
        if (binding.Count == 0) return;
        sb.Append("<div class=\"binding\" id=\"binding-checks\"><h2>").Append(E(BindingChecks.Heading(binding.Count))).Append("</h2>\n<ol>");
        foreach (var (o, h) in binding)
            sb.Append("<li data-subject=\"").Append(E(o.Subject.Name)).Append("\" data-check=\"").Append(E(o.Check.Label))
              .Append("\" data-upper-share=\"").Append(InvariantNumber.Exact(h.UpperShare)).Append("\">").Append(E(BindingChecks.Line(o, h))).Append("</li>");
        sb.Append("</ol></div>\n");
    }

    private static string DiagnosticsCount(RunResult r) =>
        $"{r.Readings.Count} test{(r.Readings.Count == 1 ? "" : "s")} beside the verdict, " +
        $"{r.Readings.Count(x => x.Finding == Distinguishability.Distinguishable)} distinguishable at this size";

    /// <summary>The readings of the goodness-of-fit tests: a table apart from the verdicts, with no verdict badge.</summary>
    private static void Readings(StringBuilder sb, RunResult r)
    {
        if (r.Readings.Count == 0) return;
        sb.Append("<section class=\"diagnostics\" id=\"diagnostics\">\n<h2>Goodness-of-fit diagnostics <small>not verdicts</small></h2>\n")
          .Append("<table class=\"readings\">\n<thead><tr><th>subject</th><th>test</th><th class=\"num\">statistic</th><th class=\"num\">p-value</th>")
          .Append("<th class=\"num\">adjusted p</th><th>reading</th></tr></thead>\n<tbody>\n");
        foreach (var x in r.Readings)
            sb.Append("<tr data-reading=\"").Append(x.Finding.Token()).Append("\" data-subject=\"").Append(E(x.Subject.Name)).Append("\" title=\"").Append(E(x.Measured.Summary)).Append("\">")
              .Append("<td>").Append(E(x.Subject.Name)).Append("</td><td>").Append(E(x.Test.Label)).Append("</td>")
              .Append("<td class=\"num\">").Append(E(InvariantNumber.Short(x.Statistic))).Append("</td>")
              .Append("<td class=\"num\">").Append(E(InvariantNumber.Short(x.Measured.PValue))).Append("</td>")
              .Append("<td class=\"num\">").Append(E(InvariantNumber.Short(x.AdjustedPValue))).Append("</td>")
              .Append("<td class=\"reading\">").Append(E(x.Finding == Distinguishability.NotMeasured ? x.Text : x.Finding.Words())).Append("</td></tr>\n");
        sb.Append("</tbody>\n</table>\n<p class=\"note\">").Append(E(ResultTable.ReadingRule(r))).Append("</p>\n</section>\n");
    }

    private static string Count(string css, int n, string word) =>
        $"<span class=\"count {css}{(n == 0 ? " zero" : "")}\"><b>{n}</b> {word}</span>";

    private static void Fact(StringBuilder sb, string name, string html) =>
        sb.Append("<dt>").Append(E(name)).Append("</dt><dd>").Append(html).Append("</dd>\n");

    private static void Overview(StringBuilder sb, IReadOnlyList<FeatureOutcomes> subjects, IReadOnlyDictionary<string, string> ids)
    {
        sb.Append("<nav class=\"overview\" aria-label=\"features by verdict\">\n");
        foreach (var group in subjects.GroupBy(s => s.Worst))
        {
            sb.Append("<div class=\"group ").Append(Css(group.Key)).Append("\"><h2>").Append(GroupTitle(group.Key)).Append(" <small>").Append(group.Count()).Append("</small></h2><ul>");
            foreach (var s in group)
            {
                var failed = s.Outcomes.Count(o => o.Verdict == Verdict.Fail);
                var open = s.Outcomes.Count(o => o.Verdict == Verdict.Inconclusive);
                var note = failed > 0 ? $"{failed} of {s.Outcomes.Count} failed" : open > 0 ? $"{open} of {s.Outcomes.Count} undecided" : $"{s.Outcomes.Count} pass";
                sb.Append("<li><a href=\"#").Append(ids[s.Name]).Append("\">").Append(E(SubjectLabel.Of(s.Outcomes[0].Subject))).Append("</a> <small>").Append(E(note)).Append("</small></li>");
            }
            sb.Append("</ul></div>\n");
        }
        sb.Append("</nav>\n")
          .Append("<div class=\"controls\" id=\"controls\" hidden>show ")
          .Append("<button type=\"button\" data-show=\"all\" aria-pressed=\"true\">all</button>")
          .Append("<button type=\"button\" data-show=\"fail\">failing</button>")
          .Append("<button type=\"button\" data-show=\"inconclusive\">inconclusive</button>")
          .Append("<button type=\"button\" data-show=\"pass\">passing</button>")
          .Append(" <button type=\"button\" data-expand=\"open\">expand all</button>")
          .Append("<button type=\"button\" data-expand=\"close\">collapse all</button></div>\n");
    }

    private static string GroupTitle(Verdict v) => v switch
    {
        Verdict.Fail => "Failing",
        Verdict.Inconclusive => "Undecided",
        _ => "Passing",
    };

    private static void Section(StringBuilder sb, RunResult report, FeatureOutcomes s, string id)
    {
        var css = Css(s.Worst);
        sb.Append("<section class=\"subject ").Append(css).Append("\" id=\"").Append(id).Append("\" data-verdict=\"").Append(css)
          .Append("\" data-feature=\"").Append(E(s.Name)).Append("\">\n")
          .Append("<details class=\"body\"").Append(s.Worst == Verdict.Pass ? "" : " open").Append(">\n<summary><span class=\"badge ").Append(css).Append("\">")
          .Append(ResultTable.VerdictText(s.Worst)).Append("</span><span class=\"name\">").Append(E(SubjectLabel.Of(s.Outcomes[0].Subject))).Append("</span>")
          .Append("<span class=\"what\">").Append(E(Description(s))).Append("</span></summary>\n");
        if (s.Comparison is { } c)
        {
            var bands = ToleranceBand.For(c, s.Outcomes);
            var bins = ComparedBin.Of(c);
            if (c.SampleSpike is { } spike && c.Reference.Spike is { } refSpike) SpikeNote(sb, report, spike, refSpike);
            sb.Append("<figure class=\"plot\" data-bands=\"").Append(E(string.Join(" ", bands.Select(b => $"{b.Region}:{InvariantNumber.Short(b.Tolerance)}")))).Append("\">\n")
              .Append(Responsive(FeaturePlot.Svg(c, bins, bands, id + "-plot"), $"{s.Name}: reference and surrogate distributions, and their ratio over the tolerance bands"))
              .Append("\n<figcaption>")
              .Append("<span class=\"key\"><i class=\"sw ref\"></i>reference</span>")
              .Append("<span class=\"key\"><i class=\"sw sur\"></i>surrogate ± 1σ</span>");
            foreach (var b in bands)
                sb.Append("<span class=\"key band\" data-region=\"").Append(E(b.Region)).Append("\"><i class=\"sw\" style=\"background:").Append(FeaturePlot.BandColour(b.Kind))
                  .Append(b.Kind == Region.Named ? ";opacity:.45" : "").Append("\"></i>")
                  .Append(E($"{b.Region} {FeaturePlot.Percent(b.Tolerance)}")).Append(" <b class=\"").Append(Css(b.Verdict)).Append("\">").Append(ResultTable.VerdictText(b.Verdict)).Append("</b></span>");
            if (bands.Count == 0) sb.Append("<span class=\"key\">no ratio-max tolerance on this feature</span>");
            sb.Append("<span class=\"key\"><i class=\"sw out\"></i>ratio outside its band</span>");
            // The flow cells are compared by no binned check: their shares are said.
            var (rb, _, ra) = BinCoverage.Shares(c.Reference.Histogram);
            var (sbl, _, sa) = BinCoverage.Shares(c.Surrogate);
            sb.Append("<span class=\"key flows\">").Append(E($"outside the bins: reference {BinCoverage.Percent(rb)} below, {BinCoverage.Percent(ra)} above; " +
                $"surrogate {BinCoverage.Percent(sbl)} below, {BinCoverage.Percent(sa)} above")).Append("</span>");
            var (viewLow, viewHigh) = FeaturePlot.View([.. bins.Select(b => b.Lower), bins[^1].Upper], c.Spec.Kind == FeatureKind.Discrete);
            if (viewLow > bins[0].Lower) sb.Append("<span class=\"key\">").Append(E($"first bin [{InvariantNumber.Short(bins[0].Lower)}, {InvariantNumber.Short(bins[0].Upper)}) shown in part")).Append("</span>");
            if (viewHigh < bins[^1].Upper) sb.Append("<span class=\"key\">").Append(E($"last bin [{InvariantNumber.Short(bins[^1].Lower)}, {InvariantNumber.Short(bins[^1].Upper)}) shown in part")).Append("</span>");
            sb.Append("</figcaption>\n</figure>\n");
            ChecksTable(sb, report, s);
            BinsTable(sb, c, bins);
        }
        else
        {
            sb.Append("<p class=\"note\">").Append(E(NoPlotNote(s))).Append("</p>\n");
            ChecksTable(sb, report, s);
        }
        // The subject's headroom across the accepted entries and this run (HeadroomTrendPlot), or one line saying why there is none.
        sb.Append(HeadroomTrendPlot.Html(report, s.Name));
        sb.Append("</details>\n</section>\n");
    }

    private static string NoPlotNote(FeatureOutcomes s) => s.Outcomes[0].Subject switch
    {
        PairSubject => "A declared pair of features: its correlations (or 2-D histogram) are compared directly; its 2-D map is under \"2-D maps of the declared pairs\".",
        JointSubject => "Distances over a feature set taken together (moments, kernel sums, projections), from every event: no 1-D plot.",
        _ => "No histogram to plot.",
    };

    private static void SpikeNote(StringBuilder sb, RunResult report, Accumulation.SpikeTally sample, Accumulation.SpikeTally reference)
    {
        var refShare = report.Reference.SumW > 0 ? reference.SumW / report.Reference.SumW : double.NaN;
        var sampleShare = report.SumW > 0 ? sample.SumW / report.SumW : double.NaN;
        sb.Append("<p class=\"note\">").Append(E($"Spike at {InvariantNumber.Short(sample.Value)}: {Share(refShare)} of the reference, {Share(sampleShare)} of the sample; " +
                                                   "checked by fraction-max and left out of the plot and the other checks.")).Append("</p>\n");
    }

    private static string Share(double x) => double.IsNaN(x) ? "—" : (100 * x).ToString("0.###", CultureInfo.InvariantCulture) + "%";

    private static void ChecksTable(StringBuilder sb, RunResult report, FeatureOutcomes s)
    {
        sb.Append("<table class=\"checks\">\n<thead><tr><th>check</th><th>region</th><th class=\"num\">estimate</th><th class=\"num\">")
          .Append(E(ResultTable.IntervalHeader(report))).Append("</th><th class=\"num\">tolerance</th><th class=\"num\" title=\"share of the tolerance the upper bound uses (the estimate's)\">used</th><th class=\"num\">adj. p</th><th>verdict</th><th class=\"num\">events needed</th></tr></thead>\n<tbody>\n");
        // A stable sort: failing rows first, contract order within each verdict.
        foreach (var o in s.Outcomes.OrderBy(o => FeatureOutcomes.Rank(o.Verdict)))
        {
            var css = Css(o.Verdict);
            sb.Append("<tr class=\"").Append(css).Append("\" data-check=\"").Append(E(o.Check.Label)).Append("\" title=\"").Append(E(o.Summary)).Append("\">")
              .Append("<td>").Append(E(o.Check.Key)).Append("</td>")
              .Append("<td>").Append(E(o.Check.RegionName)).Append("</td>")
              .Append("<td class=\"num\">").Append(E(InvariantNumber.Short(o.Measured.Estimate))).Append("</td>")
              .Append("<td class=\"num\">").Append(E(ResultTable.IntervalText(o))).Append("</td>")
              .Append("<td class=\"num\">").Append(E(ResultTable.ToleranceText(o))).Append("</td>")
              .Append("<td class=\"num used\">").Append(E(HeadroomText.Cell(Headroom.Of(o, report.Contract.Decision)))).Append("</td>")
              .Append("<td class=\"num\">").Append(E(InvariantNumber.Short(o.AdjustedPValue))).Append("</td>")
              .Append("<td><span class=\"badge ").Append(css).Append("\">").Append(ResultTable.VerdictText(o.Verdict)).Append("</span></td>")
              .Append("<td class=\"num\">").Append(E(o.Verdict == Verdict.Inconclusive ? UndecidedReason.Cell(o) : "")).Append("</td>")
              .Append("</tr>\n");
            if (o.Verdict != Verdict.Pass)
                // The same sentence as the console's coded message and the JUnit failure.
                sb.Append("<tr class=\"why ").Append(css).Append("\"><td colspan=\"9\"><span class=\"sentence\">").Append(E(CheckSentence.Of(o, report.Contract.Decision)))
                  .Append("</span> <span class=\"where\">").Append(E(o.Check.Location.ToString())).Append("</span></td></tr>\n");
        }
        sb.Append("</tbody>\n</table>\n");
    }

    private static void BinsTable(StringBuilder sb, FeatureComparison c, IReadOnlyList<ComparedBin> bins)
    {
        var discrete = c.Spec.Kind == FeatureKind.Discrete;
        sb.Append("<details class=\"bins\"><summary>").Append(bins.Count).Append(" bins: edges and contents</summary>\n<table>\n<thead><tr><th class=\"num\">from</th><th class=\"num\">to</th><th>region</th>")
          .Append("<th class=\"num\">reference</th><th class=\"num\">surrogate</th><th class=\"num\">ratio ± σ</th></tr></thead>\n<tbody>\n");
        foreach (var b in bins)
        {
            sb.Append("<tr><td class=\"num\">").Append(E(InvariantNumber.Short(b.Lower))).Append("</td><td class=\"num\">").Append(E(InvariantNumber.Short(b.Upper)))
              .Append("</td><td>").Append(b.Core ? "core" : "tail").Append("</td><td class=\"num\">").Append(E(Fraction(b.Reference, b.ReferenceError)))
              .Append("</td><td class=\"num\">").Append(E(Fraction(b.Surrogate, b.SurrogateError)))
              .Append("</td><td class=\"num\">").Append(E(b.Ratio is { } r ? $"{r.Ratio.ToString("0.0000", CultureInfo.InvariantCulture)} ± {r.Sigma.ToString("0.0000", CultureInfo.InvariantCulture)}" : "—"))
              .Append("</td></tr>\n");
        }
        sb.Append("</tbody>\n</table>\n<p class=\"note\">Contents are fractions of each histogram's Σw").Append(discrete ? "" : "; the plot divides them by the bin width").Append(".</p></details>\n");
    }

    private static string Fraction(double value, double error) =>
        $"{value.ToString("0.00000", CultureInfo.InvariantCulture)} ± {error.ToString("0.00000", CultureInfo.InvariantCulture)}";

    private static string Description(FeatureOutcomes s)
    {
        if (s.Comparison is not { } c) return $"{s.Outcomes.Count} check{(s.Outcomes.Count == 1 ? "" : "s")}";
        var f = c.Spec;
        var parts = new List<string>
        {
            f.Expression is { } e ? "= " + e : f.Column == f.Name ? "column" : "column " + f.Column,
            f.Kind == FeatureKind.Discrete ? $"discrete, {c.Reference.Histogram.Axis.Count} values" : $"{c.Reference.Histogram.Axis.Count} bins",
            f.Kind == FeatureKind.Discrete ? $"core: categories holding {Share(f.Core.Fraction)}" : $"core: central {Share(f.Core.Fraction)}",
        };
        if (f.Condition is { } cond) parts.Add("where " + cond.Text);
        return string.Join(" · ", parts);
    }

    /// <summary>Drops OxyPlot's fixed size so the plot scales with the page; its viewBox keeps the aspect ratio.</summary>
    private static string Responsive(string svg, string label)
    {
        var start = svg.IndexOf("<svg", StringComparison.Ordinal);
        var end = svg.IndexOf('>', start);
        var tag = svg[start..end];
        var fixedSize = System.Text.RegularExpressions.Regex.Replace(tag, "\\s(width|height)=\"[^\"]*\"", "");
        if (!fixedSize.Contains("viewBox", StringComparison.Ordinal))
            fixedSize += string.Create(CultureInfo.InvariantCulture, $" viewBox=\"0 0 {FeaturePlot.Width} {FeaturePlot.Height}\"");
        fixedSize += " role=\"img\" aria-label=\"" + E(label) + "\"";
        return fixedSize + svg[end..];
    }

    /// <summary>Unique, URL-safe anchors per subject.</summary>
    private static Dictionary<string, string> Ids(IReadOnlyList<FeatureOutcomes> subjects)
    {
        var ids = new Dictionary<string, string>();
        var used = new HashSet<string>();
        foreach (var s in subjects)
        {
            var id = "f-" + new string(s.Name.Select(ch => char.IsAsciiLetterOrDigit(ch) || ch is '_' or '-' ? ch : '-').ToArray());
            var unique = id;
            for (var n = 2; !used.Add(unique); n++) unique = id + "-" + n;
            ids[s.Name] = unique;
        }
        return ids;
    }

    private static string Css(Verdict v) => v switch { Verdict.Pass => "pass", Verdict.Fail => "fail", _ => "inconclusive" };

    private static string Code(string text) => "<code>" + E(text) + "</code>";

    private static string E(string text) => WebUtility.HtmlEncode(text);

    private static readonly string Style = $$"""
        :root{--ink:{{ReportPalette.Ink}};--muted:{{ReportPalette.Muted}};--grid:{{ReportPalette.Grid}};--paper:{{ReportPalette.Paper}};--page:{{ReportPalette.Page}};
        --pass:{{ReportPalette.Pass}};--fail:{{ReportPalette.Fail}};--inconclusive:{{ReportPalette.Inconclusive}};--ref:{{ReportPalette.Reference}};--reffill:{{ReportPalette.ReferenceFill}};--sur:{{ReportPalette.Surrogate}};}
        *{box-sizing:border-box}
        body{margin:0;background:var(--page);color:var(--ink);font:15px/1.45 system-ui,-apple-system,"Segoe UI","DejaVu Sans",Helvetica,Arial,sans-serif}
        code,.sha,.where{font-family:ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;font-size:.88em}
        header.run{background:var(--paper);border-top:8px solid var(--pass);padding:18px 28px 10px;box-shadow:0 1px 3px #0002}
        header.run.fail{border-top-color:var(--fail)}header.run.inconclusive{border-top-color:var(--inconclusive)}
        .headline{display:flex;align-items:center;gap:16px;flex-wrap:wrap}
        h1{margin:0;font-size:1.6em;font-weight:650}
        .stamp{font-weight:800;letter-spacing:.08em;color:#fff;padding:4px 14px;border-radius:4px;font-size:1.15em}
        .stamp.pass{background:var(--pass)}.stamp.fail{background:var(--fail)}.stamp.inconclusive{background:var(--inconclusive)}
        .counts{margin:10px 0 8px;display:flex;gap:18px;flex-wrap:wrap;align-items:baseline}
        .count b{font-size:1.5em}.count.fail{color:var(--fail)}.count.inconclusive{color:var(--inconclusive)}.count.pass{color:var(--pass)}.count.zero{color:var(--muted)}
        .total{color:var(--muted)}
        .binding{margin:4px 0 8px}.binding h2{margin:0;font-size:1em;font-weight:600}.binding ol{margin:2px 0 0;padding-left:1.6em}
        .facts{display:grid;grid-template-columns:max-content 1fr;gap:2px 16px;margin:6px 0 8px;color:var(--muted);font-size:.92em}
        .facts dt{font-weight:600}.facts dd{margin:0;color:var(--ink);overflow-wrap:anywhere}.sha{color:var(--muted);margin-left:8px}
        nav.overview{display:flex;gap:14px;flex-wrap:wrap;padding:14px 28px 4px}
        .group{background:var(--paper);border-left:6px solid var(--pass);padding:6px 14px 8px;border-radius:3px;box-shadow:0 1px 2px #0001;flex:1 1 260px}
        .group.fail{border-left-color:var(--fail)}.group.inconclusive{border-left-color:var(--inconclusive)}
        .group h2{margin:0 0 4px;font-size:1em}.group h2 small{color:var(--muted);font-weight:400}
        .group ul{margin:0;padding:0;list-style:none;columns:2 170px;column-gap:18px}
        .group li{break-inside:avoid;overflow-wrap:anywhere}.group a{color:var(--ink);font-weight:600;text-decoration:none}.group a:hover{text-decoration:underline}
        .group li small{color:var(--muted);white-space:nowrap}
        .controls{padding:8px 28px 0;color:var(--muted)}
        .controls button{font:inherit;font-size:.9em;margin:0 4px 0 0;padding:2px 10px;border:1px solid #c5cad1;background:var(--paper);border-radius:12px;cursor:pointer;color:var(--ink)}
        .controls button[aria-pressed="true"]{background:var(--ink);color:#fff;border-color:var(--ink)}
        main{padding:8px 28px 20px}
        section.subject{background:var(--paper);margin:12px 0;border-left:6px solid var(--pass);border-radius:3px;box-shadow:0 1px 3px #0002}
        section.subject.fail{border-left-color:var(--fail)}section.subject.inconclusive{border-left-color:var(--inconclusive)}
        section.subject>details>summary{cursor:pointer;padding:10px 16px;display:flex;gap:12px;align-items:baseline;flex-wrap:wrap;list-style-position:outside}
        .name{font-weight:700;font-size:1.2em}.what{color:var(--muted);font-size:.9em}
        .badge{display:inline-block;min-width:4.8em;text-align:center;font-size:.78em;font-weight:700;letter-spacing:.04em;text-transform:uppercase;border-radius:3px;padding:1px 6px;color:#fff;background:var(--pass)}
        .badge.fail{background:var(--fail)}.badge.inconclusive{background:var(--inconclusive)}
        figure.plot{margin:0 16px;max-width:900px}
        figure.plot svg{width:100%;height:auto;display:block}
        figcaption{display:flex;flex-wrap:wrap;gap:4px 16px;font-size:.88em;color:var(--muted);padding:2px 0 8px}
        .key{white-space:nowrap}.key b{font-size:.85em}.key b.fail{color:var(--fail)}.key b.pass{color:var(--pass)}.key b.inconclusive{color:var(--inconclusive)}
        .sw{display:inline-block;width:22px;height:11px;margin-right:5px;vertical-align:-1px;border-radius:2px}
        .sw.ref{background:var(--reffill);border-top:2px solid var(--ref)}.sw.sur{height:2px;background:var(--sur);vertical-align:3px}
        .sw.out{width:9px;height:9px;border-radius:50%;background:var(--fail)}
        table{border-collapse:collapse;margin:4px 16px 12px;font-size:.9em}
        th,td{padding:3px 10px;border-bottom:1px solid var(--grid);text-align:left;white-space:nowrap}
        th{color:var(--muted);font-weight:600;border-bottom:2px solid #c9ced4}
        td.num,th.num{text-align:right;font-variant-numeric:tabular-nums}
        tr.fail td{background:#fbeced}tr.inconclusive td{background:#fdf4e3}
        tr.why td{white-space:normal;color:var(--muted);font-size:.92em;padding-top:0;max-width:70em}
        .note{margin:6px 16px;color:var(--muted);font-size:.9em}
        details.bins{margin:0 16px 12px}details.bins>summary{cursor:pointer;color:var(--muted);font-size:.9em}
        details.bins table{margin-left:0}
        footer{padding:6px 28px 28px;color:var(--muted);font-size:.85em;max-width:80em}
        @media print{.controls{display:none}section.subject{break-inside:avoid} }
        """;

    // Filters sections by verdict and opens or closes them; marks the page once it ran (the headless-browser test reads the mark).
    private const string Script = """
        (function () {
          var root = document.documentElement;
          window.addEventListener('error', function (e) { root.setAttribute('data-script-error', String(e.message)); });
          var sections = Array.prototype.slice.call(document.querySelectorAll('section.subject'));
          var buttons = Array.prototype.slice.call(document.querySelectorAll('[data-show]'));
          function show(which) {
            sections.forEach(function (s) { s.hidden = which !== 'all' && s.getAttribute('data-verdict') !== which; });
            buttons.forEach(function (b) { b.setAttribute('aria-pressed', String(b.getAttribute('data-show') === which)); });
          }
          buttons.forEach(function (b) { b.addEventListener('click', function () { show(b.getAttribute('data-show')); }); });
          Array.prototype.forEach.call(document.querySelectorAll('[data-expand]'), function (b) {
            b.addEventListener('click', function () {
              var open = b.getAttribute('data-expand') === 'open';
              sections.forEach(function (s) { s.querySelector('details.body').open = open; });
            });
          });
          document.getElementById('controls').hidden = false;
          // A link to a collapsed section opens it.
          function reveal() {
            var target = location.hash && document.getElementById(location.hash.slice(1));
            if (target) { target.hidden = false; var d = target.querySelector('details.body'); if (d) d.open = true; }
          }
          window.addEventListener('hashchange', reveal);
          reveal();
          root.setAttribute('data-report-ready', String(sections.length));
        })();
        """;
}
