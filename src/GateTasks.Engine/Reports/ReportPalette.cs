using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The colours of the HTML report, shared by its style sheet and its plots: a dark blue-grey reference, a
/// copper surrogate, sage core bands, ochre tail bands, violet named regions, olive bands over all bins; verdicts in green, red and amber.
/// Reference and surrogate also differ in line style and markers, so the plots read without colour too.
/// </summary>
internal static class ReportPalette
{
    public const string Ink = "#20262e";
    public const string Muted = "#5d6673";
    public const string Grid = "#e3e6ea";
    public const string Paper = "#ffffff";
    public const string Page = "#f4f5f2";

    public const string Reference = "#34506b";
    public const string ReferenceFill = "#c9d5e0";
    public const string Surrogate = "#b4532a";

    public const string CoreBand = "#7fae92";
    public const string TailsBand = "#e2b857";
    public const string NamedBand = "#7d5ba6";
    public const string AllBand = "#a9c47f";

    public const string Pass = "#2c7a4b";
    public const string Fail = "#b3202f";
    public const string Inconclusive = "#a86a00";

    /// <summary>The colour that marks a verdict.</summary>
    public static string For(Verdict v) => v switch
    {
        Verdict.Pass => Pass,
        Verdict.Fail => Fail,
        _ => Inconclusive,
    };
}
