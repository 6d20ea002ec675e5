using System.Globalization;
using System.Text;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// The precision contract the end-to-end benchmark checks: all 20 features, equal-probability bins by default and
/// equal-width axes for a few, with binned KS, bin ratios and the χ² and KS tests. Inconclusive checks only warn, so
/// the exit code says whether the run worked, not whether the sample was large enough. Extra check kinds can be added
/// (<see cref="Kinds"/>), one variant per kind, so the benchmark times what each kind adds to the plain check.
/// </summary>
internal static class BenchmarkContract
{
    public const int QuantileBins = 40;

    /// <summary>
    /// The extra check kinds a variant may carry: moments (mean shift, width ratio), quantiles (core quantile shift,
    /// IQR width), distances (Wasserstein-1 and Jensen–Shannon, bootstrapped), far tails, categories (a category block
    /// of four categories on five features, with their fractions) and correlations (Pearson and Spearman over the ten
    /// pairs of five features). Tolerances are plausible values, not tuned: what is timed is the work, not the verdict.
    /// </summary>
    public static IReadOnlyList<string> Kinds { get; } = ["moments", "quantiles", "distances", "far-tails", "categories", "correlations"];

    // The features that carry a category block, and the pairs' features: five of the twenty, of different shapes.
    private static readonly int[] CategoryFeatures = [0, 1, 3, 6, 18];
    private static readonly int[] PairFeatures = [0, 1, 2, 3, 4];

    public static string Text(string samplePath, string referencePath) => Text(samplePath, referencePath, []);

    /// <summary>The contract with the extra check kinds <paramref name="kinds"/> (names from <see cref="Kinds"/>).</summary>
    public static string Text(string samplePath, string referencePath, IReadOnlyCollection<string> kinds)
    {
        foreach (var kind in kinds)
            if (!Kinds.Contains(kind))
                throw new ArgumentException($"unknown check kind '{kind}' (known: {string.Join(", ", Kinds)})");
        bool With(string kind) => kinds.Contains(kind);
        var text = new StringBuilder();
        text.AppendLine("contract-version: 1");
        text.AppendLine("title: benchmark-20-features");
        text.AppendLine($"sample: {{ path: {samplePath} }}");
        text.AppendLine($"reference: {referencePath}");
        text.AppendLine("decision: { confidence: 0.95, false-alarm: 0.01, correction: holm, inconclusive: warn }");
        text.AppendLine("defaults:");
        text.AppendLine($"  binning: {{ bins: {QuantileBins}, spacing: quantile }}");
        text.AppendLine("  core: 0.90");
        text.AppendLine("  checks:");
        text.AppendLine("    ks-max: 0.01");
        text.AppendLine("    ks-test: on");
        text.AppendLine("    chi2-test: on");
        text.AppendLine("    ratio-max: { core: 0.03, tails: 0.10 }");
        if (With("moments")) text.AppendLine("    mean-shift-max: 0.01\n    width-ratio-max: 0.01");
        if (With("quantiles")) text.AppendLine("    quantile-shift-max: 0.01\n    iqr-width-ratio-max: 0.02");
        if (With("distances")) text.AppendLine("    wasserstein-max: 0.01\n    jsd-max: 0.001");
        if (With("far-tails")) text.AppendLine("    far-tail-max: 0.0005");
        text.AppendLine("features:");
        for (var i = 0; i < SyntheticFeatures.Count; i++)
        {
            text.AppendLine($"  - name: {SyntheticFeatures.Names[i]}");
            foreach (var (feature, bins, lower, upper) in SyntheticFeatures.RegularAxes)
                if (feature == i)
                    text.AppendLine(string.Create(CultureInfo.InvariantCulture, $"    binning: {{ bins: {bins}, range: [{lower}, {upper}] }}"));
            // x14 is flat on [0, 1): four categories of a quarter of the events each.
            if (With("categories") && CategoryFeatures.Contains(i))
                text.AppendLine("    categories: { by: \"min(floor(x14 * 4), 3)\", values: [0, 1, 2, 3], fraction-max: 0.01 }");
        }
        if (With("correlations"))
        {
            text.AppendLine("correlations:");
            text.AppendLine($"  - features: [{string.Join(", ", PairFeatures.Select(i => SyntheticFeatures.Names[i]))}]");
            text.AppendLine("    pearson-max: 0.01");
            text.AppendLine("    spearman-max: 0.01");
        }
        return text.ToString();
    }
}
