using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The measured value of one check of one feature against its tolerance. <see cref="Details"/> holds named
/// numbers for reports (bins compared, worst bin, counts) in a fixed order.
/// </summary>
internal sealed record CheckOutcome(
    FeatureSpec Feature,
    CheckSpec Check,
    double Value,
    Verdict Verdict,
    string Summary,
    IReadOnlyList<KeyValuePair<string, string>> Details)
{
    /// <summary>How far inside the tolerance the value lies (negative: outside), in the value's units.</summary>
    public double Margin => Check.LimitIsMaximum ? Check.Limit - Value : Value - Check.Limit;

    /// <summary>Margin as a fraction of the tolerance.</summary>
    public double RelativeMargin => Margin / Check.Limit;

    /// <summary>Builds an outcome, deciding the verdict from value and limit (NaN never passes).</summary>
    public static CheckOutcome Decide(FeatureSpec feature, CheckSpec check, double value, string summary,
        IReadOnlyList<KeyValuePair<string, string>> details)
    {
        var pass = check.LimitIsMaximum ? value <= check.Limit : value >= check.Limit;
        return new CheckOutcome(feature, check, value, pass ? Verdict.Pass : Verdict.Fail, summary, details);
    }
}
