using System.CommandLine;
using System.Diagnostics;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Cli.Commands;

/// <summary>
/// <c>gatetasks demo</c>: the whole job on a built-in toy scenario — simulate, build the reference, check a
/// faithful and a drifted surrogate. Succeeds when the faithful one passes and the drifted one fails.
/// </summary>
internal static class DemoCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var dir = new Option<string>("--dir")
        {
            HelpName = "DIR",
            Description = "Folder for the demo's samples, contract, reference and reports.",
            DefaultValueFactory = _ => "gatetasks-demo",
        }.NotEmpty();
        var surrogate = new Option<string>("--surrogate")
        {
            HelpName = "generator|response",
            Description = "Which surrogate the demo plays: 'generator' (reco-level events in place of the full simulation) or 'response' (a fast detector response, checked per bin of the true energy).",
            DefaultValueFactory = _ => "generator",
        };
        surrogate.AcceptOnlyFromAmong("generator", "response");
        var command = new Command("demo", "Run the built-in demo: a toy full simulation, a faithful and a drifted surrogate, checked under a commented contract.") { dir, surrogate };
        command.SetAction(parse => CliApp.Guard(stderr, () => Run(
            new DemoRun(parse.GetValue(dir)!, parse.GetValue(surrogate) == "response" ? DemoKind.Response : DemoKind.Generator), stdout, stderr)));
        return command;
    }

    private static int Run(DemoRun demo, TextWriter stdout, TextWriter stderr)
    {
        Verify(demo);
        var clock = Stopwatch.StartNew();
        var response = demo.Kind == DemoKind.Response;
        stdout.WriteLine($"GateTasks demo in {demo.Folder} ({(response ? "a fast detector response" : "a generator surrogate")})");
        stdout.WriteLine($"1. Simulating Φ(95) → γγ: {DemoRun.ReferenceEvents} full-simulation events, {DemoRun.SurrogateEvents} each for a faithful and a drifted surrogate …");
        demo.WriteInputs();
        stdout.WriteLine($"   wrote {Path.GetFileName(demo.FullSimulationPath)}, {Path.GetFileName(demo.FaithfulPath)}, {Path.GetFileName(demo.DriftedPath)} and {Path.GetFileName(demo.ContractPath)}");
        stdout.WriteLine("2. Building the reference histograms from the full simulation …");
        demo.BuildReference();
        stdout.WriteLine($"   wrote {DemoContract.ReferenceFileName}");

        stdout.WriteLine();
        stdout.WriteLine("3. Checking the faithful surrogate (same model, another seed) and accepting its state into the ledger:");
        var (faithful, faithfulJunit) = demo.Check(demo.FaithfulPath, "faithful", accept: true);
        CheckCommand.Print(faithful, null, new CommandOutput(stdout, stderr));
        Reports(faithfulJunit, stdout);

        stdout.WriteLine();
        stdout.WriteLine(response
            ? "4. Checking the drifted response (resolution 5% worse for photons of true energy 50–75 GeV):"
            : "4. Checking the drifted surrogate (larger constant term, thinned high-mass tail):");
        var (drifted, driftedJunit) = demo.Check(demo.DriftedPath, "drifted");
        CheckCommand.Print(drifted, null, new CommandOutput(stdout, stderr));
        Reports(driftedJunit, stdout);

        stdout.WriteLine();
        var asExpected = faithful.Outcome == RunOutcome.Passed && drifted.Outcome == RunOutcome.Failed;
        stdout.WriteLine(asExpected
            ? $"Demo finished in {clock.Elapsed.TotalSeconds:0.0} s: the faithful surrogate passed and the drifted one failed, as it should."
            : $"Demo finished in {clock.Elapsed.TotalSeconds:0.0} s, but NOT as expected: faithful {faithful.Outcome.Word()}, drifted {drifted.Outcome.Word()}.");
        stdout.WriteLine($"Open {Path.Combine(demo.ReportFolder, "drifted.html")} in a browser to see each feature's distributions and ratios.");
        stdout.WriteLine($"Try it yourself: cd {demo.Folder} && gatetasks check --sample {Path.GetFileName(demo.DriftedPath)} --junit drifted.xml --html drifted.html");
        return asExpected ? ExitCodes.Success : ExitCodes.ChecksFailed;
    }

    /// <summary>
    /// Refuses, before anything is written, a folder where the demo would destroy something: one of its files that is not
    /// a regular file (GATE0005), or a contract there that is not the demo's (GATE0004): the demo would replace it and
    /// delete its ledger.
    /// </summary>
    private static void Verify(DemoRun demo)
    {
        var paths = new RunPaths();
        foreach (var file in new[] { demo.FullSimulationPath, demo.FaithfulPath, demo.DriftedPath, demo.ContractPath,
                     Path.Combine(demo.Folder, DemoContract.ReferenceFileName), Path.Combine(demo.Folder, AcceptanceSettings.DefaultLedgerName(demo.ContractPath)) }
                     .Concat(new[] { "faithful", "drifted" }.SelectMany(n => new[] { ".junit.xml", ".html", ".md" }.Select(e => Path.Combine(demo.ReportFolder, n + e)))))
            paths.Write(file, "the demo's file");
        paths.VerifyOutputs();
        var contract = new FileInfo(demo.ContractPath);
        if (contract.Exists && (contract.Length > InputFileGuard.ContractSizeLimit
                                || File.ReadAllText(contract.FullName) is var text && text != DemoContract.Text && text != DemoContract.ResponseText))
            throw new GateInputException(ErrorCodes.OutputIsInput,
                $"{contract.FullName} is a contract the demo did not write; the demo would replace it and delete its ledger. Run the demo in a folder of its own (--dir).",
                new SourceLocation(contract.FullName));
    }

    /// <summary>Names the JUnit report and the HTML report and Markdown summary written beside it.</summary>
    private static void Reports(string junit, TextWriter stdout)
    {
        var stem = junit[..^".junit.xml".Length];
        stdout.WriteLine($"JUnit report: {junit}");
        stdout.WriteLine($"HTML report: {stem}.html");
        stdout.WriteLine($"Markdown summary: {stem}.md");
    }
}
