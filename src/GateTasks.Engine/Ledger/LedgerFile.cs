using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// The acceptance ledger: a text file of blocks, one per accepted state, appended and never rewritten. A block
/// starts with <c>[accepted N]</c>, holds one keyword line per fact and ends with <c>seal sha256:…</c>, the SHA-256
/// of the block's lines before it — which include <c>after sha256:…</c>, the seal of the block before. Editing any
/// line of an entry breaks its seal; removing or reordering entries breaks the next entry's <c>after</c> or the
/// numbering. Lines starting with <c>#</c> before the first block are comments.
/// </summary>
internal static class LedgerFile
{
    public const string FirstAfter = "sha256:none";

    private const string Header = """
        # GateTasks acceptance ledger. Append only: every entry records an accepted state of the contract and is
        # sealed together with the entry before it, so an edited, removed or reordered entry is detected.
        # Add entries with: gatetasks accept --reason "…"
        """;

    /// <summary>Reads and verifies a ledger: syntax (GATE4006) and the chain of seals (GATE4002).</summary>
    public static IReadOnlyList<LedgerEntry> Read(string path)
    {
        if (Directory.Exists(path))
            throw new GateInputException(ErrorCodes.LedgerIsDirectory, $"The acceptance ledger {path} is a directory, not a file.", new SourceLocation(path));
        string[] lines;
        try
        {
            lines = File.ReadAllLines(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new GateInputException(ErrorCodes.LedgerSyntax, $"Cannot read the ledger: {e.Message}", new SourceLocation(path));
        }
        return Parse(lines, path);
    }

    /// <summary>
    /// Reads and verifies a ledger's text, split into lines as <see cref="File.ReadAllLines(string)"/> splits them;
    /// <paramref name="path"/> names it in messages.
    /// </summary>
    public static IReadOnlyList<LedgerEntry> Parse(IReadOnlyList<string> lines, string path)
    {
        var entries = new List<LedgerEntry>();
        var i = 0;
        while (i < lines.Count && (lines[i].Length == 0 || lines[i].StartsWith('#'))) i++;
        while (i < lines.Count)
        {
            if (lines[i].Length == 0) { i++; continue; }
            var start = i;
            if (!lines[i].StartsWith("[accepted ", StringComparison.Ordinal) || !lines[i].EndsWith(']'))
                throw new GateInputException(ErrorCodes.LedgerSyntax, $"Expected an entry header '[accepted N]', found '{Shorten(lines[i])}'.", new SourceLocation(path, i + 1, 1));
            var block = new List<string> { lines[i] };
            i++;
            while (i < lines.Count && !lines[i].StartsWith("seal ", StringComparison.Ordinal))
            {
                if (lines[i].StartsWith("[accepted ", StringComparison.Ordinal))
                    throw new GateInputException(ErrorCodes.LedgerTampered, $"The entry starting at line {start + 1} has no seal: it was cut short or edited.", new SourceLocation(path, start + 1, 1));
                block.Add(lines[i]);
                i++;
            }
            if (i >= lines.Count)
                throw new GateInputException(ErrorCodes.LedgerTampered, $"The entry starting at line {start + 1} has no seal: the ledger was cut short or edited.", new SourceLocation(path, start + 1, 1));
            var seal = LedgerLine.Parse(lines[i], path, i + 1);
            i++;
            var entry = ParseBlock(block, seal, path, start + 1) with { LastLine = i };
            // The seal covers the lines exactly as written, so even an edit that keeps the meaning is seen.
            if (Seal(block) != entry.Seal)
                throw new GateInputException(ErrorCodes.LedgerTampered,
                    $"Entry {entry.Number} (line {entry.Line}) was edited after it was accepted: its seal no longer matches its text.", new SourceLocation(path, entry.Line, 1));
            entries.Add(entry);
        }
        Verify(entries, path);
        return entries;
    }

    /// <summary>Checks numbering, seals and the chain; names the first entry that does not fit.</summary>
    private static void Verify(IReadOnlyList<LedgerEntry> entries, string path)
    {
        var previousSeal = FirstAfter;
        for (var k = 0; k < entries.Count; k++)
        {
            var e = entries[k];
            var at = new SourceLocation(path, e.Line, 1);
            if (e.Number != k + 1)
            {
                var numbers = entries.Select(x => x.Number).ToHashSet();
                var missing = Enumerable.Range(1, entries.Max(x => x.Number)).Where(n => !numbers.Contains(n)).ToList();
                throw new GateInputException(ErrorCodes.LedgerTampered, missing.Count > 0
                    ? $"Entry {e.Number} (line {e.Line}) follows entry {k}: {(missing.Count == 1 ? $"entry {missing[0]} was" : $"entries {string.Join(", ", missing)} were")} removed."
                    : $"Entry {e.Number} (line {e.Line}) stands where entry {k + 1} belongs: the entries were reordered or one was copied.", at);
            }
            if (e.After != previousSeal)
                throw new GateInputException(ErrorCodes.LedgerTampered,
                    $"Entry {e.Number} (line {e.Line}) was sealed after a different entry {k}: an earlier entry was replaced or the entries were reordered.", at);
            previousSeal = e.Seal;
        }
    }

    /// <summary>The seal of the last entry, or <see cref="FirstAfter"/> for an empty ledger.</summary>
    public static string LastSeal(IReadOnlyList<LedgerEntry> entries) => entries.Count == 0 ? FirstAfter : entries[^1].Seal;

    /// <summary>Appends a new entry (numbered and sealed here) and returns it; the file is replaced atomically.</summary>
    public static LedgerEntry Append(string path, IReadOnlyList<LedgerEntry> existing, LedgerEntry entry)
    {
        var numbered = entry with { Number = existing.Count + 1, After = LastSeal(existing), Seal = "" };
        var sealedEntry = numbered with { Seal = Seal(Block(numbered)) };
        var text = File.Exists(path) ? File.ReadAllText(path) : Header + "\n";
        if (text.Length > 0 && !text.EndsWith('\n')) text += "\n";
        var block = new StringBuilder("\n");
        foreach (var line in Block(sealedEntry)) block.Append(line).Append('\n');
        block.Append(new LedgerLine("seal").Add(sealedEntry.Seal)).Append('\n');
        AtomicFile.WriteText(path, text + block);
        return sealedEntry;
    }

    /// <summary>The lines of an entry that its seal covers, in order.</summary>
    internal static IReadOnlyList<string> Block(LedgerEntry e)
    {
        var lines = new List<LedgerLine>
        {
            new LedgerLine($"[accepted {e.Number.ToString(CultureInfo.InvariantCulture)}]"),
            new LedgerLine("when").Add(e.When.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture)),
            new LedgerLine("by").Add(e.By),
            new LedgerLine("why").Add(e.Why),
            new LedgerLine("contract").Add(e.ContractSha256).Add(e.ContractFile),
            new LedgerLine("reference").Add(e.ReferenceSha256).Add(e.ReferenceFile),
            new LedgerLine("results").Add(e.ResultsSha256).Add(e.ResultsNote),
        };
        var decision = new LedgerLine("decision");
        foreach (var (k, v) in e.State.Decision) decision.Add(k).Add(v);
        lines.Add(decision);
        if (e.State.Selection is { } sel) lines.Add(new LedgerLine("selection").Add(sel));
        foreach (var (name, definition) in e.State.Definitions) lines.Add(new LedgerLine("define").Add(name).Add(definition));
        foreach (var l in e.State.Limits)
        {
            var line = l.IsTest ? new LedgerLine("test").Add(l.Subject).Add(l.Check) : new LedgerLine("limit").Add(l.Subject).Add(l.Check).Add(l.Tolerance);
            lines.Add(line.Add("margin").Add(l.Margin).Add("noise").Add(l.Noise));
        }
        lines.Add(new LedgerLine("after").Add(e.After));
        return lines.Select(l => l.ToString()).ToList();
    }

