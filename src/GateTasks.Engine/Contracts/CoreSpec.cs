using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// The core region as reference quantiles: a central fraction f gives [(1−f)/2, (1+f)/2].
/// For discrete features the core is the most populated categories that together hold
/// <see cref="Fraction"/> of the reference.
/// </summary>
internal sealed record CoreSpec(double LowerQuantile, double UpperQuantile, SourceLocation Location)
{
    /// <summary>Probability content of the core.</summary>
    public double Fraction => UpperQuantile - LowerQuantile;
}
