using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;

namespace GateTasks.Tests.Shared;

/// <summary>
/// Five "checkpoints" of a surrogate of the demo's toy full simulation, made by the demo's own simulation with the
/// detector and physics knobs drifted by different amounts, and a reference built from a full-simulation sample,
/// under a small contract on m_gg, e_lead and n_jets. Built once per test class (about 5 s).
/// </summary>
public sealed class CheckpointSet : IDisposable
{
    public const int ReferenceEvents = 200_000;
    public const int CandidateEvents = 100_000;

    /// <summary>
    /// A contract loose enough for 10⁵ faithful events to pass every check with room (worst margin ≈ 0.75) and
    /// tight enough that a few-percent drift of the continuum slope shows; n_jets is judged by its fractions only
    /// (its rare high-multiplicity bins would make the ratio check the noisiest of all).
    /// </summary>
    public const string ContractText = """
        contract-version: 1
        title: rank-checkpoints
        sample: { path: candidate.parquet, weight: weight }
        reference: reference.parquet
        decision: { confidence: 0.95, false-alarm: 0.01, inconclusive: fail }
        defaults:
          binning: { bins: 20, spacing: quantile }
          core: 0.90
          checks:
            ks-max: 0.06
            wasserstein-max: 0.08
            ratio-max: { core: 0.3, tails: 0.4 }
        features:
          - name: m_gg
            checks:
              mean-shift-max: 0.08
              width-ratio-max: 0.08
          - name: e_lead
            checks:
              mean-shift-max: 0.08
          - name: n_jets
            kind: discrete
            checks:
              ratio-max: off
              fraction-max: 0.05
        """;

    /// <summary>
    /// The drift of each epoch, from none to strong: calorimeter constant term, continuum slope, jet multiplicity
    /// at zero p_T, share of high-mass events thinned away. The epochs are deliberately not in order of quality.
    /// </summary>
    internal static readonly IReadOnlyDictionary<int, DemoScenarioParameters> Epochs = new Dictionary<int, DemoScenarioParameters>
    {
        [1] = Drift(0.025, 0.060, 0.80, 0.4), // strong: fails most checks
        [2] = Drift(0.012, 0.045, 0.55, 0.1), // fails the m_gg location and width checks
        [3] = Drift(0.015, 0.050, 0.60, 0.2), // fails every m_gg check
        [4] = DemoScenarioParameters.FullSimulation, // faithful
        [5] = Drift(0.009, 0.042, 0.52, 0.0), // mild: passes, with less room
    };

    /// <summary>Best to worst, as the drifts above order them.</summary>
    public static readonly int[] ExpectedOrder = [4, 5, 2, 3, 1];

    private static DemoScenarioParameters Drift(double constantTerm, double slope, double jetBase, double thinning) =>
        DemoScenarioParameters.FullSimulation with
        {
            ConstantTerm = constantTerm,
            BackgroundSlope = slope,
            JetMultiplicityBase = jetBase,
            TailThinningFraction = thinning,
        };

    public CheckpointSet()
    {
        Folder = Directory.CreateTempSubdirectory("gatetasks-rank-").FullName;
        Directory.CreateDirectory(Path.Combine(Folder, "checkpoints"));
        ContractPath = Path.Combine(Folder, "precision-contract.yaml");
        File.WriteAllText(ContractPath, ContractText);
        var contract = ContractLoader.Load(ContractPath);
        var fullsim = Path.Combine(Folder, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, ReferenceEvents, 1, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        foreach (var (epoch, parameters) in Epochs)
            DemoSampleWriter.Write(Epoch(epoch), parameters, CandidateEvents, 100 + epoch, 50_000);
    }

    public string Folder { get; }
    public string ContractPath { get; }

    /// <summary>The checkpoint file of an epoch: checkpoints/epoch-N.parquet.</summary>
    public string Epoch(int n) => Path.Combine(Folder, "checkpoints", $"epoch-{n}.parquet");

    public void Dispose()
    {
        try { Directory.Delete(Folder, recursive: true); } catch (IOException) { }
    }
}
