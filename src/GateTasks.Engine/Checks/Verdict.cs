namespace GateTasks.Engine.Checks;

/// <summary>The outcome of one tolerance check (goodness-of-fit tests have none: they are read as a <c>Distinguishability</c>).</summary>
public enum Verdict
{
    /// <summary>Shown within tolerance at the contract's confidence.</summary>
    Pass,

    /// <summary>Shown outside tolerance at the contract's family-wise level: the gate fails.</summary>
    Fail,

    /// <summary>The sample cannot tell: neither shown within nor outside; more events are needed.</summary>
    Inconclusive,
}
