using System.CommandLine;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Ranking;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Runs;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks rank</c>: checks several candidate samples under one contract and ranks them.</summary>
internal static class RankCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var candidates = new Argument<string[]>("candidate")
        {
            Description = "Candidate samples: a Parquet, CSV, NumPy (.npy, .npz) or HDF5 file, a folder (its files are one sample), or a quoted glob such as \"checkpoints/epoch-*.parquet\" (one candidate per file).",
            Arity = ArgumentArity.OneOrMore,
        }.NotEmpty();
        var csv = new Option<string?>("--csv") { HelpName = "FILE", Description = "Also write the ranking as CSV to this path." }.NotEmpty();
        var json = SharedOptions.Json("rank");
        var html = new Option<string?>("--html") { HelpName = "FILE", Description = "Also write the ranking as an HTML page, with a plot of the global score across the candidates in the order given." }.NotEmpty();
        var markdown = new Option<string?>("--markdown") { HelpName = "FILE", Description = "Also write the ranking as Markdown, with the plot of the global score as an SVG file beside it (NAME.score.svg)." }.NotEmpty();
        var command = new Command("rank", "Check several candidate samples (e.g. the checkpoints of a training run) under one contract and rank them: fewer failed, then fewer inconclusive checks, then a lower global score (the joint block's Fréchet distance), then a higher worst margin. Exit 0: at least one candidate passes; 1: none does; 2: input error, or a candidate could not be checked.")
        {
            contract, candidates, csv, json, html, markdown,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            IReadOnlyList<string> paths = [];
            return ResultJsonRun.Run(parse.GetValue(json), "rank", parse.GetValue(contract)!,
                loaded =>
                {
                    paths = CandidatePatterns.Expand(parse.GetValue(candidates)!);
                    return new RunPaths().Contract(loaded)
                        .Read(paths.SelectMany(p => Directory.Exists(p) ? SampleFiles.Resolve(p, Directory.GetCurrentDirectory()) : [p]), "a candidate file")
                        .Write(parse.GetValue(csv), "--csv").Write(parse.GetValue(html), "--html")
                        .Write(parse.GetValue(markdown), "--markdown")
                        .Write(parse.GetValue(markdown) is { } md ? RankingMarkdown.PlotPath(md) : null, "the --markdown plot");
                },
                (loaded, result) => Rank(loaded, paths, parse.GetValue(csv), result, parse.GetValue(html), parse.GetValue(markdown), stdout, stderr));
        }));
        return command;
    }

    private static int Rank(PrecisionContract loaded, IReadOnlyList<string> paths, string? csvOption, ResultJsonRun result, string? htmlOption, string? markdownOption,
        TextWriter stdout, TextWriter stderr)
    {
        {
            var report = RankingRun.Run(loaded, paths, (i, r) => stdout.WriteLine(
                $"checked {i + 1}/{paths.Count} {r.Candidate}: " +
                (r.Error is not null ? $"not checked ({r.Error.Code})" : $"{(r.Outcome == RunOutcome.Failed ? "FAIL" : r.Outcome == RunOutcome.Undecided ? "undecided" : "pass")}, {r.Failed} failed, {r.Inconclusive} inconclusive, {r.Score.Text}")));
            stdout.WriteLine();
            stdout.WriteLine($"contract  {loaded.FilePath}");
            stdout.WriteLine($"reference {report.ReferencePath}");
            stdout.WriteLine();
            stdout.Write(RankingTable.Format(report));
            foreach (var c in report.NotChecked)
                stderr.WriteLine($"{c.Result.Error!.DiagnosticLine} (candidate {c.Result.Candidate}: not ranked)");
            if (csvOption is { } csvPath)
            {
                RankingCsv.Write(csvPath, report);
                stdout.WriteLine($"CSV: {Path.GetFullPath(csvPath)}");
            }
            if (result.Path is { } jsonPath)
            {
                RankingJson.Write(jsonPath, report);
                result.Finished();
                stdout.WriteLine($"JSON: {Path.GetFullPath(jsonPath)}");
            }
            if (htmlOption is { } htmlPath)
            {
                RankingHtml.Write(htmlPath, report);
                stdout.WriteLine($"HTML: {Path.GetFullPath(htmlPath)}");
            }
            if (markdownOption is { } markdownPath)
            {
                RankingMarkdown.Write(markdownPath, report);
                stdout.WriteLine($"Markdown: {Path.GetFullPath(markdownPath)} (plot {RankingMarkdown.PlotPath(markdownPath)})");
            }
            stdout.WriteLine(RankingTable.Summary(report));
            // A candidate that could not be checked is an input error even when another passes: its place is unknown.
            return report.NotChecked.Count > 0 ? ExitCodes.InputError
                : report.AnyPassed ? ExitCodes.Success
                : ExitCodes.ChecksFailed;
        }
    }
}
