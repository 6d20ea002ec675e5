namespace GateTasks.Engine.Calibration;

/// <summary>A distortion injected into one feature's true distribution to measure how often the gate catches it.</summary>
internal enum DriftKind
{
    /// <summary>No distortion: the null hypothesis, for the false-alarm rate.</summary>
    None,

    /// <summary>Every value scaled by 1 + size (a scale shift: 0.01 is a 1% energy-scale error).</summary>
    Scale,

    /// <summary>Tail bins (outside the core) thinned by the fraction size.</summary>
    TailDeficit,

    /// <summary>Spread about the mean widened by the factor 1 + size.</summary>
    Width,

    /// <summary>The most populated category of a discrete feature loses the fraction size (absolute) to the others.</summary>
    SpikeFraction,

    /// <summary>A pair's correlation coefficients moved towards zero by size (absolute): a joint structure partly lost.</summary>
    CorrelationChange,
}

/// <summary>A named drift with its size.</summary>
internal sealed record Drift(DriftKind Kind, double Size, string Label)
{
    public static readonly Drift Null = new(DriftKind.None, 0, "none (null replicas)");

    /// <summary>The drifts of the standard study.</summary>
    public static readonly Drift[] Standard =
    [
        new(DriftKind.Scale, 0.01, "1% scale shift"),
        new(DriftKind.TailDeficit, 0.10, "10% tail deficit"),
        new(DriftKind.Width, 0.02, "2% width increase"),
        new(DriftKind.SpikeFraction, 0.01, "1-point spike-fraction shift"),
    ];
}
