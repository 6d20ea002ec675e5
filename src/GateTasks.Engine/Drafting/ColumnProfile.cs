using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// What one pass over a trusted sample learnt about one column: its stored type, its unbinned statistics, whether every
/// finite value is a whole number, its distinct values with their weights while there are few (null past the cap),
/// and its most frequent value's weighted share.
/// </summary>
internal sealed record ColumnProfile(
    string Column,
    Samples.SampleValueType Type,
    FeatureSummary Summary,
    bool Integral,
    IReadOnlyDictionary<double, double>? DistinctWeights,
    double? TopValue,
    double TopShare)
{
    /// <summary>Σw of the finite values.</summary>
    public double FiniteSumW => Summary.SumW;
}
