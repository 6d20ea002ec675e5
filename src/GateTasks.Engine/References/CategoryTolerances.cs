using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.References;

/// <summary>
/// Applies a category block's <c>share-scaling</c> once the reference is known: each category's inherited tolerances
/// widened by <see cref="ShareScaling.Factor"/> of the category's share of the reference's weight. Checking and
/// planning both read the contract through this, so they judge against the same tolerances.
/// </summary>
internal static class CategoryTolerances
{
    /// <summary>The contract with every scaled category's tolerances resolved against <paramref name="reference"/>.</summary>
    public static PrecisionContract Resolve(PrecisionContract contract, ReferenceHistograms reference)
    {
        if (contract.Features.All(f => f.ShareScaling is null)) return contract;
        var features = contract.Features.Select(f =>
            f.ShareScaling is { } scaling && reference.Find(f.Name) is { } r ? Scaled(f, scaling, Share(r, reference)) : f).ToList();
        return contract with { Features = features };
    }

    /// <summary>
    /// A feature's share of the reference's weight: its finite values and its spike over all events (after the
    /// contract's selection); 1 for a feature every event has.
    /// </summary>
    public static double Share(ReferenceFeature feature, ReferenceHistograms reference)
    {
        var w = feature.Summary.SumW + (feature.Spike?.SumW ?? 0);
        return reference.SumW > 0 ? Math.Clamp(w / reference.SumW, 0, 1) : 1;
    }

    private static FeatureSpec Scaled(FeatureSpec f, ShareScaling scaling, double share)
    {
        var factor = scaling.Factor(share);
        var checks = f.Checks.Select(c => c is ToleranceCheck t && !scaling.Own.Contains(c.Label)
            ? t with { Tolerance = Math.Min(t.Tolerance * factor, Ceiling(c.Kind)) }
            : c).ToList();
        // Resolved once: the feature no longer carries the rule, so resolving again changes nothing.
        return f with { Checks = checks, ShareScaling = null };
    }

    /// <summary>The largest tolerance a check's effect can have a meaning below (a KS distance is at most 1, a JSD ln 2, a fraction 1).</summary>
    private static double Ceiling(CheckKind kind) => kind switch
    {
        CheckKind.KolmogorovSmirnov or CheckKind.Fraction => 1,
        CheckKind.JensenShannon => Math.Log(2),
        _ => double.PositiveInfinity,
    };
}
