using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.IO;
using GateTasks.Engine.References;
using GateTasks.Engine.Reports;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Demo;

/// <summary>
/// The built-in demo: writes a toy full simulation, a faithful and a drifted surrogate sample, a commented contract,
/// builds the reference and checks both samples. All seeds are fixed, so every run gives the same numbers. The
/// response kind keeps the full simulation and the faithful sample, and makes the drifted one a detector response
/// whose resolution is 5% worse in one range of true energy.
/// </summary>
internal sealed class DemoRun(string folder, DemoKind kind = DemoKind.Generator)
{
    public const int ReferenceEvents = 3_000_000;
    public const int SurrogateEvents = 1_000_000;
    public const int ReferenceSeed = 1001;
    public const int FaithfulSeed = 2002;
    public const int DriftedSeed = 3003;

    public string Folder { get; } = Path.GetFullPath(folder);
    public DemoKind Kind { get; } = kind;
    public string ContractPath => Path.Combine(Folder, DemoContract.FileName);
    public string FullSimulationPath => Path.Combine(Folder, "fullsim.parquet");
    public string FaithfulPath => Path.Combine(Folder, "surrogate-faithful.parquet");
    public string DriftedPath => Path.Combine(Folder, "surrogate-drifted.parquet");
    public string ReportFolder => Path.Combine(Folder, "reports");

    /// <summary>Generates the three samples and the contract.</summary>
    public void WriteInputs()
    {
        Directory.CreateDirectory(Folder);
        // The three samples are independent; two cores write them side by side.
        Parallel.Invoke(
            () => DemoSampleWriter.Write(FullSimulationPath, DemoScenarioParameters.FullSimulation, ReferenceEvents, ReferenceSeed, DemoSampleWriter.DefaultRowGroupSize),
            () => DemoSampleWriter.Write(FaithfulPath, DemoScenarioParameters.FullSimulation, SurrogateEvents, FaithfulSeed, DemoSampleWriter.DefaultRowGroupSize),
            () => DemoSampleWriter.Write(DriftedPath, DriftedScenario, SurrogateEvents, DriftedSeed, DemoSampleWriter.DefaultRowGroupSize));
        AtomicFile.WriteText(ContractPath, DemoContract.For(Kind));
        // A fresh demo starts a fresh acceptance history.
        File.Delete(Path.Combine(Folder, Contracts.AcceptanceSettings.DefaultLedgerName(ContractPath)));
    }

    /// <summary>
    /// Records the faithful sample's run as the accepted state, as an analysis team would once it had reviewed the
    /// tolerances, and returns the report with the ledger checked again.
    /// </summary>
    public RunResult Accept(RunResult faithful)
    {
        Runs.Acceptance.Accept(faithful, "GateTasks demo", "the demo analysis's tolerances, met by the faithful surrogate", DateTimeOffset.UtcNow);
        return faithful with
        {
            Acceptance = Ledger.LedgerGuard.Verify(faithful.Contract, faithful.ReferenceSha256, faithful.Outcomes),
            LedgerEntries = Ledger.AcceptedEntries.Read(faithful.Contract),
        };
    }

    /// <summary>What the drifted surrogate got wrong.</summary>
    public DemoScenarioParameters DriftedScenario => Kind == DemoKind.Response ? DemoScenarioParameters.DegradedResponse : DemoScenarioParameters.Drifted;

    /// <summary>Builds the reference from the full simulation under the contract.</summary>
    public ReferenceHistograms BuildReference()
    {
        var contract = ContractLoader.Load(ContractPath);
        var reference = ReferenceBuilder.Build(contract, [FullSimulationPath], contract.Sample.Weight, ToolVersion.Current);
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        return reference;
    }

    /// <summary>
    /// Checks one surrogate sample (accepting its state into the ledger when <paramref name="accept"/>) and writes its
    /// reports: JUnit XML, HTML and Markdown, named after <paramref name="reportName"/>.
    /// </summary>
    public (RunResult Report, string JUnitPath) Check(string samplePath, string reportName, bool accept = false)
    {
        var contract = ContractLoader.Load(ContractPath);
        var report = ContractRun.Run(contract, samplePath);
        if (accept) report = Accept(report);
        var junit = Path.Combine(ReportFolder, reportName + ".junit.xml");
        JUnitReport.Write(junit, [report]);
        HtmlReport.Write(Path.Combine(ReportFolder, reportName + ".html"), report);
        MarkdownSummary.Write(Path.Combine(ReportFolder, reportName + ".md"), report);
        return (report, junit);
    }
}
