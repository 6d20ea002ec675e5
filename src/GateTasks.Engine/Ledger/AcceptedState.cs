using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// What a contract requires, in a form that can be stored and compared: the decision settings, the selection, each
/// feature's definition (column or expression, binning, core, spike, condition, regions) and every check with its
/// tolerance — with the margins measured when it was accepted, if results are given.
/// </summary>
internal sealed record AcceptedState(
    IReadOnlyList<KeyValuePair<string, string>> Decision,
    string? Selection,
    IReadOnlyList<KeyValuePair<string, string>> Definitions,
    IReadOnlyList<AcceptedLimit> Limits)
{
    public static AcceptedState Of(PrecisionContract contract, IReadOnlyList<CheckOutcome>? outcomes = null)
    {
        var d = contract.Decision;
        var decision = new List<KeyValuePair<string, string>>
        {
            new("confidence", LedgerLine.Number(d.Confidence)),
            new("false-alarm", LedgerLine.Number(d.FalseAlarm)),
            new("correction", d.CorrectionName),
            new("inconclusive", d.InconclusiveFails ? "fail" : "warn"),
        };
        var definitions = contract.Features.Select(f => new KeyValuePair<string, string>(f.Name, Definition(f))).ToList();
        var margins = new Dictionary<string, Margin>(StringComparer.Ordinal);
        foreach (var o in outcomes ?? [])
            margins[$"{o.Subject.Name} {o.Check.Label}"] = Margin.Of(o, d);
        var limits = new List<AcceptedLimit>();
        void Add(string subject, CheckSpec check)
        {
            var m = margins.TryGetValue($"{subject} {check.Label}", out var found) ? found : new Margin(double.NaN, double.NaN);
            limits.Add(new AcceptedLimit(subject, check.Label, check is ToleranceCheck bounded ? bounded.Tolerance : double.NaN, m.Value, m.Noise, check.Location));
        }
        foreach (var f in contract.Features)
            foreach (var c in f.Checks) Add(f.Name, c);
        foreach (var p in contract.Pairs)
            foreach (var c in p.Checks) Add(p.Name, c);
        if (contract.Joint is { } j)
            foreach (var c in j.Checks) Add(j.Name, c);
        return new AcceptedState(decision, contract.Selection?.Text, definitions, limits);
    }

    /// <summary>The confidence level the state was decided at (NaN if it records none).</summary>
    public double Confidence
    {
        get
        {
            if (Decision.FirstOrDefault(p => p.Key == "confidence").Value is not { } c) return double.NaN;
            try
            {
                return LedgerLine.ParseNumber(c);
            }
            catch (FormatException)
            {
                return double.NaN;
            }
        }
    }

    /// <summary>Everything that decides what a feature's histogram holds, as one line of text.</summary>
    private static string Definition(FeatureSpec f)
    {
        var regions = f.Regions is { Count: > 0 } rs
            ? "|regions:" + string.Join(",", rs.Select(r => string.Create(CultureInfo.InvariantCulture,
                $"{r.Name}{(r.ByQuantile ? ":quantiles" : ":range")}[{r.Lower:R},{r.Upper:R}]")))
            : "";
        return $"{f.Kind.ToString().ToLowerInvariant()}|{(f.Expression is null ? "column:" + f.Column : "")}|{f.ReferenceRequest}" +
               $"|core:{f.Core.LowerQuantile.ToString("G12", CultureInfo.InvariantCulture)},{f.Core.UpperQuantile.ToString("G12", CultureInfo.InvariantCulture)}{regions}" +
               // Allowing NaN and ±∞ lets through what failed before: a change a reviewer must accept. Unset, nothing is added.
               (f.AllowNonFinite ? "|non-finite:allow" : "");
    }
}
