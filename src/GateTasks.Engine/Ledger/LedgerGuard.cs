using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// Holds a check run to the contract's acceptance ledger: the ledger's chain must be intact, and the contract and
/// reference in use must be the latest accepted ones — except for changes that only make the gate stricter, unless the
/// contract asks for those to be recorded too. With the ratchet on, a margin that fell below the accepted one by more
/// than its noise fails as well. Every error says what changed and the command that records it.
/// </summary>
internal static class LedgerGuard
{
    /// <summary>The command that records the contract's current state.</summary>
    public static string AcceptCommand(PrecisionContract contract) =>
        $"gatetasks accept --contract {Quote(contract.FilePath)} --reason \"…\"";

    /// <summary>Where the contract names its ledger: the <c>acceptance.ledger</c> line, else the acceptance block, else its top.</summary>
    public static SourceLocation LedgerLocation(PrecisionContract contract) =>
        contract.Guard.LedgerLocation ?? contract.Guard.Location ?? new SourceLocation(contract.FilePath, 1, 1);

    /// <summary>
    /// Refuses a ledger path that is a directory (GATE4014, at the contract's <c>acceptance.ledger</c> line): it is
    /// neither a missing ledger nor one that can be read or appended to.
    /// </summary>
    public static void RefuseDirectory(PrecisionContract contract)
    {
        var path = contract.LedgerFullPath;
        if (Directory.Exists(path))
            throw new GateInputException(ErrorCodes.LedgerIsDirectory,
                $"The acceptance ledger {path} is a directory, not a file; name a ledger file in 'acceptance.ledger', or remove the directory.",
                LedgerLocation(contract));
    }

    public static IReadOnlyList<LedgerFinding> Verify(PrecisionContract contract, string referenceSha256, IReadOnlyList<CheckOutcome>? outcomes = null)
    {
        var guard = contract.Guard;
        var path = contract.LedgerFullPath;
        var fix = $"record it with: {AcceptCommand(contract)}";
        try
        {
            RefuseDirectory(contract);
        }
        catch (GateInputException e)
        {
            return [new(e.Code, true, e.Message, e.Location)];
        }
        if (!File.Exists(path))
            return [new(ErrorCodes.LedgerMissing, guard.Required,
                $"No acceptance ledger at {path}: the tolerances in use are recorded nowhere; {fix}", guard.Location ?? new SourceLocation(contract.FilePath, 1, 1))];
        IReadOnlyList<LedgerEntry> entries;
        try
        {
            entries = LedgerFile.Read(path);
        }
        catch (GateInputException e) when (e.Code is ErrorCodes.LedgerTampered or ErrorCodes.LedgerSyntax)
        {
            return [new(e.Code, true, e.Message + " Restore the ledger from version control; accepted entries are never rewritten.", e.Location)];
        }
        if (entries.Count == 0)
            return [new(ErrorCodes.LedgerMissing, guard.Required, $"The acceptance ledger {path} holds no entry yet; {fix}", new SourceLocation(path, 1, 1))];

        var latest = entries[^1];
        var since = $"entry {latest.Number} ({latest.When.UtcDateTime:yyyy-MM-dd} by {latest.By})";
        var findings = new List<LedgerFinding>();
        if (referenceSha256 != latest.ReferenceSha256)
            findings.Add(new(ErrorCodes.LedgerUnrecordedReference, true,
                $"The reference differs from the accepted one: sha256 {Short(referenceSha256)} against {Short(latest.ReferenceSha256)} in {since}; {fix}",
                contract.ReferenceLocation));
        var current = AcceptedState.Of(contract);
        if (FileDigest.Sha256(contract.FilePath) != latest.ContractSha256)
        {
            // A changed default moves many features' checks at one contract line: one finding per line and change.
            var groups = StateComparison.Compare(latest.State, current)
                .GroupBy(c => (c.Direction, c.Location, c.From, c.To, Check: c.What[(c.What.IndexOf(' ') + 1)..]));
            foreach (var g in groups)
            {
                var first = g.First();
                var described = g.Count() == 1 ? Describe(first) : Describe(first with
                {
                    What = $"{g.Key.Check} of {g.Count()} features ({string.Join(", ", g.Select(c => c.What[..c.What.IndexOf(' ')]).Take(4))}{(g.Count() > 4 ? ", …" : "")})",
                });
                var at = first.Location ?? new SourceLocation(contract.FilePath, 1, 1);
                if (first.Direction == ChangeDirection.Looser)
                    findings.Add(new(ErrorCodes.LedgerUnrecordedLoosening, true, $"{described} since {since}, with no entry accepting it; {fix}", at));
                else if (guard.RecordTightening)
                    findings.Add(new(ErrorCodes.LedgerUnrecordedTightening, true,
                        $"{described} since {since}; this contract records tightening too ('acceptance.tightening: record'); {fix}", at));
            }
        }
        if (guard.Ratchet && outcomes is not null) findings.AddRange(Ratchet(latest, outcomes, contract, since));
        return findings;
    }

    /// <summary>
    /// The ratchet, for effect checks whose tolerance is unchanged (tests carry no noise figure): a check fails when its
    /// point margin fell since the latest entry by more than its noise allows (<see cref="MarginDecline"/>).
    /// </summary>
    private static IEnumerable<LedgerFinding> Ratchet(LedgerEntry latest, IReadOnlyList<CheckOutcome> outcomes, PrecisionContract contract, string since)
    {
        var accepted = latest.State.Limits.ToDictionary(l => l.Id, StringComparer.Ordinal);
        var z = Normal.InvCDF(0, 1, contract.Decision.Confidence);
        var confidenceThen = latest.State.Confidence;
        if (!(confidenceThen > 0.5 && confidenceThen < 1)) yield break;
        var zThen = Normal.InvCDF(0, 1, confidenceThen);
        foreach (var o in outcomes)
        {
            if (o.Check is not ToleranceCheck bounded || !accepted.TryGetValue($"{o.Subject.Name} {o.Check.Label}", out var then) || then.IsTest || then.Tolerance != bounded.Tolerance) continue;
            var now = Margin.Of(o, contract.Decision);
            if (MarginDecline.Compare(then.Margin, then.Noise, zThen, now.Value, now.Noise, z) is { IsBeyondNoise: true } d)
                yield return new(ErrorCodes.RatchetDegraded, true,
                    $"{o.Subject.Name} {o.Check.Label}: point margin 1 − estimate/tolerance is {Num(d.PointNow)} against {Num(d.PointThen)} accepted in {since}, " +
                    $"worse by more than its noise allows ({Num(d.Allowed)}); fidelity degraded although the check is " +
                    $"{(o.Verdict == Verdict.Pass ? "still within tolerance" : o.Verdict.ToString().ToLowerInvariant())}",
                    o.Check.Location);
        }
    }

    private static string Describe(StateChange c) => c.To == "removed" ? $"{c.What} (was {c.From}) was removed" : $"{c.What} changed from {c.From} to {c.To}";

    private static string Short(string sha) => sha.Length > 19 ? sha[..19] + "…" : sha;

    private static string Num(double v) => InvariantNumber.Short(v);

    private static string Quote(string path) => path.Contains(' ') ? $"\"{path}\"" : path;
}
