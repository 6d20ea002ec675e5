using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>Which way a change moves the gate: easier to pass (<see cref="Looser"/>) or harder.</summary>
internal enum ChangeDirection
{
    /// <summary>A tolerance raised, a check removed, a decision setting relaxed, a definition changed.</summary>
    Looser,

    /// <summary>A tolerance lowered, a check or feature added, a decision setting made stricter.</summary>
    Tighter,
}

/// <summary>One difference between an accepted state and the contract in use, with where to find it.</summary>
internal sealed record StateChange(ChangeDirection Direction, string What, string From, string To, SourceLocation? Location)
{
    /// <summary>One line for messages, e.g. <c>m_gg ratio-max[core]: 0.03 → 0.05</c>.</summary>
    public string Text => $"{What}: {From} → {To}";
}
