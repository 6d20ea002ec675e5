using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a <c>binning</c> mapping into a <see cref="BinningSpec"/>: explicit <c>edges</c> (alone), or a number of
/// <c>bins</c> with quantile spacing (the default) or uniform spacing over a <c>range</c>.
/// </summary>
internal static class BinningSpecReader
{
    /// <summary>Bins when neither the feature nor the defaults say how many.</summary>
    public const int DefaultBins = 40;

    private const int MaxBins = 100_000;

    public static BinningSpec Read(YamlNodeReader r, YamlNode node, string what)
    {
        var mapping = r.Mapping(node, what);
        var e = r.Entries(mapping, "binning", ContractKeys.BinningKeys).ToDictionary(x => x.Key, x => x.Value);
        var at = r.At(node);
        if (e.TryGetValue(ContractKeys.Edges, out var edgesNode))
        {
            foreach (var other in new[] { ContractKeys.Bins, ContractKeys.Spacing, ContractKeys.Range })
                if (e.ContainsKey(other))
                    throw r.Error(ErrorCodes.ContractBadValue, e[other], $"'{other}' cannot be combined with explicit 'edges'.");
            var seq = r.Sequence(edgesNode, "edges");
            var edges = seq.Children.Select(n => r.Number(n, "An edge")).ToList();
            if (edges.Count < 2) throw r.Error(ErrorCodes.ContractBadValue, edgesNode, "edges needs at least two values.");
            for (var i = 1; i < edges.Count; i++)
                if (!(edges[i] > edges[i - 1]))
                    throw r.Error(ErrorCodes.ContractBadValue, seq.Children[i], $"edges must increase strictly; {edges[i]} follows {edges[i - 1]}.");
            return new EdgeBinning(edges, at);
        }

        var bins = DefaultBins;
        if (e.TryGetValue(ContractKeys.Bins, out var binsNode))
        {
            bins = r.Integer(binsNode, "bins");
            if (bins < 1 || bins > MaxBins) throw r.Error(ErrorCodes.ContractBadValue, binsNode, $"bins must be between 1 and {MaxBins}, got {bins}.");
        }
        var spacing = e.TryGetValue(ContractKeys.Spacing, out var sp)
            ? r.OneOf(sp, "spacing", ContractKeys.Spacings)
            : e.ContainsKey(ContractKeys.Range) ? "uniform" : "quantile";
        if (spacing == "quantile")
        {
            if (e.TryGetValue(ContractKeys.Range, out var rn))
                throw r.Error(ErrorCodes.ContractBadValue, rn, "Quantile spacing takes its range from the reference; drop 'range' or use spacing: uniform.");
            return new QuantileBinning(bins, at);
        }
        if (!e.TryGetValue(ContractKeys.Range, out var rangeNode))
            throw r.Error(ErrorCodes.ContractMissingKey, node, "Uniform spacing needs 'range: [lower, upper]'.");
        var (lo, hi) = r.Interval(rangeNode, "range");
        return new UniformBinning(bins, lo, hi, at);
    }
}