    internal static string Seal(IReadOnlyList<string> block)
    {
        var bytes = Encoding.UTF8.GetBytes(string.Join('\n', block) + "\n");
        return "sha256:" + Convert.ToHexString(SHA256.HashData(bytes)).ToLowerInvariant();
    }

    private static LedgerEntry ParseBlock(List<string> block, LedgerLine sealLine, string path, int firstLine)
    {
        var header = block[0];
        if (!int.TryParse(header["[accepted ".Length..^1], NumberStyles.None, CultureInfo.InvariantCulture, out var number))
            throw new GateInputException(ErrorCodes.LedgerSyntax, $"'{Shorten(header)}' does not number its entry.", new SourceLocation(path, firstLine, 1));
        DateTimeOffset when = default;
        string by = "", why = "", contractSha = "", contractFile = "", referenceSha = "", referenceFile = "", resultsSha = "", resultsNote = "", after = "";
        string? selection = null;
        var decision = new List<KeyValuePair<string, string>>();
        var definitions = new List<KeyValuePair<string, string>>();
        var limits = new List<AcceptedLimit>();
        for (var k = 1; k < block.Count; k++)
        {
            var lineNo = firstLine + k;
            var line = LedgerLine.Parse(block[k], path, lineNo);
            var f = line.Fields;
            SourceLocation At() => new(path, lineNo, 1);
            void Need(int n)
            {
                if (f.Count != n)
                    throw new GateInputException(ErrorCodes.LedgerSyntax, $"'{line.Keyword}' takes {n - 1} field{(n == 2 ? "" : "s")}, found {f.Count - 1}.", At());
            }
            try
            {
                switch (line.Keyword)
                {
                    case "when":
                        Need(2);
                        when = DateTimeOffset.Parse(f[1], CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal);
                        break;
                    case "by": Need(2); by = f[1]; break;
                    case "why": Need(2); why = f[1]; break;
                    case "contract": Need(3); (contractSha, contractFile) = (f[1], f[2]); break;
                    case "reference": Need(3); (referenceSha, referenceFile) = (f[1], f[2]); break;
                    case "results": Need(3); (resultsSha, resultsNote) = (f[1], f[2]); break;
                    case "decision":
                        if (f.Count % 2 != 1) throw new FormatException("decision takes key–value pairs");
                        for (var p = 1; p < f.Count; p += 2) decision.Add(new(f[p], f[p + 1]));
                        break;
                    case "selection": Need(2); selection = f[1]; break;
                    case "define": Need(3); definitions.Add(new(f[1], f[2])); break;
                    case "limit":
                        Need(8);
                        limits.Add(new AcceptedLimit(f[1], f[2], LedgerLine.ParseNumber(f[3]), LedgerLine.ParseNumber(f[5]), LedgerLine.ParseNumber(f[7]), At()));
                        break;
                    case "test":
                        Need(7);
                        limits.Add(new AcceptedLimit(f[1], f[2], double.NaN, LedgerLine.ParseNumber(f[4]), LedgerLine.ParseNumber(f[6]), At()));
                        break;
                    case "after": Need(2); after = f[1]; break;
                    default:
                        throw new GateInputException(ErrorCodes.LedgerSyntax, $"Unknown line '{line.Keyword}' in entry {number}.", At());
                }
            }
            catch (FormatException e)
            {
                throw new GateInputException(ErrorCodes.LedgerSyntax, $"Line '{line.Keyword}' of entry {number} cannot be read: {e.Message}.", At());
            }
        }
        if (sealLine.Fields.Count != 2)
            throw new GateInputException(ErrorCodes.LedgerSyntax, "'seal' takes one field.", new SourceLocation(path, firstLine + block.Count, 1));
        return new LedgerEntry(number, when, by, why, contractSha, contractFile, referenceSha, referenceFile, resultsSha, resultsNote,
            new AcceptedState(decision, selection, definitions, limits), after, sealLine.Fields[1], firstLine);
    }

    private static string Shorten(string s) => s.Length > 60 ? s[..57] + "…" : s;
}
