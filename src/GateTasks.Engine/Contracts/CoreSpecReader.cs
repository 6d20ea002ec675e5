using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>Reads a <c>core</c>: a central fraction of the reference, or two reference quantiles <c>[p, q]</c>.</summary>
internal static class CoreSpecReader
{
    /// <summary>The central fraction when neither the feature nor the defaults state a core.</summary>
    public const double DefaultFraction = 0.90;

    /// <summary>The core holding the central <paramref name="fraction"/> of the reference: [(1−f)/2, (1+f)/2].</summary>
    public static CoreSpec Central(double fraction, SourceLocation at) => new((1 - fraction) / 2, (1 + fraction) / 2, at);

    public static CoreSpec Read(YamlNodeReader r, YamlNode node, string what)
    {
        if (node is YamlSequenceNode)
        {
            var (lo, hi) = r.Interval(node, what);
            if (lo < 0 || hi > 1) throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} as quantiles must lie within [0, 1].");
            return new CoreSpec(lo, hi, r.At(node));
        }
        var f = r.Number(node, what);
        if (!(f > 0 && f < 1))
            throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} is the central fraction of the reference and must be in (0, 1), got {f}.");
        return Central(f, r.At(node));
    }
}
