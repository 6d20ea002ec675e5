using System.CommandLine;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks history</c>: the accepted entries of a contract's ledger and what changed between them.</summary>
internal static class HistoryCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var baseRevision = SharedOptions.BaseRevision();
        var command = new Command("history", "List the accepted entries of the contract's ledger, oldest first, with the tolerances loosened and tightened at each.") { contract, baseRevision };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var loaded = ContractLoader.Load(parse.GetValue(contract)!);
            var path = loaded.LedgerFullPath;
            LedgerGuard.RefuseDirectory(loaded);
            var history = SharedOptions.CheckHistory(loaded, parse.GetValue(baseRevision));
            if (history.Finding is { } finding) throw new GateInputException(finding.Code, finding.Message, finding.Location);
            new RunPaths().Read(path, "the contract's acceptance ledger").VerifyInputs();
            if (!File.Exists(path))
            {
                stdout.WriteLine($"No acceptance ledger at {path}; start one with: {LedgerGuard.AcceptCommand(loaded)}");
                return ExitCodes.Success;
            }
            var entries = LedgerFile.Read(path);
            stdout.WriteLine($"{path}: {entries.Count} accepted entr{(entries.Count == 1 ? "y" : "ies")}, chain intact");
            stdout.WriteLine(history.Note);
            foreach (var item in LedgerHistory.Of(entries))
            {
                var e = item.Entry;
                stdout.WriteLine();
                stdout.WriteLine($"#{e.Number}  {e.When.UtcDateTime:yyyy-MM-dd HH:mm:ss} UTC  {e.By}");
                stdout.WriteLine($"    why: {e.Why}");
                stdout.WriteLine($"    evidence: {e.ResultsNote}");
                if (item.Previous is null)
                {
                    stdout.WriteLine($"    first entry: {e.State.Limits.Count} checks accepted");
                    continue;
                }
                if (item.ReferenceChanged) stdout.WriteLine($"    reference replaced: sha256 {item.Previous.ReferenceSha256[..12]}… → {e.ReferenceSha256[..12]}…");
                foreach (var c in item.Changes)
                    stdout.WriteLine($"    {(c.Direction == ChangeDirection.Looser ? "loosened " : "tightened")} {c.Text}");
                if (!item.ReferenceChanged && item.Changes.Count == 0) stdout.WriteLine("    no tolerance changed (results re-recorded)");
            }
            return ExitCodes.Success;
        }));
        return command;
    }
}
