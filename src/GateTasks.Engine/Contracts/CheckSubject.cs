using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// What a check is made on: a <see cref="FeatureSubject"/>, a declared pair (<see cref="PairSubject"/>) or the joint
/// block (<see cref="JointSubject"/>). <see cref="Name"/> is the subject's name in reports, ledgers and messages;
/// <see cref="Location"/> is where the contract declares it.
/// </summary>
internal abstract record CheckSubject
{
    private protected CheckSubject()
    {
    }

    /// <summary>Name used in reports: the feature's, <c>first~second</c> for a pair, <c>joint(a,b,…)</c> for the joint block.</summary>
    public abstract string Name { get; }

    /// <summary>Where the contract declares the subject.</summary>
    public abstract SourceLocation Location { get; }
}

/// <summary>A feature of the contract (a category of a category block included).</summary>
internal sealed record FeatureSubject(FeatureSpec Feature) : CheckSubject
{
    /// <inheritdoc />
    public override string Name => Feature.Name;

    /// <inheritdoc />
    public override SourceLocation Location => Feature.Location;
}

/// <summary>A declared pair of features whose correlation is checked.</summary>
internal sealed record PairSubject(CorrelationSpec Pair) : CheckSubject
{
    /// <inheritdoc />
    public override string Name => Pair.Name;

    /// <inheritdoc />
    public override SourceLocation Location => Pair.Location;
}

/// <summary>The contract's joint block, a set of features tested together.</summary>
internal sealed record JointSubject(JointSpec Joint) : CheckSubject
{
    /// <inheritdoc />
    public override string Name => Joint.Name;

    /// <inheritdoc />
    public override SourceLocation Location => Joint.Location;
}
