using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// Drafts a starter contract from a trusted sample: profiles its columns (those the exclusion globs leave), infers
/// kinds, writes the tolerances and raises each to what a perfect surrogate can pass against a reference built from
/// the same sample (<see cref="ReferenceNoiseFloor"/>).
/// </summary>
internal static class ContractDrafter
{
    /// <summary>The draft's text, from the sample's <paramref name="files"/>, leaving out columns matching <paramref name="exclude"/>.</summary>
    public static string Draft(IReadOnlyList<string> files, string? weight, DraftOptions options, string samplePath, string referencePath,
        IProgress<ReadProgress>? progress = null, IReadOnlyList<string>? exclude = null)
    {
        var sample = Sample.Open(files);
        if (weight is not null && !sample.ColumnNamesInAnyFile.Contains(weight))
            throw new GateInputException(ErrorCodes.SampleColumnMissing,
                $"The weight column '{weight}' is not in the trusted sample{NearestName.Hint(weight, sample.ColumnNamesInAnyFile)}.",
                new SourceLocation(files[0]));
        var patterns = (exclude ?? []).Select(g => new ColumnPattern(g)).ToList();
        var names = sample.Columns.Select(c => c.Name).ToList();
        // A glob that matches nothing is a typo more often than not: a column meant to be left out would be drafted.
        foreach (var unmatched in patterns.Where(p => !names.Any(p.Matches)))
            throw new GateInputException(ErrorCodes.Usage,
                $"--exclude '{unmatched.Glob}' matches no column of the trusted sample (columns: {string.Join(", ", names)}).", new SourceLocation(files[0]));
        string? ExcludedBy(string column) => patterns.FirstOrDefault(p => p.Matches(column))?.Glob;

        var profiles = ColumnProfiler.Profile(sample, weight, c => ExcludedBy(c) is not null, options.MaxCategories, progress, out var events);
        if (events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty,
                $"The trusted sample has no events ({string.Join(", ", files.Select(Path.GetFileName))}).", new SourceLocation(files[0]));
        var drafted = profiles.Select(p => FeatureDrafter.Draft(p, options)).ToList();
        // The floors share the contract's miss probability among all drafted checks (the contract's default confidence:
        // the draft writes no decision block).
        var floor = new ReferenceNoiseFloor(DecisionSettings.Default.Confidence, drafted.Sum(f => f.Tolerances.Count));
        var features = drafted.Select((f, i) => floor.Apply(f, profiles[i], options)).Select(Hinted).ToList();
        features.AddRange(sample.Columns.Where(c => c.Name != weight && ExcludedBy(c.Name) is not null)
            .Select(c => new FeatureDraft(c.Name, FeatureKind.Continuous, "", null, null, [], $"left out by --exclude '{ExcludedBy(c.Name)}'")));
        var name = Path.GetFileNameWithoutExtension(files[0]);
        var description = files.Count == 1 ? Path.GetFileName(files[0]) : $"{files.Count} files ({Path.GetFileName(files[0])} …)";
        return DraftWriter.Write(new DraftWriter.Source(description, events, weight, samplePath, referencePath, $"drafted-from-{name}"), options, features);
    }

    private static FeatureDraft Hinted(FeatureDraft f) =>
        f.SkipReason is null && GeneratorLevelNames.Match(f.Column) is { } glob
            ? f with { KindReason = $"{f.KindReason}; the name looks generator-level ('{glob}'): if it is a generator input, leave it out (--exclude)" }
            : f;
}
