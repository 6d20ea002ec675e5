using System.Text.Json;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Partials;

/// <summary>
/// The accumulation inside a partial file, as JSON: the state records of <see cref="AccumulationState"/> written in a
/// fixed order (the seal is computed over these bytes) and read back bit for bit (<see cref="PartialNumbers"/>).
/// Reading only parses; whether the state fits a contract is the accumulation's to say.
/// </summary>
internal static class AccumulationJson
{
    public static void Write(Utf8JsonWriter w, AccumulationState state)
    {
        w.WriteStartObject();
        w.WriteNumber("events", state.Events);
        w.WriteNumber("negative_weight_events", state.NegativeWeightEvents);
        PartialNumbers.WriteArray(w, "sum_w", state.SumW);
        PartialNumbers.WriteArray(w, "sum_w2", state.SumW2);
        w.WriteStartArray("features");
        foreach (var f in state.Features)
        {
            w.WriteStartObject();
            w.WriteString("name", f.Name);
            w.WritePropertyName("histogram");
            WriteHistogram(w, f.Histogram);
            PartialNumbers.WriteArray(w, "statistics", f.Statistics);
            if (f.Spike is { } spike)
            {
                w.WriteNumber("spike_entries", spike.Entries);
                PartialNumbers.WriteArray(w, "spike_w", spike.SumW);
                PartialNumbers.WriteArray(w, "spike_w2", spike.SumW2);
            }
            if (f.FarTail is { } tail) PartialNumbers.WriteJagged(w, "far_tail", tail);
            if (f.FineGrid is { } fine) WriteFineGrid(w, fine);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteStartArray("pairs");
        foreach (var p in state.Pairs)
        {
            w.WriteStartObject();
            w.WriteString("pair", p.Name);
            PartialNumbers.WriteArray(w, "pearson", p.Pearson);
            PartialNumbers.WriteArray(w, "spearman", p.Spearman);
            if (p.Cells is { } cells) WriteCells(w, cells, "cells_w", "cells_w2");
            w.WriteEndObject();
        }
        w.WriteEndArray();
        if (state.JointMoments is { } moments)
        {
            w.WriteStartObject("joint_moments");
            w.WriteNumber("rows", moments.Rows);
            w.WriteNumber("skipped", moments.Skipped);
            if (moments.Moments is { } m) PartialNumbers.WriteArray(w, "moments", m);
            if (moments.Kernel is { } k) PartialNumbers.WriteJagged(w, "kernel_sums", k);
            if (moments.KernelSubsample is { } sub)
            {
                // The kept rows themselves (raw values, weight, count): a merge takes the union and cuts it back to K.
                w.WriteStartObject("kernel_subsample");
                w.WriteNumber("limit", sub.Limit);
                w.WriteNumber("width", sub.Width);
                PartialNumbers.WriteArray(w, "values", sub.Values);
                w.WriteStartArray("counts");
                foreach (var c in sub.Counts) w.WriteNumberValue(c);
                w.WriteEndArray();
                PartialNumbers.WriteJagged(w, "weight_terms", sub.WeightTerms);
                PartialNumbers.WriteJagged(w, "square_terms", sub.SquareTerms);
                w.WriteEndObject();
            }
            w.WriteEndObject();
        }
        if (state.Sliced is { } sliced)
        {
            w.WriteStartObject("joint_sliced");
            w.WriteString("grid_sha256", sliced.GridDigest);
            w.WriteNumber("groups", sliced.Histograms.Groups);
            w.WriteNumber("rows", sliced.Histograms.Rows);
            w.WriteNumber("skipped", sliced.Histograms.Skipped);
            WriteExactSums(w, "group_cells", sliced.Histograms.GroupCells);
            WriteExactSums(w, "squares", sliced.Histograms.CellSquares);
            WriteExactSums(w, "moments", sliced.Histograms.Moments);
            w.WriteEndObject();
        }
        w.WriteEndObject();
    }

    /// <summary>The grid digest a partial's sliced histograms were filled on, or null when it has none.</summary>
    public static string? SlicedGridDigest(JsonElement accumulation) =>
        accumulation.TryGetProperty("joint_sliced", out var s) ? s.GetProperty("grid_sha256").GetString() : null;

    /// <summary>An exact-sum array as its two leading terms per sum and the sums held in full.</summary>
    private static void WriteExactSums(Utf8JsonWriter w, string name, ExactSumArrayState state)
    {
        w.WriteStartObject(name);
        PartialNumbers.WriteArray(w, "high", state.High);
        PartialNumbers.WriteArray(w, "low", state.Low);
        w.WriteStartArray("spilled");
        foreach (var s in state.Spilled)
        {
            w.WriteStartObject();
            w.WriteNumber("index", s.Index);
            PartialNumbers.WriteArray(w, "terms", s.Terms);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteEndObject();
    }

    private static ExactSumArrayState ReadExactSums(JsonElement e) => new(
        PartialNumbers.ReadArray(e.GetProperty("high")), PartialNumbers.ReadArray(e.GetProperty("low")),
        e.GetProperty("spilled").EnumerateArray().Select(s => new SpilledSum(s.GetProperty("index").GetInt32(), PartialNumbers.ReadArray(s.GetProperty("terms")))).ToList());

    /// <summary>Parses what <see cref="Write"/> wrote; a missing or mistyped property throws (the partial is damaged).</summary>
    public static AccumulationState Read(JsonElement e)
    {
        var features = e.GetProperty("features").EnumerateArray().Select(f => new FeatureState(
            f.GetProperty("name").GetString()!,
            ReadHistogram(f.GetProperty("histogram")),
            PartialNumbers.ReadArray(f.GetProperty("statistics")),
            f.TryGetProperty("spike_entries", out var se)
                ? new SpikeState(se.GetInt64(), PartialNumbers.ReadArray(f.GetProperty("spike_w")), PartialNumbers.ReadArray(f.GetProperty("spike_w2")))
                : null,
            f.TryGetProperty("far_tail", out var ft) ? PartialNumbers.ReadJagged(ft) : null,
            ReadFineGrid(f))).ToList();
        var pairs = e.GetProperty("pairs").EnumerateArray().Select(p => new PairState(
            p.GetProperty("pair").GetString()!,
            PartialNumbers.ReadArray(p.GetProperty("pearson")),
            PartialNumbers.ReadArray(p.GetProperty("spearman")),
            p.TryGetProperty("cells_w", out _) ? ReadCells(p, "cells_w", "cells_w2") : null)).ToList();
        var moments = e.TryGetProperty("joint_moments", out var jm)
            ? new JointMomentsState(jm.GetProperty("rows").GetInt64(), jm.GetProperty("skipped").GetInt64(),
                jm.TryGetProperty("moments", out var m) ? PartialNumbers.ReadArray(m) : null,
                jm.TryGetProperty("kernel_sums", out var k) ? PartialNumbers.ReadJagged(k) : null,
                jm.TryGetProperty("kernel_subsample", out var ks)
                    ? new KernelSubsampleState(ks.GetProperty("limit").GetInt32(), ks.GetProperty("width").GetInt32(),
                        PartialNumbers.ReadArray(ks.GetProperty("values")), ks.GetProperty("counts").EnumerateArray().Select(c => c.GetInt64()).ToArray(),
                        PartialNumbers.ReadJagged(ks.GetProperty("weight_terms")), PartialNumbers.ReadJagged(ks.GetProperty("square_terms")))
                    : null)
            : null;
        var sliced = e.TryGetProperty("joint_sliced", out var sl)
            ? new SlicedState(sl.GetProperty("grid_sha256").GetString()!, new SlicedHistogramState(sl.GetProperty("groups").GetInt32(),
                ReadExactSums(sl.GetProperty("group_cells")), ReadExactSums(sl.GetProperty("squares")), ReadExactSums(sl.GetProperty("moments")),
                sl.GetProperty("rows").GetInt64(), sl.GetProperty("skipped").GetInt64()))
            : null;
        return new AccumulationState(e.GetProperty("events").GetInt64(), e.GetProperty("negative_weight_events").GetInt64(),
            PartialNumbers.ReadArray(e.GetProperty("sum_w")), PartialNumbers.ReadArray(e.GetProperty("sum_w2")), features, pairs, moments, sliced);
    }

    /// <summary>A feature's fine-grid cells (kept for a Wasserstein check) and its four tail moments, as exact terms.</summary>
    private static void WriteFineGrid(Utf8JsonWriter w, FineGridState fine)
    {
        w.WriteStartObject("fine_grid");
        w.WritePropertyName("cells");
        WriteHistogram(w, fine.Histogram);
        PartialNumbers.WriteJagged(w, "tail_moments", fine.Tails);
        w.WriteEndObject();
    }

    private static FineGridState? ReadFineGrid(JsonElement feature) =>
        feature.TryGetProperty("fine_grid", out var g)
            ? new FineGridState(ReadHistogram(g.GetProperty("cells")), PartialNumbers.ReadJagged(g.GetProperty("tail_moments")))
            : null;

    private static void WriteHistogram(Utf8JsonWriter w, ExactHistogramState h)
    {
        w.WriteStartObject();
        w.WriteNumber("entries", h.Entries);
        w.WriteNumber("nan_entries", h.NanEntries);
        WriteCells(w, h.Cells, "sum_w", "sum_w2");
        PartialNumbers.WriteArray(w, "nan_w", h.NanW);
        PartialNumbers.WriteArray(w, "nan_w2", h.NanW2);
        w.WriteEndObject();
    }

    private static ExactHistogramState ReadHistogram(JsonElement e) => new(
        e.GetProperty("entries").GetInt64(), e.GetProperty("nan_entries").GetInt64(), ReadCells(e, "sum_w", "sum_w2"),
        PartialNumbers.ReadArray(e.GetProperty("nan_w")), PartialNumbers.ReadArray(e.GetProperty("nan_w2")));

    private static void WriteCells(Utf8JsonWriter w, ExactCellsState cells, string sumWName, string sumW2Name)
    {
        PartialNumbers.WriteJagged(w, sumWName, cells.SumW);
        PartialNumbers.WriteJagged(w, sumW2Name, cells.SumW2);
    }

    private static ExactCellsState ReadCells(JsonElement e, string sumWName, string sumW2Name) =>
        new(PartialNumbers.ReadJagged(e.GetProperty(sumWName)), PartialNumbers.ReadJagged(e.GetProperty(sumW2Name)));

}
