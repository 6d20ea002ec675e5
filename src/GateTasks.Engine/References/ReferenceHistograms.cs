namespace GateTasks.Engine.References;

/// <summary>
/// A reference built from a trusted full-simulation sample: per-feature histograms and statistics, plus
/// where it came from. Written and read by <see cref="ReferenceFile"/>.
/// </summary>
internal sealed record ReferenceHistograms(
    int FormatVersion,
    DateTimeOffset CreatedUtc,
    string ToolVersion,
    IReadOnlyList<ReferenceInput> Inputs,
    string? WeightColumn,
    long Events,
    double SumW,
    double SumW2,
    IReadOnlyList<ReferenceFeature> Features,
    IReadOnlyList<ReferenceCorrelation>? Correlations = null,
    ReferenceJointMoments? JointMoments = null,
    ReferenceSliced? Sliced = null)
{
    /// <summary>Kish (1965) effective number of events, (Σw)²/Σw².</summary>
    public double EffectiveEvents => Statistics.KishCount.Of(SumW, SumW2);

    /// <summary>The stored correlation of a pair, or null.</summary>
    public ReferenceCorrelation? FindPair(string first, string second) =>
        Correlations?.FirstOrDefault(c => c.First == first && c.Second == second);

    /// <summary>The feature of that name, or null.</summary>
    public ReferenceFeature? Find(string name) => Features.FirstOrDefault(f => f.Name == name);
}
