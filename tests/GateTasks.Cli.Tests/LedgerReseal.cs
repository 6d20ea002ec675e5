using System.Security.Cryptography;
using System.Text;

namespace GateTasks.Tests.Shared;

/// <summary>
/// Rewrites a ledger as someone editing it by hand would, then recomputes every entry's <c>after</c> and <c>seal</c>
/// as docs/ledger.md defines them (the SHA-256 of the entry's lines up to and including <c>after</c>, each ended by a
/// line feed), so the chain of seals is intact again. Written from the documented format, not from the program's code.
/// </summary>
public static class LedgerReseal
{
    public static void Edit(string ledger, string text, string with)
    {
        var before = File.ReadAllText(ledger);
        if (!before.Contains(text, StringComparison.Ordinal)) throw new InvalidOperationException($"'{text}' is not in {ledger}");
        var lines = before.Replace(text, with, StringComparison.Ordinal).Split('\n').ToList();
        var previous = "sha256:none";
        var start = -1;
        for (var i = 0; i < lines.Count; i++)
        {
            if (lines[i].StartsWith("[accepted ", StringComparison.Ordinal)) start = i;
            else if (lines[i].StartsWith("after ", StringComparison.Ordinal)) lines[i] = "after " + previous;
            else if (lines[i].StartsWith("seal ", StringComparison.Ordinal))
            {
                var block = string.Concat(lines.Skip(start).Take(i - start).Select(l => l + "\n"));
                previous = "sha256:" + Convert.ToHexString(SHA256.HashData(Encoding.UTF8.GetBytes(block))).ToLowerInvariant();
                lines[i] = "seal " + previous;
            }
        }
        File.WriteAllText(ledger, string.Join('\n', lines));
    }
}
