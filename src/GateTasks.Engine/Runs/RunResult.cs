using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Runs;

/// <summary>
/// Everything one run of a contract produced: what was compared, each tolerance check's outcome, and each
/// goodness-of-fit test's reading (beside the verdict, never part of it).
/// </summary>
internal sealed record RunResult(
    PrecisionContract Contract,
    string ReferencePath,
    string ReferenceSha256,
    ReferenceHistograms Reference,
    IReadOnlyList<string> SampleFiles,
    long Events,
    double SumW,
    double SumW2,
    IReadOnlyList<CheckOutcome> Outcomes,
    DateTimeOffset StartedUtc,
    TimeSpan Elapsed)
{
    /// <summary>Per feature, in contract order: the reference and the sample's histograms as they were compared (for plots).</summary>
    public IReadOnlyList<FeatureComparison> Comparisons { get; init; } = [];

    /// <summary>Per declared pair, in contract order: the sample's correlations and 2-D cells as they were compared (for the pair maps).</summary>
    public IReadOnlyList<Accumulation.AccumulatedPair> Pairs { get; init; } = [];

    /// <summary>The goodness-of-fit tests' readings, in contract order: diagnostics reported beside the verdict (<see cref="TestReading"/>).</summary>
    public IReadOnlyList<TestReading> Readings { get; init; } = [];

    /// <summary>The global score (the joint block's Fréchet distance with its error), or why there is none: information, never part of the outcome.</summary>
    public GlobalScore Score { get; init; } = GlobalScore.NoJointBlock;

    /// <summary>
    /// The subjects (features, categories, pairs, the joint block) that have goodness-of-fit tests and no tolerance
    /// check, in contract order: nothing shows them within a tolerance, so the run cannot be PASSED.
    /// </summary>
    public IReadOnlyList<CheckSubject> UncoveredSubjects
    {
        get
        {
            var covered = Outcomes.Select(o => o.Subject.Name).ToHashSet(StringComparer.Ordinal);
            var seen = new HashSet<string>(StringComparer.Ordinal);
            return Readings.Select(r => r.Subject).Where(s => !covered.Contains(s.Name) && seen.Add(s.Name)).ToList();
        }
    }

    /// <summary>What the acceptance ledger check found (see <see cref="Ledger.LedgerGuard"/>): errors fail the run.</summary>
    public IReadOnlyList<Ledger.LedgerFinding> Acceptance { get; init; } = [];

    /// <summary>The ledger's entries as this run read them, for the headroom trends across accepted entries.</summary>
    public Ledger.AcceptedEntries LedgerEntries { get; init; } = Ledger.AcceptedEntries.NotRead;

    /// <summary>True when the ledger check found no error: the contract and reference in use are the accepted ones.</summary>
    public bool AcceptanceHolds => !Acceptance.Any(f => f.IsError);

    /// <summary>Kish (1965) effective number of surrogate events.</summary>
    public double EffectiveEvents => Statistics.KishCount.Of(SumW, SumW2);

    /// <summary>Number of failed checks.</summary>
    public int Failures => Outcomes.Count(o => o.Verdict == Verdict.Fail);

    /// <summary>Number of checks the sample could not decide.</summary>
    public int Inconclusive => Outcomes.Count(o => o.Verdict == Verdict.Inconclusive);

    /// <summary>How the checks alone ended, the ledger aside (what ranking compares and what an acceptance needs).</summary>
    public RunOutcome ChecksOutcome => RunOutcomes.Decide(Failures, Inconclusive, acceptanceHolds: true, UncoveredSubjects.Count);

    /// <summary>How the run ended: the one verdict every report, the console and the exit code show.</summary>
    public RunOutcome Outcome => RunOutcomes.Decide(Failures, Inconclusive, AcceptanceHolds, UncoveredSubjects.Count);
}
