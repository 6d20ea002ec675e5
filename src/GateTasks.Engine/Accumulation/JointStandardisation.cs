namespace GateTasks.Engine.Accumulation;

/// <summary>The means and standard deviations that standardise the joint features (the reference's, in joint order).</summary>
internal sealed record JointStandardisation(IReadOnlyList<double> Means, IReadOnlyList<double> StandardDeviations)
{
    /// <summary>No change of scale: means 0, standard deviations 1.</summary>
    public static JointStandardisation Identity(int features) => new(new double[features], Enumerable.Repeat(1.0, features).ToArray());
}
