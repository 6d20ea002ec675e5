using System.Globalization;
using System.Text;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// The precision contract the end-to-end benchmark checks: all 20 features, equal-probability bins by default and
/// equal-width axes for a few, with binned KS, bin ratios and the χ² and KS tests. Inconclusive checks only warn, so
/// the exit code says whether the run worked, not whether the sample was large enough.
/// </summary>
internal static class BenchmarkContract
{
    public const int QuantileBins = 40;

    public static string Text(string samplePath, string referencePath)
    {
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
        text.AppendLine("features:");
        for (var i = 0; i < SyntheticFeatures.Count; i++)
        {
            text.AppendLine($"  - name: {SyntheticFeatures.Names[i]}");
            foreach (var (feature, bins, lower, upper) in SyntheticFeatures.RegularAxes)
                if (feature == i)
                    text.AppendLine(string.Create(CultureInfo.InvariantCulture, $"    binning: {{ bins: {bins}, range: [{lower}, {upper}] }}"));
        }
        return text.ToString();
    }
}
