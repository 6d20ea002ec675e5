namespace GateTasks.Engine.Demo;

/// <summary>Which surrogate the demo plays.</summary>
internal enum DemoKind
{
    /// <summary>An unconditional surrogate emitting reco-level events in place of the full simulation.</summary>
    Generator,

    /// <summary>A fast detector response: generator-level photons in, reconstructed ones out.</summary>
    Response,
}
