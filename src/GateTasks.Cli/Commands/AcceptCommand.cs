using System.CommandLine;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;
using GateTasks.Engine.Runs;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks accept</c>: runs the check and records the passing state in the contract's acceptance ledger.</summary>
internal static class AcceptCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var sample = SharedOptions.Sample();
        var reason = new Option<string>("--reason", "-r") { HelpName = "TEXT", Description = "Why this state is accepted (one line; required).", Required = true };
        var by = new Option<string?>("--by") { HelpName = "NAME", Description = "Who accepts (default: the CI user, else git's user.name and user.email)." };
        var baseRevision = SharedOptions.BaseRevision();
        var json = SharedOptions.Json("accept");
        var command = new Command("accept", "Check the sample, then record the contract, the reference and the results as accepted in the contract's ledger. Refused when the check does not pass.")
        {
            contract, sample, reason, by, baseRevision, json,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () => ResultJsonRun.Run(parse.GetValue(json), "accept", parse.GetValue(contract)!,
            // The ledger is written: it must be a regular file or a new path, and none of the files the check reads.
            loaded => new RunPaths().Read(loaded.FilePath, "the contract").Read(loaded.ReferenceFullPath, "the contract's reference")
                .Read(ContractInputs.SampleFiles(loaded, parse.GetValue(sample)), "a sample file")
                .Write(loaded.LedgerFullPath, "the acceptance ledger"),
            (loaded, result) =>
        {
            var who = parse.GetValue(by) ?? AcceptorIdentity.Find(loaded.Directory)
                ?? throw new GateInputException(ErrorCodes.Usage, "Cannot tell who accepts: no CI user and no git user.name here; say it with --by \"Name <email>\".");
            // An entry is never appended to a ledger that rewrote the accepted history.
            var history = SharedOptions.CheckHistory(loaded, parse.GetValue(baseRevision));
            stdout.WriteLine(history.Note);
            if (history.Finding is { } finding) throw new GateInputException(finding.Code, "Not accepted: " + finding.Message, finding.Location);
            var report = ContractRun.Run(loaded, parse.GetValue(sample), ProgressDisplay.For(stdout, stderr));
            Engine.Ledger.LedgerEntry entry;
            try
            {
                entry = Acceptance.Accept(report, who, parse.GetValue(reason)!, DateTimeOffset.UtcNow);
            }
            catch (GateInputException) when (result.Path is { } refusedPath)
            {
                // Refused: the JSON holds the check's result with no entry, never an earlier acceptance.
                Engine.Reports.ResultJson.Write(refusedPath, report, "accept", null);
                result.Finished();
                throw;
            }
            if (result.Path is { } jsonPath)
            {
                Engine.Reports.ResultJson.Write(jsonPath, report, "accept", entry.Number);
                result.Finished();
            }
            stdout.WriteLine($"accepted as entry {entry.Number} of {loaded.LedgerFullPath}");
            stdout.WriteLine($"  by   {entry.By}");
            stdout.WriteLine($"  why  {entry.Why}");
            stdout.WriteLine($"  contract sha256 {entry.ContractSha256[..12]}…, reference sha256 {entry.ReferenceSha256[..12]}…, {entry.ResultsNote}");
            stdout.WriteLine("Commit the ledger together with the contract.");
            return ExitCodes.Success;
        })));
        return command;
    }
}
