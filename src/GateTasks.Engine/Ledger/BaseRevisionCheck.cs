using System.Text;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// Holds the ledger to its own history in the repository: the ledger in the working tree must extend the ledger as
/// committed at the base revision (e.g. a pull request's target branch) entry for entry, each entry's lines byte for
/// byte. The seals alone cannot see an entry that was edited and resealed, with every later seal recomputed; the
/// committed history can. Without a base revision the check is not done, and its note says so.
/// </summary>
internal static class BaseRevisionCheck
{
    /// <summary>What the check found: a line for the output, and a GATE4002 finding when the ledger does not extend the base.</summary>
    public sealed record Result(string Note, LedgerFinding? Finding);

    /// <summary>
    /// Compares the contract's ledger with the ledger at <paramref name="baseRevision"/>. Throws a
    /// <see cref="GateInputException"/> when the comparison cannot be made (git missing: GATE4011, an unknown revision:
    /// GATE4012, no repository or git failing: GATE4013, the base's ledger broken: GATE4015): an unknown base never passes.
    /// </summary>
    public static Result Verify(PrecisionContract contract, BaseRevision? baseRevision, IGitCommandLine git)
    {
        if (baseRevision is null)
            return new("ledger history: not checked (no base revision given, and no pull-request base from CI): " +
                       "an accepted entry edited and resealed would not be detected", null);
        var path = contract.LedgerFullPath;
        var at = new SourceLocation(path);
        var folder = contract.Directory;
        var relative = Path.GetRelativePath(folder, path).Replace('\\', '/');
        // "rev:./name" and "rev:../name" are read relative to the folder git runs in.
        var spec = relative.StartsWith("../", StringComparison.Ordinal) ? relative : "./" + relative;

        GitResult Git(params string[] args) => git.Run(folder, args)
            ?? throw new GateInputException(ErrorCodes.GitUnavailable,
                $"The ledger is to be checked against base revision {baseRevision}, but the git program cannot be started: install git or put it on PATH.", at);

        var top = Git("rev-parse", "--show-toplevel");
        if (top.ExitCode != 0)
            throw new GateInputException(ErrorCodes.GitFailed,
                $"The ledger is to be checked against base revision {baseRevision}, but git cannot read a repository at {folder}: {OneLine(top.Error)}", at);
        var resolved = Git("rev-parse", "--verify", "--quiet", baseRevision.Revision + "^{commit}");
        if (resolved.ExitCode != 0 || resolved.Text.Length == 0)
            throw new GateInputException(ErrorCodes.BaseRevisionUnknown,
                $"The base revision {baseRevision} names no commit in the repository {top.Text}; fetch it first " +
                "(a shallow clone lacks it: with actions/checkout set fetch-depth: 0, in GitLab GIT_DEPTH: 0). The ledger's history was not checked.", at);
        var commit = resolved.Text;
        var named = $"{baseRevision} ({commit[..Math.Min(12, commit.Length)]})";
        var kind = Git("cat-file", "-t", $"{commit}:{spec}");
        if (kind.ExitCode != 0 || kind.Text != "blob")
            return new($"ledger history: no ledger at base revision {named}; a new ledger, nothing to extend", null);
        var blob = Git("cat-file", "blob", $"{commit}:{spec}");
        if (blob.ExitCode != 0)
            throw new GateInputException(ErrorCodes.GitFailed, $"git cannot read {relative} at base revision {named}: {OneLine(blob.Error)}", at);

        var before = Lines.Of(blob.Output);
        IReadOnlyList<LedgerEntry> accepted;
        try
        {
            accepted = LedgerFile.Parse(before.Text, $"{relative} at {named}");
        }
        catch (GateInputException e)
        {
            throw new GateInputException(ErrorCodes.BaseLedgerUnreadable,
                $"The ledger as committed at base revision {named} is itself broken ({e.Code} at line {e.Location?.Line}: {e.Message}); " +
                "the ledger cannot be checked against it. Repair the base branch first.", at);
        }
        if (accepted.Count == 0)
            return new($"ledger history: the ledger at base revision {named} holds no entry; nothing to extend", null);

        if (!File.Exists(path))
        {
            // A directory here is reported by the ledger check itself.
            if (Directory.Exists(path)) return new($"ledger history: not compared with {named}: the ledger path is a directory", null);
            return new($"ledger history: the ledger is gone, {accepted.Count} accepted entries at {named}", new(ErrorCodes.LedgerTampered, true,
                $"The acceptance ledger {path} was removed, but base revision {named} holds {Entries(accepted.Count)}: accepted entries are never removed. " +
                $"Restore it with 'git checkout {commit} -- {relative}' (run in {folder}).", LedgerGuard.LedgerLocation(contract)));
        }
        Lines now;
        IReadOnlyList<LedgerEntry> current;
        try
        {
            now = Lines.Of(File.ReadAllBytes(path));
            current = LedgerFile.Parse(now.Text, path);
        }
        catch (Exception e) when (e is GateInputException or IOException or UnauthorizedAccessException)
        {
            // The ledger check reports a ledger it cannot read or whose chain is broken.
            return new($"ledger history: not compared with {named}: the ledger itself cannot be read", null);
        }

        for (var k = 0; k < accepted.Count; k++)
        {
            var then = accepted[k];
            if (k >= current.Count)
            {
                var line = current.Count == 0 ? 1 : current[^1].LastLine + 1;
                return new($"ledger history: entry {then.Number} of {named} is missing", new(ErrorCodes.LedgerTampered, true,
                    $"Entry {then.Number}, accepted at base revision {named} (its line {then.Line} there), is missing: the ledger holds {Entries(current.Count)}, " +
                    $"the base {accepted.Count}. Accepted entries are never removed; to return to an earlier state, accept it again as a new entry. " +
                    $"Restore the ledger with 'git checkout {commit} -- {relative}' (run in {folder}).", new SourceLocation(path, line, 1)));
            }
            var entry = current[k];
            if (FirstDifference(before, then, now, entry) is not { } d) continue;
            var detail = d.Now is null ? $"it ends at line {entry.LastLine} where the accepted entry goes on with '{Shorten(d.Then!)}'"
                : d.Then is null ? $"line {d.Line} ('{Shorten(d.Now)}') is not in the accepted entry"
                : $"line {d.Line} reads '{Shorten(d.Now)}' where the accepted entry has '{Shorten(d.Then)}'";
            return new($"ledger history: entry {entry.Number} differs from {named}", new(ErrorCodes.LedgerTampered, true,
                $"Entry {entry.Number} (line {entry.Line}) is not the entry accepted at base revision {named} (its line {then.Line} there): {detail}. " +
                "Accepted entries are never edited; its seals were recomputed after the edit. " +
                $"Restore the ledger with 'git checkout {commit} -- {relative}' (run in {folder}) and record changes as new entries.",
                new SourceLocation(path, entry.Line, 1)));
        }
        var added = current.Count - accepted.Count;
        return new($"ledger history: extends the {Entries(accepted.Count)} at base revision {named}" +
                   (added == 0 ? ", none added" : $", {added} added"), null);
    }

