using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Drafting;

/// <summary>Drafts a starter contract from a trusted sample: profiles its columns, infers kinds and writes the tolerances.</summary>
internal static class ContractDrafter
{
    /// <summary>The draft's text, from the sample's <paramref name="files"/>.</summary>
    public static string Draft(IReadOnlyList<string> files, string? weight, DraftOptions options, string samplePath, string referencePath,
        IProgress<ReadProgress>? progress = null)
    {
        var sample = Sample.Open(files);
        if (weight is not null && !sample.ColumnNamesInAnyFile.Contains(weight))
            throw new Diagnostics.GateInputException(Diagnostics.ErrorCodes.SampleColumnMissing,
                $"The weight column '{weight}' is not in the trusted sample{Diagnostics.NearestName.Hint(weight, sample.ColumnNamesInAnyFile)}.",
                new Diagnostics.SourceLocation(files[0]));
        var profiles = ColumnProfiler.Profile(sample, weight, progress, out var events);
        if (events == 0)
            throw new Diagnostics.GateInputException(Diagnostics.ErrorCodes.SampleEmpty,
                $"The trusted sample has no events ({string.Join(", ", files.Select(Path.GetFileName))}).", new Diagnostics.SourceLocation(files[0]));
        var features = profiles.Select(p => FeatureDrafter.Draft(p, options)).ToList();
        var name = Path.GetFileNameWithoutExtension(files[0]);
        var description = files.Count == 1 ? Path.GetFileName(files[0]) : $"{files.Count} files ({Path.GetFileName(files[0])} …)";
        return DraftWriter.Write(new DraftWriter.Source(description, events, weight, samplePath, referencePath, $"drafted-from-{name}"), options, features);
    }
}
