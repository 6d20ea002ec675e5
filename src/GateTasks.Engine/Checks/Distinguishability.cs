namespace GateTasks.Engine.Checks;

/// <summary>
/// What a goodness-of-fit test says about the sample beside the verdict: whether the surrogate could be told from the
/// reference at the sample's size. Never a pass or a fail: a test has no tolerance, so "distinguishable" is not
/// "outside tolerance" (at enough events every imperfect surrogate is distinguishable), and "not distinguishable" is not
/// "within tolerance" (at few events every surrogate is).
/// </summary>
internal enum Distinguishability
{
    /// <summary>The test's p-value, adjusted within the contract's tests, is at most the contract's false-alarm level.</summary>
    Distinguishable,

    /// <summary>The adjusted p-value is above the level: at this size the test cannot tell the samples apart.</summary>
    NotDistinguishable,

    /// <summary>The test could not be computed on these histograms (its summary says why).</summary>
    NotMeasured,
}

/// <summary>The words a <see cref="Distinguishability"/> is shown with, the same in every report.</summary>
internal static class DistinguishabilityText
{
    /// <summary>"distinguishable at this size", "not distinguishable at this size" or "not measured".</summary>
    public static string Words(this Distinguishability d) => d switch
    {
        Distinguishability.Distinguishable => "distinguishable at this size",
        Distinguishability.NotDistinguishable => "not distinguishable at this size",
        _ => "not measured",
    };

    /// <summary>The token for machine-read properties: distinguishable, not-distinguishable, not-measured.</summary>
    public static string Token(this Distinguishability d) => d switch
    {
        Distinguishability.Distinguishable => "distinguishable",
        Distinguishability.NotDistinguishable => "not-distinguishable",
        _ => "not-measured",
    };
}
