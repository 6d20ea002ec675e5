using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Reports;

/// <summary>
/// What an inconclusive check's reports add after its summary: the surrogate events that would decide it, or, for a
/// measurement that could not be computed (its summary says why), that no sample size decides it as it stands.
/// </summary>
internal static class UndecidedReason
{
    public static string Of(CheckOutcome o) =>
        o.Measured.Uncomputable ? "not computable on these histograms: more events do not decide it as it stands" : ResultTable.NeededText(o);

    /// <summary>The short form for a table cell.</summary>
    public static string Cell(CheckOutcome o) => o.Measured.Uncomputable ? "not computable" : ResultTable.EventsText(o);
}
