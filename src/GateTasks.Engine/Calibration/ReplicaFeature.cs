using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// One contract feature as the simulation studies see it (calibration and planning): its reference histogram taken as
/// the truth, and replicas drawn from it — a fresh reference of the reference's effective size and a surrogate sample
/// of a given size, each measured by the checks' own code. A drift distorts the surrogate's truth; a spike-fraction
/// drift of a feature with a declared spike moves the spike's share. A category of a category block holds its share of
/// a replica's events (its fresh reference the category's own), and moments are drawn about the reference's unbinned
/// ones (<see cref="ReplicaSummary"/>), as a check streams them. Where the reference keeps a fine grid (a feature with a
/// Wasserstein check), both replicas are drawn on it too (<see cref="FineGridLaw"/>), so W1 is measured on the grid a
/// check uses.
/// </summary>
internal sealed class ReplicaFeature
{
    private readonly double[] _truth;
    private readonly FineGridLaw? _fine;

    private ReplicaFeature(FeatureSpec spec, ReferenceFeature reference, IReadOnlyList<bool> core, long referenceEvents, double share = 1)
    {
        Share = share;
        Spec = spec;
        Subject = new FeatureSubject(spec);
        Reference = reference;
        Core = core;
        ReferenceEvents = referenceEvents;
        _truth = DriftedDistribution.CellProbabilities(reference, core, Drift.Null);
        if (reference.FineGrid is { } grid && grid.TotalSumW > 0)
            _fine = new FineGridLaw(grid, reference.Histogram.Axis.Edges.ToArray(), Probabilities, () => reference.Summary.Mean);
    }

    public FeatureSpec Spec { get; }

    /// <summary>The feature as the subject of its checks' outcomes.</summary>
    public CheckSubject Subject { get; }
    public ReferenceFeature Reference { get; }
    public IReadOnlyList<bool> Core { get; }
    public long ReferenceEvents { get; }

    /// <summary>
    /// The feature's share of the whole sample's events: 1, or for a category of a category block the share of the
    /// reference's weight in that category. A replica of n events holds a binomial n·share of them in the category.
    /// </summary>
    public double Share { get; }

    /// <summary>Every feature of the contract, matched to the reference.</summary>
    public static IReadOnlyList<ReplicaFeature> All(PrecisionContract contract, ReferenceHistograms reference)
    {
        var referenceEvents = (long)Math.Round(reference.EffectiveEvents);
        // Each category judged against the tolerance a check applies to it (scaled with its share where the block says so).
        contract = CategoryTolerances.Resolve(contract, reference);
        return contract.Features.Select(f =>
        {
            var r = reference.Find(f.Name) ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference has no feature '{f.Name}'; rebuild it with 'gatetasks reference build'.", f.Location);
            return f.Condition is null ? new ReplicaFeature(f, r, RegionBins.Core(r, f), referenceEvents) : Category(f, r, reference);
        }).ToList();
    }

    /// <summary>A category's feature: its fresh references hold the category's own effective events, its surrogates its share.</summary>
    private static ReplicaFeature Category(FeatureSpec f, ReferenceFeature r, ReferenceHistograms reference)
    {
        var (w, w2) = (r.Summary.SumW + (r.Spike?.SumW ?? 0), r.Summary.SumW2 + (r.Spike?.SumW2 ?? 0));
        var share = CategoryTolerances.Share(r, reference);
        return new ReplicaFeature(f, r, RegionBins.Core(r, f), Math.Max(1, (long)Math.Round(Statistics.KishCount.Of(w, w2))), share);
    }

    /// <summary>The events of a whole-sample replica of <paramref name="events"/> that fall in this feature (all, or the category's binomial share).</summary>
    private long EventsIn(long events, Random rng) => Share >= 1 ? events : ReplicaSampler.Binomial(rng, Share, events);

    /// <summary>The surrogate's cell probabilities under <paramref name="drift"/> (the truth's for the null drift).</summary>
    public double[] Probabilities(Drift drift) =>
        drift.Kind == DriftKind.None || (drift.Kind == DriftKind.SpikeFraction && Reference.Spike is not null)
            ? _truth
            : DriftedDistribution.CellProbabilities(Reference, Core, drift);

    /// <summary>The share of all events a declared spike holds in the truth (0 without one).</summary>
    public double SpikeShare => Reference.Spike is { } spike ? spike.SumW / (spike.SumW + Reference.Histogram.TotalSumW) : 0;

    /// <summary>The share of a declared spike in the truth, and in a surrogate under <paramref name="drift"/>.</summary>
    private (double Truth, double Drifted) SpikeShares(Drift drift)
    {
        var truth = SpikeShare;
        // The spike loses the drift's size (absolute) to the rest, as the top category does for a discrete feature.
        return (truth, drift.Kind == DriftKind.SpikeFraction && Reference.Spike is not null ? Math.Clamp(truth - drift.Size, 0, 1) : truth);
    }

    /// <summary>Draws one replica (a fresh reference and a surrogate of <paramref name="events"/> events) and measures every check of the feature.</summary>
    public IEnumerable<(CheckSubject, CheckSpec, Measurement)> Measure(double[] surrogateProbabilities, Drift drift, long events, DecisionSettings decision, Random rng)
    {
        var comparison = Draw(surrogateProbabilities, drift, events, rng);
        // A small category can draw no events at a small size: a check refuses such a sample, so it does not pass.
        if (!(comparison.Surrogate.TotalSumW > 0))
            return Spec.Checks.Select(check => (Subject, check, Measurement.Impossible("the replica holds no events of this feature", [])));
        return Spec.Checks.Select(check => (Subject, check, CheckEvaluator.Measure(comparison, check, decision)));
    }

