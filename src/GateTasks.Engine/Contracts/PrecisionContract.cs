using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>A loaded, validated precision contract. Paths inside are as written; resolve them against <see cref="Directory"/>.</summary>
internal sealed record PrecisionContract(
    string FilePath,
    int Version,
    string? Title,
    SampleSpec Sample,
    string ReferencePath,
    SourceLocation ReferenceLocation,
    DecisionSettings Decision,
    IReadOnlyList<FeatureSpec> Features,
    IReadOnlyList<CorrelationSpec>? Correlations = null,
    SelectionSpec? Selection = null,
    JointSpec? Joint = null,
    AcceptanceSettings? Acceptance = null)
{
    /// <summary>How the accepted state is guarded (defaults when the contract has no acceptance block).</summary>
    public AcceptanceSettings Guard => Acceptance ?? AcceptanceSettings.Default(FilePath);

    /// <summary>Absolute path of the acceptance ledger.</summary>
    public string LedgerFullPath => System.IO.Path.GetFullPath(Guard.LedgerPath, Directory);

    /// <summary>The declared correlation pairs (none when the contract lists none).</summary>
    public IReadOnlyList<CorrelationSpec> Pairs => Correlations ?? [];

    /// <summary>Default contract file name.</summary>
    public const string DefaultFileName = "precision-contract.yaml";

    /// <summary>Folder the contract lives in; relative paths are resolved against it.</summary>
    public string Directory => System.IO.Path.GetDirectoryName(System.IO.Path.GetFullPath(FilePath)) ?? ".";

    /// <summary>Absolute path of the reference file.</summary>
    public string ReferenceFullPath => System.IO.Path.GetFullPath(ReferencePath, Directory);

    /// <summary>Name used in reports: the title, else the file name.</summary>
    public string DisplayName => Title ?? System.IO.Path.GetFileName(FilePath);
}
