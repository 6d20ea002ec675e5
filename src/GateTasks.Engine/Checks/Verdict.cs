namespace GateTasks.Engine.Checks;

/// <summary>The outcome of one check.</summary>
public enum Verdict
{
    /// <summary>Shown within tolerance at the contract's confidence (tests: not significant).</summary>
    Pass,

    /// <summary>Shown outside tolerance at the contract's family-wise level (tests: significant): the gate fails.</summary>
    Fail,

    /// <summary>The sample cannot tell: neither shown within nor outside; more events are needed.</summary>
    Inconclusive,
}
