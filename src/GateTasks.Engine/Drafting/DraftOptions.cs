namespace GateTasks.Engine.Drafting;

/// <summary>
/// What a drafted contract is derived from: the analysis's expected number of data events (after its selection) and
/// the share of the data's statistical uncertainty the surrogate's bias may take in the core and in the tails; how
/// features are binned; when a whole-number column counts as discrete and a frequent value as a spike.
/// </summary>
internal sealed record DraftOptions(
    long DataEvents,
    double CoreFraction = DraftOptions.DefaultCoreFraction,
    double TailFraction = DraftOptions.DefaultTailFraction,
    int Bins = 20,
    double Core = 0.90,
    int MaxCategories = DraftOptions.DefaultMaxCategories,
    double SpikeShare = 0.05)
{
    /// <summary>
    /// A whole-number column with at most this many distinct values is discrete: a multiplicity (jets, tracks, hits)
    /// rarely has more, and one category per value costs the reference nothing at that size. Our choice.
    /// </summary>
    public const int DefaultMaxCategories = 100;

    /// <summary>A third of the data's uncertainty in the core: common practice, no single source.</summary>
    public const double DefaultCoreFraction = 1.0 / 3;

    /// <summary>The data's whole uncertainty in the tails, where analyses rarely fit: our choice, stated as such.</summary>
    public const double DefaultTailFraction = 1.0;
}
