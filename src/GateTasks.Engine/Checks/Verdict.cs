namespace GateTasks.Engine.Checks;

/// <summary>The outcome of one check.</summary>
public enum Verdict
{
    /// <summary>Within tolerance.</summary>
    Pass,

    /// <summary>Outside tolerance: the gate fails.</summary>
    Fail,
}
