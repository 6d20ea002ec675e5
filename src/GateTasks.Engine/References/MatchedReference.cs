using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.References;

/// <summary>
/// The reference a contract is checked against, read once and matched to the contract's features (in contract
/// order); refuses a reference built for other features, columns, kinds or binnings (GATE3001) or whose bins do not
/// hold the reference (GATE2104, GATE2105).
/// </summary>
internal sealed record MatchedReference(PrecisionContract Contract, ReferenceHistograms Reference, string ReferencePath, string ReferenceSha256,
    IReadOnlyList<ReferenceFeature> Features)
{
    /// <summary>Per feature, what a sample's accumulation takes from the reference.</summary>
    public IReadOnlyList<FeatureLayout> Layouts => Features.Select(f => f.Layout).ToList();

    /// <summary>
    /// The standardisation of the joint block's checks and global score (the reference's): null without a joint block
    /// (a reference without it for the block's features is refused when loaded).
    /// </summary>
    public JointStandardisation? JointStandardisation =>
        Contract.Joint is { } joint && Reference.JointMoments is { } stored && stored.Features.SequenceEqual(joint.Features)
            ? stored.Standardisation : null;

    /// <summary>The grid of the joint block's sliced checks (the reference's), or null without them.</summary>
    public SlicedGrid? SlicedGrid => Contract.Joint is { Slices: true } ? Reference.Sliced?.Grid : null;

    /// <summary>Reads the contract's reference and matches every feature to it.</summary>
    public static MatchedReference Load(PrecisionContract contract)
    {
        var referencePath = contract.ReferenceFullPath;
        var reference = ReferenceFile.Read(referencePath, contract.ReferenceLocation);
        // A category's tolerances may scale with its share of the reference's events: resolved here, before anything is judged.
        contract = CategoryTolerances.Resolve(contract, reference);
        var references = contract.Features.Select(f => Match(reference, f, referencePath)).ToList();
        // Again at check: a reference built before this rule, or a contract's regions changed since, is caught here.
        for (var i = 0; i < references.Count; i++) BinCoverage.Verify(contract.Features[i], references[i]);
        if (contract.Joint is { } joint) VerifyJointMoments(joint, reference, referencePath);
        if (contract.Joint is { Slices: true } sliced) VerifySliced(sliced, reference, referencePath);
        return new MatchedReference(contract, reference, referencePath, FileDigest.Sha256(referencePath), references);
    }

    /// <summary>
    /// Every joint block reads the reference's standardisation and covariance moments of the same features (its checks
    /// and the global score), a kernel-distance check its kernel sums too: a reference built for another joint set, or
    /// without the part a check reads, is refused (GATE2103) with the command that rebuilds it.
    /// </summary>
    private static void VerifyJointMoments(JointSpec joint, ReferenceHistograms reference, string referencePath)
    {
        var stored = reference.JointMoments;
        var missing = stored is null || !stored.Features.SequenceEqual(joint.Features) ? $"no streamed moments of {joint.Name}"
            : stored.State.Moments is null ? $"no covariance moments of {joint.Name}, which its checks and the global score read"
            : joint.KernelDistance is not null && stored.State.Kernel is null ? $"no kernel sums of {joint.Name}, which its {ContractKeys.KernelDistanceMax} check reads"
            : null;
        if (missing is not null)
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference {Path.GetFileName(referencePath)} holds {missing} (it was built for another joint block); rebuild it with 'gatetasks reference build'.",
                joint.Location);
    }

    /// <summary>
    /// The sliced checks read the reference's grid and histograms of the same features and number of projections: a
    /// reference without them, or built for another joint set or K, is refused (GATE2103) with the command that rebuilds it.
    /// </summary>
    private static void VerifySliced(JointSpec joint, ReferenceHistograms reference, string referencePath)
    {
        var stored = reference.Sliced;
        var missing = stored is null || !stored.Grid.Features.SequenceEqual(joint.Features) ? $"no sliced histograms of {joint.Name}"
            : stored.Grid.Projections != joint.Projections ? $"sliced histograms of {joint.Name} over {stored.Grid.Projections} projections, the contract asks for {joint.Projections}"
            : null;
        if (missing is not null)
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference {Path.GetFileName(referencePath)} holds {missing} (it was built for another joint block); rebuild it with 'gatetasks reference build'.",
                joint.Location);
    }

    private static ReferenceFeature Match(ReferenceHistograms reference, FeatureSpec feature, string referencePath)
    {

        var r = reference.Find(feature.Name)
            ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference {Path.GetFileName(referencePath)} has no feature '{feature.Name}'{NearestName.Hint(feature.Name, reference.Features.Select(f => f.Name))}; " +
                "rebuild it with 'gatetasks reference build'.", feature.Location);
        if (r.Column != feature.Column || r.Kind != feature.Kind || r.BinningRequest != feature.ReferenceRequest)
        {
            // Said where the changed part of the definition is written: a feature's expression at the feature, not at
            // the binning (which may be the defaults').
            var (what, where) = r.Column != feature.Column ? ("column", feature.ColumnLocation)
                : r.Kind != feature.Kind ? ("kind", feature.Location)
                : ChangedPart(r.BinningRequest, feature);
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference for feature '{feature.Name}' was built with another {what} (column '{r.Column}', {r.Kind.ToString().ToLowerInvariant()}, binning {r.BinningRequest}); " +
                $"the contract asks for column '{feature.Column}', {feature.Kind.ToString().ToLowerInvariant()}, binning {feature.ReferenceRequest}. " +
                "Rebuild it with 'gatetasks reference build'.", where);
        }
        // Wasserstein and quantile checks read the reference's fine grid, kept only for features that had one when it was built.
        if (r.FineGrid is null && feature.FineGridCheck is { } needs)
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference {Path.GetFileName(referencePath)} keeps no fine grid for feature '{feature.Name}', which its {needs.Key} check needs " +
                "(the reference was built for a contract without that check); rebuild it with 'gatetasks reference build'.", needs.Location);
        return r;
    }

    /// <summary>Which part of a feature's reference request (<see cref="FeatureSpec.ReferenceRequest"/>) differs from the stored one, and where the contract writes it.</summary>
    private static (string What, SourceLocation Where) ChangedPart(string stored, FeatureSpec feature)
    {
        static string Part(string request, string marker)
        {
            var at = request.IndexOf(marker, StringComparison.Ordinal);
            if (at < 0) return "";
            var end = new[] { "|spike:", "|expression:", "|condition:" }.Select(m => request.IndexOf(m, at + marker.Length, StringComparison.Ordinal))
                .Where(i => i > at).DefaultIfEmpty(request.Length).Min();
            return request[at..end];
        }
        var wanted = feature.ReferenceRequest;
        if (Part(stored, "|expression:") != Part(wanted, "|expression:")) return ("expression", feature.ColumnLocation);
        if (Part(stored, "|condition:") != Part(wanted, "|condition:")) return ("condition", feature.Condition?.Location ?? feature.Location);
        if (Part(stored, "|spike:") != Part(wanted, "|spike:")) return ("spike", feature.Location);
        return ("binning", feature.Binning.Location);
    }
}