    /// <summary>One replica's comparison: both histograms drawn, spikes and far tails tallied apart as a check does.</summary>
    public FeatureComparison Draw(double[] surrogateProbabilities, Drift drift, long events, Random rng)
    {
        var axis = Reference.Histogram.Axis;
        var (truthShare, driftedShare) = SpikeShares(drift);
        var (refSpike, refBinned) = DrawSpike(truthShare, ReferenceEvents, rng);
        var (sampleSpike, sampleBinned) = DrawSpike(driftedShare, EventsIn(events, rng), rng);
        var refHistogram = ReplicaSampler.Draw(axis, _truth, refBinned, rng);
        var sample = ReplicaSampler.Draw(axis, surrogateProbabilities, sampleBinned, rng);
        // Moments as a check streams them: unbinned, about the reference's unbinned ones.
        var moments = ReplicaSummary.Truth(Reference.Summary, axis, _truth, surrogateProbabilities, drift);
        var refReplica = Reference with
        {
            Histogram = refHistogram, Summary = ReplicaSummary.Draw(Reference.Summary, (Reference.Summary.Mean, Reference.Summary.StandardDeviation), refBinned, rng),
            Spike = refSpike, FarTail = DrawFarTail(refBinned, rng),
            FineGrid = _fine?.Draw(_fine.Truth, refBinned, rng),
        };
        // The fine grids are drawn apart from the coarse histograms (each check reads one or the other).
        var sampleFine = _fine?.Draw(_fine.Under(drift, Reference.Spike is not null), sampleBinned, rng);
        return new FeatureComparison(Spec, refReplica, sample, ReplicaSummary.Draw(Reference.Summary, moments, sampleBinned, rng), Core, sampleSpike,
            DrawFarTail(sampleBinned, rng), sampleFine);
    }

    /// <summary>
    /// The comparison without noise: both histograms hold their expected contents (the reference at its size, the
    /// surrogate at <paramref name="events"/>), so a check's estimate on it is the effect the drift truly makes.
    /// </summary>
    public FeatureComparison Expected(double[] surrogateProbabilities, Drift drift, long events)
    {
        var axis = Reference.Histogram.Axis;
        var (truthShare, driftedShare) = SpikeShares(drift);
        Histogram Fill(double[] p, double n)
        {
            var cells = p.Select(x => x * n).ToArray();
            return Histogram.FromCells(axis, cells, cells, (long)Math.Round(n), 0, 0, 0);
        }
        SpikeTally? Spike(double share, long n) => Reference.Spike is { } s ? new SpikeTally(s.Value, (long)Math.Round(share * n), share * n, share * n) : null;
        var inFeature = (long)Math.Round(events * Share);
        var refHistogram = Fill(_truth, ReferenceEvents * (1 - truthShare));
        var sample = Fill(surrogateProbabilities, inFeature * (1 - driftedShare));
        var moments = ReplicaSummary.Truth(Reference.Summary, axis, _truth, surrogateProbabilities, drift);
        var refReplica = Reference with
        {
            Histogram = refHistogram, Summary = ReplicaSummary.Expected(Reference.Summary, (Reference.Summary.Mean, Reference.Summary.StandardDeviation), ReferenceEvents * (1 - truthShare)),
            Spike = Spike(truthShare, ReferenceEvents),
            FineGrid = _fine?.Expected(_fine.Truth, ReferenceEvents * (1 - truthShare)),
        };
        return new FeatureComparison(Spec, refReplica, sample, ReplicaSummary.Expected(Reference.Summary, moments, inFeature * (1 - driftedShare)), Core,
            Spike(driftedShare, inFeature), Reference.FarTail, _fine?.Expected(_fine.Under(drift, Reference.Spike is not null), inFeature * (1 - driftedShare)));
    }

    /// <summary>The spike tally of a replica of n events (binomial at the spike's share) and the events left to bin.</summary>
    private (SpikeTally? Spike, long Binned) DrawSpike(double share, long n, Random rng)
    {
        if (Reference.Spike is not { } spike) return (null, n);
        var k = ReplicaSampler.Binomial(rng, share, n);
        return (new SpikeTally(spike.Value, k, k, k), n - k);
    }

    /// <summary>
    /// Far-tail counts of a replica of n events: a multinomial draw (below, above, the rest) at the reference's
    /// fractions. Drawn apart from the histogram, so a drift of the histogram does not reach them.
    /// </summary>
    private FarTailCounts? DrawFarTail(long n, Random rng)
    {
        if (Reference.FarTail is not { } t || !(t.TotalW > 0)) return null;
        var pBelow = t.BelowW / t.TotalW;
        var below = ReplicaSampler.Binomial(rng, pBelow, n);
        var above = pBelow < 1 ? ReplicaSampler.Binomial(rng, Math.Min(1, t.AboveW / t.TotalW / (1 - pBelow)), n - below) : 0;
        return t with { BelowW = below, BelowW2 = below, AboveW = above, AboveW2 = above, TotalW = n, TotalW2 = n };
    }
}
