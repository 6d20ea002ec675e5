using System.CommandLine;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;
using GateTasks.Engine.Reports;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks history</c>: the accepted entries of a contract's ledger and what changed between them.</summary>
internal static class HistoryCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var baseRevision = SharedOptions.BaseRevision();
        var feature = new Option<string?>("--feature") { HelpName = "NAME", Description = "Show the headroom of this feature's (or pair's) checks only." };
        var worsened = new Option<bool>("--worsened") { Description = "Show the headroom of checks that got worse beyond their noise at some entry only (the ratchet's rule)." };
        var command = new Command("history",
            "List the accepted entries of the contract's ledger, oldest first, with the tolerances loosened and tightened at each, then each check's headroom at every entry.")
        {
            contract, feature, worsened, baseRevision,
        };
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
            var headroom = HeadroomHistory.Of(entries);
            var only = parse.GetValue(feature);
            if (only is not null && !headroom.Subjects.Contains(only, StringComparer.Ordinal))
                throw new GateInputException(ErrorCodes.Usage,
                    $"--feature {only}: no entry of {path} holds a tolerance check of that name{NearestName.Hint(only, headroom.Subjects)}.");
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
            if (entries.Count > 0)
            {
                stdout.WriteLine();
                stdout.Write(HeadroomHistoryText.Render(headroom, only, parse.GetValue(worsened)));
            }
            return ExitCodes.Success;
        }));
        return command;
    }
}
