using System.Globalization;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// The differences between an accepted state and the contract in use, each marked looser or tighter. Every tolerance
/// is an upper bound, so a larger one is looser; a removed check is looser and an added one tighter. A lower
/// confidence, a lower false-alarm level, a more conservative correction (Bonferroni below Holm below
/// Benjamini–Hochberg in how readily it fails) and 'inconclusive: warn' are looser. A changed selection or feature
/// definition changes what is compared, so it counts as looser: it needs an entry.
/// </summary>
internal static class StateComparison
{
    public static IReadOnlyList<StateChange> Compare(AcceptedState accepted, AcceptedState current)
    {
        var changes = new List<StateChange>();
        var now = current.Limits.ToDictionary(l => l.Id, StringComparer.Ordinal);
        var then = accepted.Limits.ToDictionary(l => l.Id, StringComparer.Ordinal);
        foreach (var a in accepted.Limits)
        {
            if (!now.TryGetValue(a.Id, out var c))
            {
                changes.Add(new(ChangeDirection.Looser, a.Id, a.IsTest ? "on" : Number(a.Tolerance), "removed", a.Location));
                continue;
            }
            if (a.IsTest || c.IsTest || a.Tolerance == c.Tolerance) continue;
            changes.Add(new(c.Tolerance > a.Tolerance ? ChangeDirection.Looser : ChangeDirection.Tighter, a.Id, Number(a.Tolerance), Number(c.Tolerance), c.Location));
        }
        foreach (var c in current.Limits)
            if (!then.ContainsKey(c.Id))
                changes.Add(new(ChangeDirection.Tighter, c.Id, "absent", c.IsTest ? "on" : Number(c.Tolerance), c.Location));

        var decisionThen = accepted.Decision.ToDictionary(p => p.Key, p => p.Value);
        foreach (var (key, value) in current.Decision)
        {
            if (!decisionThen.TryGetValue(key, out var old) || old == value) continue;
            var looser = key switch
            {
                "confidence" or "false-alarm" => LedgerLine.ParseNumber(value) < LedgerLine.ParseNumber(old),
                "correction" => Eagerness(value) < Eagerness(old),
                "inconclusive" => value == "warn",
                _ => true,
            };
            changes.Add(new(looser ? ChangeDirection.Looser : ChangeDirection.Tighter, $"decision {key}", old, value, null));
        }
        if (accepted.Selection != current.Selection)
            changes.Add(new(ChangeDirection.Looser, "selection", accepted.Selection ?? "none", current.Selection ?? "none", null));
        var definedNow = current.Definitions.ToDictionary(p => p.Key, p => p.Value, StringComparer.Ordinal);
        foreach (var (name, definition) in accepted.Definitions)
            if (definedNow.TryGetValue(name, out var d) && d != definition)
                changes.Add(new(ChangeDirection.Looser, $"{name} definition", definition, d, current.Limits.FirstOrDefault(l => l.Subject == name)?.Location));
        return changes;
    }

    /// <summary>How readily a correction lets a check fail: Bonferroni least, Benjamini–Hochberg most.</summary>
    private static int Eagerness(string correction) => correction switch
    {
        "bonferroni" => 0,
        "holm" => 1,
        _ => 2,
    };

    private static string Number(double v) => v.ToString("G6", CultureInfo.InvariantCulture);
}