    private sealed record Difference(int Line, string? Now, string? Then);

    /// <summary>The first line where an entry differs from the accepted one, byte for byte, or null when it is the same.</summary>
    private static Difference? FirstDifference(Lines before, LedgerEntry then, Lines now, LedgerEntry entry)
    {
        var lengthThen = then.LastLine - then.Line + 1;
        var lengthNow = entry.LastLine - entry.Line + 1;
        for (var j = 0; j < Math.Max(lengthThen, lengthNow); j++)
        {
            if (j >= lengthNow) return new(entry.LastLine, null, before.Text[then.Line - 1 + j]);
            if (j >= lengthThen) return new(entry.Line + j, now.Text[entry.Line - 1 + j], null);
            if (!now.Raw[entry.Line - 1 + j].AsSpan().SequenceEqual(before.Raw[then.Line - 1 + j]))
                return new(entry.Line + j, now.Text[entry.Line - 1 + j], before.Text[then.Line - 1 + j]);
        }
        return null;
    }

    /// <summary>
    /// A file's lines as bytes and as UTF-8 text, split where <see cref="File.ReadAllLines(string)"/> splits (CR LF,
    /// LF or CR), without a leading UTF-8 byte-order mark. Line ends are not compared: git may convert them on checkout.
    /// </summary>
    private sealed record Lines(IReadOnlyList<byte[]> Raw, IReadOnlyList<string> Text)
    {
        public static Lines Of(byte[] bytes)
        {
            var start = bytes.AsSpan().StartsWith(Encoding.UTF8.Preamble) ? Encoding.UTF8.Preamble.Length : 0;
            var raw = new List<byte[]>();
            var i = start;
            while (i < bytes.Length)
            {
                var end = i;
                while (end < bytes.Length && bytes[end] is not ((byte)'\n' or (byte)'\r')) end++;
                raw.Add(bytes[i..end]);
                if (end < bytes.Length && bytes[end] == '\r' && end + 1 < bytes.Length && bytes[end + 1] == '\n') end++;
                i = end + 1;
            }
            return new(raw, raw.Select(r => Encoding.UTF8.GetString(r)).ToList());
        }
    }

    private static string Entries(int n) => n == 1 ? "1 accepted entry" : $"{n} accepted entries";

    private static string OneLine(string text) => text.Length == 0 ? "(git said nothing)" : string.Join(" ", text.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries));

    private static string Shorten(string s) => s.Length > 60 ? s[..57] + "…" : s;
}
