namespace GateTasks.Engine.References;

/// <summary>
/// A seeded subsample of the reference's rows of the joint feature set, for the multivariate test, with each row's
/// event weight (1 for an unweighted reference).
/// </summary>
internal sealed record ReferenceJointSample(IReadOnlyList<string> Features, double[][] Rows, double[] Weights);
