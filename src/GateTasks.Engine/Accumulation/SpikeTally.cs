namespace GateTasks.Engine.Accumulation;

/// <summary>How many events (and their Σw, Σw²) hold exactly a feature's declared spike value.</summary>
internal sealed record SpikeTally(double Value, long Entries, double SumW, double SumW2);
