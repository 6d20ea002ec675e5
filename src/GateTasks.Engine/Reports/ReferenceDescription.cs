using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Reports;

/// <summary>A reference file as readable text: provenance, then per feature its binning, statistics and (optionally) bins.</summary>
internal static class ReferenceDescription
{
    public static string Format(string path, ReferenceHistograms r, bool withBins)
    {
        var sb = new StringBuilder();
        sb.AppendLine($"reference     {path}");
        sb.AppendLine($"format        {r.FormatVersion} (written by GateTasks {r.ToolVersion}, {r.CreatedUtc.UtcDateTime:yyyy-MM-ddTHH:mm:ssZ})");
        sb.AppendLine($"events        {InvariantNumber.Count(r.Events)} (Σw {InvariantNumber.Short(r.SumW)}, effective {InvariantNumber.Short(r.EffectiveEvents)})");
        sb.AppendLine($"weight column {r.WeightColumn ?? "(none: unit weights)"}");
        foreach (var i in r.Inputs) sb.AppendLine($"built from    {i.Path} ({InvariantNumber.Count(i.Bytes)} bytes, sha256 {i.Sha256})");
        foreach (var f in r.Features)
        {
            var s = f.Summary;
            var h = f.Histogram;
            sb.AppendLine();
            sb.AppendLine($"feature {f.Name} (column {f.Column}, {f.Kind.ToString().ToLowerInvariant()})");
            sb.AppendLine($"  binning   {f.BinningRequest} → {h.Axis.Count} bins over [{InvariantNumber.Short(h.Axis.Edges[0])}, {InvariantNumber.Short(h.Axis.Edges[^1])})");
            sb.AppendLine($"  values    {InvariantNumber.Count(s.Count)} finite, {InvariantNumber.Count(s.NanCount)} NaN; mean {InvariantNumber.Short(s.Mean)}, std {InvariantNumber.Short(s.StandardDeviation)}, min {InvariantNumber.Short(s.Min)}, max {InvariantNumber.Short(s.Max)}");
            sb.AppendLine($"  flows     underflow Σw {InvariantNumber.Short(h.UnderflowSumW)}, overflow Σw {InvariantNumber.Short(h.OverflowSumW)}");
            if (f.Quantiles.Count > 0)
                sb.AppendLine("  quantiles " + string.Join("  ", f.Quantiles.Select(q => $"{InvariantNumber.Short(q.Probability)}:{InvariantNumber.Short(q.Value)}")));
            if (!withBins) continue;
            sb.AppendLine("  bin  lower       upper       Σw          Σw²");
            for (var b = 0; b < h.Axis.Count; b++)
                sb.AppendLine($"  {b,3}  {InvariantNumber.Short(h.Axis.Lower(b)),-10}  {InvariantNumber.Short(h.Axis.Upper(b)),-10}  {InvariantNumber.Short(h.BinSumW(b)),-10}  {InvariantNumber.Short(h.BinSumW2(b))}");
        }
        return sb.ToString();
    }
}
