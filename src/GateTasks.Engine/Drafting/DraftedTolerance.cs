namespace GateTasks.Engine.Drafting;

/// <summary>A drafted tolerance and how it was derived, written beside it in the contract for a reviewer.</summary>
internal readonly record struct DraftedTolerance(double Value, string Derivation);
