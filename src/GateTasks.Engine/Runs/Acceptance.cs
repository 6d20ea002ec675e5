using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Ledger;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Runs;

/// <summary>
/// Records the state a passing check run rests on as a new ledger entry: the contract's and reference's SHA-256, the
/// SHA-256 of the results (one canonical line per check) with the margins measured, who, when and why.
/// </summary>
internal static class Acceptance
{
    public static LedgerEntry Accept(RunResult report, string by, string why, DateTimeOffset now)
    {
        var contract = report.Contract;
        if (string.IsNullOrWhiteSpace(why) || why.Any(char.IsControl))
            throw new GateInputException(ErrorCodes.Usage, "--reason needs a one-line reason saying why this state is accepted.");
        if (string.IsNullOrWhiteSpace(by) || by.Any(char.IsControl))
            throw new GateInputException(ErrorCodes.Usage, "Say who accepts, on one line: --by \"Name <email>\".");
        if (report.ChecksOutcome != RunOutcome.Passed)
            throw new GateInputException(ErrorCodes.AcceptRefused,
                $"Not accepted: the check {(report.Failures > 0 ? "does not pass" : "is undecided")} ({report.Failures} failed, {report.Inconclusive} inconclusive). An entry records a state whose every tolerance is shown met; fix the surrogate or the contract, or use a larger sample, first.",
                new SourceLocation(contract.FilePath, 1, 1));
        var path = contract.LedgerFullPath;
        LedgerGuard.RefuseDirectory(contract);
        var existing = File.Exists(path) ? LedgerFile.Read(path) : [];
        var state = AcceptedState.Of(contract, report.Outcomes);
        var results = ResultsText(report);
        var entry = new LedgerEntry(0, now, by.Trim(), why.Trim(),
            FileDigest.Sha256(contract.FilePath), Relative(contract.Directory, contract.FilePath),
            report.ReferenceSha256, Relative(contract.Directory, report.ReferencePath),
            Convert.ToHexString(SHA256.HashData(Encoding.UTF8.GetBytes(results))).ToLowerInvariant(),
            $"{string.Join(", ", report.SampleFiles.Select(f => Relative(contract.Directory, f)))}: {report.Outcomes.Count} checks, " +
            $"{report.Outcomes.Count(o => o.Verdict == Verdict.Pass)} pass, {report.Events.ToString(CultureInfo.InvariantCulture)} events",
            state, "", "");
        return LedgerFile.Append(path, existing, entry);
    }

    /// <summary>One line per check: subject, check, estimate, upper bound, adjusted p-value, verdict (round-trip numbers).</summary>
    internal static string ResultsText(RunResult report)
    {
        var b = new StringBuilder();
        foreach (var o in report.Outcomes)
            b.Append(new LedgerLine("result").Add(o.Subject.Name).Add(o.Check.Label).Add(o.Measured.Estimate).Add(o.Measured.Upper)
                .Add(o.AdjustedPValue).Add(o.Verdict.ToString().ToLowerInvariant())).Append('\n');
        return b.ToString();
    }

    private static string Relative(string folder, string path) => Path.GetRelativePath(folder, path).Replace('\\', '/');
}
