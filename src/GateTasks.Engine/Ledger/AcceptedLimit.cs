using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// One check as accepted: its subject (a feature, a pair, the joint set), its label (e.g. <c>ratio-max[core]</c>), its
/// tolerance (NaN for a goodness-of-fit test, which has none) and, when results were recorded, the margin measured
/// then with its noise (see <see cref="Checks.Margin"/>). <see cref="Location"/> is where it stands (contract or ledger).
/// </summary>
internal sealed record AcceptedLimit(string Subject, string Check, double Tolerance, double Margin, double Noise, SourceLocation? Location)
{
    /// <summary>Identity of the check across versions of the contract.</summary>
    public string Id => $"{Subject} {Check}";

    public bool IsTest => double.IsNaN(Tolerance);
}
