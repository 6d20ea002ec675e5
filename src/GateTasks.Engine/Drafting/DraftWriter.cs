using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using YamlDotNet.Core;
using YamlDotNet.Core.Events;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// Writes a drafted contract as YAML (YamlDotNet's emitter, so names are quoted where YAML needs it), every generated
/// value with a comment saying where it came from, for a reviewer to check and change.
/// </summary>
internal static class DraftWriter
{
    /// <summary>Where the draft came from, for its header comment.</summary>
    internal sealed record Source(string Description, long Events, string? Weight, string SamplePath, string ReferencePath, string Title);

    public static string Write(Source source, DraftOptions o, IReadOnlyList<FeatureDraft> features)
    {
        var text = new StringWriter(CultureInfo.InvariantCulture) { NewLine = "\n" };
        var e = new Emitter(text, new EmitterSettings(2, int.MaxValue, false, 1024));
        e.Emit(new StreamStart());
        e.Emit(new DocumentStart());
        Comment(e, $"Drafted by 'gatetasks draft' from {source.Description} ({InvariantNumber.Count(source.Events)} events)");
        Comment(e, $"for an analysis expecting {InvariantNumber.Count(o.DataEvents)} data events: every tolerance keeps the surrogate's bias");
        Comment(e, $"below {PrecisionRule.FractionText(o.CoreFraction)} of the data's statistical uncertainty in the core and {(o.TailFraction == 1 ? "all" : PrecisionRule.FractionText(o.TailFraction))} of it in the tails");
        Comment(e, "(docs/drafting.md), and at least what a perfect surrogate of unlimited size passes against a reference built");
        Comment(e, "from this same sample, every check together with probability >= 95% (a widened tolerance says so).");
        Comment(e, "A draft, not a decision: review every value, tighten it where the analysis fits, check the");
        Comment(e, "sample size with 'gatetasks plan', and record the contract with 'gatetasks accept'.");
        e.Emit(new MappingStart());
        Scalar(e, ContractKeys.Version); Scalar(e, "1");
        Comment(e, "the contract format this GateTasks reads", inline: true);
        Scalar(e, ContractKeys.Title); Scalar(e, source.Title);
        Comment(e, "named after the trusted sample; it names the JUnit suite", inline: true);
        Scalar(e, ContractKeys.Sample);
        e.Emit(new MappingStart());
        Scalar(e, ContractKeys.Path); Scalar(e, source.SamplePath);
        Comment(e, "where the surrogate samples land: change it", inline: true);
        if (source.Weight is { } w)
        {
            Scalar(e, ContractKeys.Weight); Scalar(e, w);
            Comment(e, "the trusted sample's weight column", inline: true);
        }
        e.Emit(new MappingEnd());
        Scalar(e, ContractKeys.Reference); Scalar(e, source.ReferencePath);
        Comment(e, "build it: gatetasks reference build --from <the trusted sample>", inline: true);
        Scalar(e, ContractKeys.Defaults);
        e.Emit(new MappingStart());
        Scalar(e, ContractKeys.Binning);
        e.Emit(new MappingStart());
        Scalar(e, ContractKeys.Bins); Scalar(e, o.Bins.ToString(CultureInfo.InvariantCulture));
        Comment(e, "per continuous feature (--bins); fewer bins loosen ratio-max as √B but need less reference", inline: true);
        Scalar(e, ContractKeys.Spacing); Scalar(e, "quantile");
        Comment(e, "equal-probability bins: every bin holds the same share of the data", inline: true);
        e.Emit(new MappingEnd());
        Scalar(e, ContractKeys.Core); Scalar(e, Number(o.Core));
        Comment(e, "the central fraction whose bins take the core tolerance", inline: true);
        e.Emit(new MappingEnd());

        Scalar(e, ContractKeys.Features);
        e.Emit(new SequenceStart(null, null, false, SequenceStyle.Block));
        foreach (var f in features.Where(f => f.SkipReason is null))
        {
            e.Emit(new MappingStart());
            Scalar(e, ContractKeys.Name); Scalar(e, f.Column);
            Comment(e, f.KindReason, inline: true);
            if (f.Kind == FeatureKind.Discrete)
            {
                Scalar(e, ContractKeys.Kind); Scalar(e, "discrete");
                Comment(e, "each value a category", inline: true);
            }
            if (f.Spike is { } spike)
            {
                Scalar(e, ContractKeys.Spike); Scalar(e, Number(spike));
                Comment(e, f.SpikeReason!, inline: true);
            }
            Scalar(e, ContractKeys.Checks);
            e.Emit(new MappingStart());
            foreach (var group in f.Tolerances.GroupBy(t => t.Check))
            {
                Scalar(e, ContractKeys.CheckKey(group.Key));
                if (group.First().Region is null)
                {
                    var t = group.Single().Tolerance;
                    Scalar(e, Number(t.Value));
                    Comment(e, t.Derivation, inline: true);
                    continue;
                }
                e.Emit(new MappingStart());
                foreach (var (_, region, t) in group)
                {
                    Scalar(e, region!); Scalar(e, Number(t.Value));
                    Comment(e, t.Derivation, inline: true);
                }
                e.Emit(new MappingEnd());
            }
            e.Emit(new MappingEnd());
            e.Emit(new MappingEnd());
        }
        e.Emit(new SequenceEnd());
        e.Emit(new MappingEnd());
        e.Emit(new DocumentEnd(true));
        e.Emit(new StreamEnd());

        var skipped = features.Where(f => f.SkipReason is not null).ToList();
        if (skipped.Count > 0)
            text.Write("# Columns left out:\n" + string.Concat(skipped.Select(f => $"#   {f.Column}: {f.SkipReason}\n")));
        var dropped = features.SelectMany(f => (f.Dropped ?? []).Select(d => $"#   {f.Column} {d}\n")).ToList();
        if (dropped.Count > 0) text.Write("# Checks left out:\n" + string.Concat(dropped));
        text.Write("# Derived features (expressions) are not guessed: add the ones the analysis uses.\n");
        text.Write("# An expression writes logic as && || ! and a column name that is not an identifier in braces,\n" +
            "# like  expression: \"{jet pt} * cosh(eta)\"  (quoted: YAML reads a value starting with { or ! otherwise).\n");
        return text.ToString();
    }

    private static void Scalar(IEmitter e, string value) => e.Emit(new Scalar(value));

    private static void Comment(IEmitter e, string text, bool inline = false) => e.Emit(new YamlDotNet.Core.Events.Comment(text, inline));

    private static string Number(double x) => x.ToString("R", CultureInfo.InvariantCulture);

}
