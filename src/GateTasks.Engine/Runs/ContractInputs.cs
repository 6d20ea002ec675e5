using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Runs;

/// <summary>The files a check of a contract reads: the contract, its reference, its ledger and the sample's files.</summary>
internal static class ContractInputs
{
    /// <summary>
    /// The sample's files: <paramref name="samplePath"/> (relative to the working directory) when given, else the
    /// contract's sample (relative to the contract). A contract sample that matches nothing is reported at the
    /// contract line naming it, where the fix goes.
    /// </summary>
    public static IReadOnlyList<string> SampleFiles(PrecisionContract contract, string? samplePath)
    {
        if (samplePath is not null) return Samples.SampleFiles.Resolve(samplePath, Directory.GetCurrentDirectory());
        try
        {
            return Samples.SampleFiles.Resolve(contract.Sample.Path, contract.Directory);
        }
        catch (GateInputException e) when (e.Code == ErrorCodes.SampleNotFound)
        {
            throw new GateInputException(e.Code, e.Message, contract.Sample.PathLocation, e);
        }
    }

    /// <summary>
    /// Every input as an absolute path: contract, reference (which need not exist yet), the acceptance ledger when there
    /// is one (so recording an entry re-runs the check), sample files.
    /// </summary>
    public static IReadOnlyList<string> All(PrecisionContract contract, string? samplePath) =>
    [
        Path.GetFullPath(contract.FilePath), contract.ReferenceFullPath,
        .. File.Exists(contract.LedgerFullPath) ? [contract.LedgerFullPath] : Array.Empty<string>(),
        .. SampleFiles(contract, samplePath),
    ];

    /// <summary>
    /// The paths whose state decides <see cref="All"/>'s list besides the contract: the ledger and the reference
    /// (either may appear), and the sample's (<see cref="Samples.SampleFiles.Dependencies"/>).
    /// </summary>
    public static IReadOnlyList<string> Dependencies(PrecisionContract contract, string? samplePath) =>
        new[] { contract.LedgerFullPath, contract.ReferenceFullPath }
            .Concat(samplePath is not null
                ? Samples.SampleFiles.Dependencies(samplePath, Directory.GetCurrentDirectory())
                : Samples.SampleFiles.Dependencies(contract.Sample.Path, contract.Directory))
            .Distinct(StringComparer.Ordinal)
            .ToList();
}
