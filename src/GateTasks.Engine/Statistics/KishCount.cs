namespace GateTasks.Engine.Statistics;

/// <summary>
/// Kish's (1965) effective number of events of a weighted sample, (Σw)²/Σw²: the number of unit-weight events that
/// would measure a mean as precisely. Every effective count in the engine is this one formula.
/// </summary>
internal static class KishCount
{
    /// <summary>(Σw)²/Σw², or 0 when Σw² is not positive (nothing with a non-zero weight).</summary>
    public static double Of(double sumW, double sumW2) => sumW2 > 0 ? sumW * sumW / sumW2 : 0;
}
