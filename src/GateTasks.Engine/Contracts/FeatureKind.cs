namespace GateTasks.Engine.Contracts;

/// <summary>How a feature's values are distributed and therefore binned.</summary>
internal enum FeatureKind
{
    /// <summary>Real-valued; binned by the contract's binning.</summary>
    Continuous,

    /// <summary>Integer-valued categories (multiplicities, flags); one bin per value.</summary>
    Discrete,
}
