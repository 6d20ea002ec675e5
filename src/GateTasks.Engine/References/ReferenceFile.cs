using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.IO;
using Parquet;
using Parquet.Schema;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.References;

/// <summary>
/// The reference file format, version 8 (docs/reference-format.md): a Parquet file whose rows are histogram
/// cells (feature, part, bin, lower, upper, sum_w, sum_w2) and whose key/value metadata entry
/// <c>gatetasks.reference</c> holds a JSON header with provenance, per-feature statistics and the SHA-256 of the
/// whole content (<see cref="ReferenceDigest"/>), verified on every read. A row's <c>part</c> says what it is
/// (<c>below</c> the first edge, a regular <c>bin</c>, <c>above</c> the last edge); only regular bins carry a
/// <c>bin</c> number, 0 … n − 1, so no row's meaning rests on where its number falls. Version 1 had no digest,
/// version 2 no fourth-moment variance of its correlations, version 3 neither a fine grid for a Wasserstein check
/// nor event weights of its joint subsample, version 4 (never released) no event weights of its joint subsample,
/// version 5 no streamed moments or kernel sums of its joint block, version 6 no sliced grid or histograms of its
/// joint block, version 7 numbered its flows as cells 0 and n + 1; each is refused with the command that rebuilds it.
/// </summary>
internal static class ReferenceFile
{
    public const int FormatVersion = 8; // 6: the joint block's streamed moments and kernel sums (JointMomentsEntry); 7: its sliced grid and histograms (SlicedEntry); 8: rows say their part
    public const string MetadataKey = "gatetasks.reference";
    public const string FormatKey = "gatetasks.reference.format";

    /// <summary>The <c>part</c> of a row holding the events below the first edge.</summary>
    public const string BelowPart = "below";
    /// <summary>The <c>part</c> of a row holding a regular bin, numbered by <c>bin</c>.</summary>
    public const string BinPart = "bin";
    /// <summary>The <c>part</c> of a row holding the events at or above the last edge.</summary>
    public const string AbovePart = "above";

    private static readonly DataField<string> FeatureField = new("feature", false);
    private static readonly DataField<string> PartField = new("part", false);
    private static readonly DataField<int?> BinField = new("bin");
    private static readonly DataField<double> LowerField = new("lower");
    private static readonly DataField<double> UpperField = new("upper");
    private static readonly DataField<double> SumWField = new("sum_w");
    private static readonly DataField<double> SumW2Field = new("sum_w2");

    /// <summary>Writes <paramref name="reference"/> to <paramref name="path"/> atomically.</summary>
    public static void Write(string path, ReferenceHistograms reference)
    {
        var features = new List<string>();
        var parts = new List<string>();
        var bins = new List<int?>();
        var lower = new List<double>();
        var upper = new List<double>();
        var sumW = new List<double>();
        var sumW2 = new List<double>();
        foreach (var f in reference.Features)
        {
            var h = f.Histogram;
            var edges = h.Axis.Edges;
            // The cell arrays run from the underflow to the overflow; each row names its part instead.
            for (var c = 0; c < h.SumW.Length; c++)
            {
                var last = h.SumW.Length - 1;
                features.Add(f.Name);
                parts.Add(c == 0 ? BelowPart : c == last ? AbovePart : BinPart);
                bins.Add(c == 0 || c == last ? null : c - 1);
                lower.Add(c == 0 ? double.NegativeInfinity : edges[c - 1]);
                upper.Add(c == h.SumW.Length - 1 ? double.PositiveInfinity : edges[c]);
                sumW.Add(h.SumW[c]);
                sumW2.Add(h.SumW2[c]);
            }
        }

        var unsealed = Header(reference).ToJsonString(new JsonSerializerOptions { WriteIndented = false });
        using var digest = new ReferenceDigest(unsealed);
        for (var i = 0; i < features.Count; i++) digest.Add(features[i], parts[i], bins[i], lower[i], upper[i], sumW[i], sumW2[i]);
        var header = unsealed.Replace(ReferenceDigest.Entry(ReferenceDigest.Placeholder), ReferenceDigest.Entry(digest.Finish()), StringComparison.Ordinal);
        AtomicFile.Write(path, stream => WriteParquetAsync(stream, header, features, parts, bins, lower, upper, sumW, sumW2).GetAwaiter().GetResult());
    }

    private static async Task WriteParquetAsync(Stream stream, string header, List<string> features, List<string> parts, List<int?> bins,
        List<double> lower, List<double> upper, List<double> sumW, List<double> sumW2)
    {
        {
            var schema = new ParquetSchema(FeatureField, PartField, BinField, LowerField, UpperField, SumWField, SumW2Field);
            var options = new ParquetOptions { CompressionMethod = CompressionMethod.Snappy };
            await using var writer = await ParquetWriter.CreateAsync(schema, stream, options);
            writer.CustomMetadata = new Dictionary<string, string>
            {
                [FormatKey] = FormatVersion.ToString(CultureInfo.InvariantCulture),
                [MetadataKey] = header,
            };
            using (var rg = writer.CreateRowGroup())
            {
                await rg.WriteAsync(FeatureField, features);
                await rg.WriteAsync(PartField, parts);
                await rg.WriteAsync<int>(BinField, bins.ToArray());
                await rg.WriteAsync<double>(LowerField, lower.ToArray());
                await rg.WriteAsync<double>(UpperField, upper.ToArray());
                await rg.WriteAsync<double>(SumWField, sumW.ToArray());
                await rg.WriteAsync<double>(SumW2Field, sumW2.ToArray());
            }
        }
    }

    /// <summary>Reads a reference file; any problem is a GATE21xx error naming the file.</summary>
    public static ReferenceHistograms Read(string path, SourceLocation? citedAt = null)
    {
        if (!File.Exists(path))
            throw new GateInputException(ErrorCodes.ReferenceNotFound,
                $"Reference file not found: {Path.GetFullPath(path)}. Build it with 'gatetasks reference build'.",
                citedAt ?? new SourceLocation(path));
        try
        {
            return ReadParquetAsync(path).GetAwaiter().GetResult();
        }
        catch (GateInputException)
        {
            throw;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            throw Unreadable(path, e.Message);
        }
    }

    private static async Task<ReferenceHistograms> ReadParquetAsync(string path)
    {
        {
            // Read in place: Parquet.Net's asynchronous reads would each hop to the thread pool (SynchronousReadStream).
            await using var stream = new SynchronousReadStream(File.OpenRead(path));
            await using var reader = await ParquetReader.CreateAsync(stream);
            if (!reader.CustomMetadata.TryGetValue(FormatKey, out var fmt) || !reader.CustomMetadata.TryGetValue(MetadataKey, out var json))
                throw Unreadable(path, "it is a Parquet file but not a GateTasks reference (no header metadata)");
            if (fmt == "1")
                throw Unreadable(path, "it is in reference format 1, which carries no checksum of its content, so an edit to it cannot be detected; " +
                    $"rebuild it with 'gatetasks reference build' (format {FormatVersion}), then, if the contract has an acceptance ledger, record the rebuilt reference with 'gatetasks accept'");
            if (fmt == "2")
                throw Unreadable(path, "it is in reference format 2, which stores no large-sample variance of its correlations (fourth moments), so a Pearson or Spearman check would rest on the normal-law error; " +
                    $"rebuild it with 'gatetasks reference build' (format {FormatVersion}), then, if the contract has an acceptance ledger, record the rebuilt reference with 'gatetasks accept'");
            if (fmt is "3" or "4" or "5")
                throw Unreadable(path, $"it is in reference format {fmt}, which stores no streamed moments or kernel sums of its joint block, so frechet-max and kernel-distance-max could not be checked; " +
                    $"rebuild it with 'gatetasks reference build' (format {FormatVersion}), then, if the contract has an acceptance ledger, record the rebuilt reference with 'gatetasks accept'");
            if (fmt == "6")
                throw Unreadable(path, "it is in reference format 6, which stores no sliced grid or histograms of its joint block, so sliced-ks-max and sliced-wasserstein-max could not be checked; " +
                    $"rebuild it with 'gatetasks reference build' (format {FormatVersion}), then, if the contract has an acceptance ledger, record the rebuilt reference with 'gatetasks accept'");
            if (fmt == "7")
                throw Unreadable(path, "it is in reference format 7, which numbers the flows of each histogram as cells 0 and n + 1 where this version's rows say their part (below, bin, above); " +
                    $"rebuild it with 'gatetasks reference build' (format {FormatVersion}), then, if the contract has an acceptance ledger, record the rebuilt reference with 'gatetasks accept'");
            if (fmt != FormatVersion.ToString(CultureInfo.InvariantCulture))
                throw Unreadable(path, $"reference format version {fmt} is not supported; this GateTasks reads version {FormatVersion}");
            // A document of its own, so the fine grids' thousands of numbers are read from its elements in place.
            using var document = JsonDocument.Parse(json);
            var header = JsonObject.Create(document.RootElement)!;
            var recorded = header[ReferenceDigest.Key] is JsonValue rv && rv.TryGetValue<string>(out var text) ? text : null;
            var entry = recorded is null ? null : ReferenceDigest.Entry(recorded);
            if (recorded is null || recorded.Length != ReferenceDigest.Placeholder.Length || CountOf(json, entry!) != 1)
                throw Damaged(path, "its header holds no readable checksum of its content");
            using var digest = ReferenceDigest.OfSealed(json, json.IndexOf(entry!, StringComparison.Ordinal), entry!.Length);

            var rows = new Dictionary<string, List<CellRow>>();
            for (var g = 0; g < reader.RowGroupCount; g++)
            {
                using var rg = reader.OpenRowGroupReader(g);
                var n = checked((int)rg.RowCount);
                var names = new string?[n];
                var part = new string?[n];
                var bin = new int?[n];
                var lo = new double[n];
                var hi = new double[n];
                var w = new double[n];
                var w2 = new double[n];
                await rg.ReadAsync(Field(reader, FeatureField), names.AsMemory());
                await rg.ReadAsync(Field(reader, PartField), part.AsMemory());
                await rg.ReadAsync<int>(Field(reader, BinField), bin.AsMemory());
                await rg.ReadAsync<double>(Field(reader, LowerField), lo.AsMemory());
                await rg.ReadAsync<double>(Field(reader, UpperField), hi.AsMemory());
                await rg.ReadAsync<double>(Field(reader, SumWField), w.AsMemory());
                await rg.ReadAsync<double>(Field(reader, SumW2Field), w2.AsMemory());
                for (var i = 0; i < n; i++)
                {
                    var name = names[i] ?? throw Damaged(path, "a feature name is null");
                    var rowPart = part[i] ?? throw Damaged(path, $"a row of feature '{name}' has no part");
                    digest.Add(name, rowPart, bin[i], lo[i], hi[i], w[i], w2[i]);
                    if (!rows.TryGetValue(name, out var list)) rows[name] = list = [];
                    list.Add(new CellRow(rowPart, bin[i], lo[i], hi[i], w[i], w2[i]));
                }
            }
            var actual = digest.Finish();
            if (!string.Equals(actual, recorded, StringComparison.Ordinal))
                throw Damaged(path, $"the SHA-256 of its content is {actual[..12]}…, its header records {recorded[..Math.Min(12, recorded.Length)]}…");
            return FromHeader(path, header, document.RootElement, rows);
        }
    }

    /// <summary>One histogram row as stored: its part, its bin number (regular bins only), edges and sums.</summary>
    private readonly record struct CellRow(string Part, int? Bin, double Lower, double Upper, double W, double W2);

    /// <summary>
    /// A feature's rows in cell order (below, bins 0 … n − 1, above): exactly one row per part and bin, a bin number on
    /// the regular bins only; anything else is a file this version did not write.
    /// </summary>
    private static CellRow[] InCellOrder(string path, string name, List<CellRow> rows, int bins)
    {
        var ordered = new CellRow?[bins + 2];
        foreach (var row in rows)
        {
            int at;
            if (row.Part == BelowPart && row.Bin is null) at = 0;
            else if (row.Part == AbovePart && row.Bin is null) at = bins + 1;
            else if (row.Part == BinPart && row.Bin is { } b && b >= 0 && b < bins) at = b + 1;
            else if (row.Part is BelowPart or AbovePart)
                throw Unreadable(path, $"feature '{name}' has its {row.Part} row numbered {row.Bin}; only regular bins carry a number");
            else if (row.Part == BinPart && row.Bin is null)
                throw Unreadable(path, $"feature '{name}' has a bin row without a bin number");
            else if (row.Part == BinPart)
                throw Unreadable(path, $"feature '{name}' has a bin row numbered {row.Bin}, outside its bins 0 … {bins - 1}");
            else
                throw Unreadable(path, $"feature '{name}' has a row of part '{row.Part}'; the parts are '{BelowPart}', '{BinPart}' and '{AbovePart}'");
            if (ordered[at] is not null)
                throw Unreadable(path, $"feature '{name}' has its {(at == 0 ? BelowPart : at == bins + 1 ? AbovePart : $"bin {at - 1}")} row twice");
            ordered[at] = row;
        }
        if (rows.Count != bins + 2 || ordered.Any(r => r is null))
            throw Unreadable(path, $"feature '{name}' has {rows.Count} cell rows, expected {bins + 2} (below, {bins} bins, above)");
        return ordered.Select(r => r!.Value).ToArray();
    }

    private static DataField Field(ParquetReader reader, DataField wanted) =>
        reader.Schema.DataFields.FirstOrDefault(f => f.Name == wanted.Name)
        ?? throw new InvalidDataException($"column '{wanted.Name}' is missing");

    private static int CountOf(string text, string part)
    {
        var count = 0;
        for (var at = text.IndexOf(part, StringComparison.Ordinal); at >= 0; at = text.IndexOf(part, at + part.Length, StringComparison.Ordinal)) count++;
        return count;
    }

    /// <summary>A reference whose content does not match its checksum: edited by hand, or damaged on disk or in transit.</summary>
    private static GateInputException Damaged(string path, string why) =>
        new(ErrorCodes.ReferenceUnreadable,
            $"Reference file {path} is damaged or was edited after it was built: {why}. Rebuild it with 'gatetasks reference build' from the trusted sample.",
            new SourceLocation(path));

    private static GateInputException Unreadable(string path, string why) =>
        new(ErrorCodes.ReferenceUnreadable, $"Reference file {path} cannot be read: {why}.", new SourceLocation(path));

    private static JsonObject Header(ReferenceHistograms r)
    {
        var features = new JsonArray();
        foreach (var f in r.Features)
        {
            var s = f.Summary;
            var h = f.Histogram;
            var q = new JsonArray();
            foreach (var p in f.Quantiles) q.Add((JsonNode)new JsonArray(p.Probability, p.Value));
            // Added as a JsonNode: the generic Add<T> (which C# would pick) may wrap any value by reflection.
            features.Add((JsonNode)new JsonObject
            {
                ["name"] = f.Name,
                ["column"] = f.Column,
                ["kind"] = f.Kind == FeatureKind.Discrete ? "discrete" : "continuous",
                ["binning"] = f.BinningRequest,
                ["bins"] = h.Axis.Count,
                ["entries"] = h.Entries,
                ["nan_entries"] = h.NanEntries,
                ["nan_sum_w"] = h.NanSumW,
                ["nan_sum_w2"] = h.NanSumW2,
                ["count"] = s.Count,
                ["sum_w"] = s.SumW,
                ["sum_w2"] = s.SumW2,
                ["mean"] = s.Mean,
                ["std"] = s.StandardDeviation,
                ["min"] = s.Min,
                ["max"] = s.Max,
                ["kurtosis"] = double.IsFinite(s.Kurtosis) ? s.Kurtosis : null,
                ["quantiles"] = q,
                ["far_tail"] = f.FarTail is { } ft
                    ? new JsonObject
                    {
                        ["low"] = ft.Low, ["high"] = ft.High, ["below_w"] = ft.BelowW, ["below_w2"] = ft.BelowW2,
                        ["above_w"] = ft.AboveW, ["above_w2"] = ft.AboveW2, ["total_w"] = ft.TotalW, ["total_w2"] = ft.TotalW2,
                    }
                    : null,
                ["spike"] = f.Spike is { } sp
                    ? new JsonObject { ["value"] = sp.Value, ["entries"] = sp.Entries, ["sum_w"] = sp.SumW, ["sum_w2"] = sp.SumW2 }
                    : null,
                ["fine_grid"] = FineGridJson(f.FineGrid),
            });
        }
        var inputs = new JsonArray();
        foreach (var i in r.Inputs)
            inputs.Add((JsonNode)new JsonObject { ["path"] = i.Path, ["bytes"] = i.Bytes, ["sha256"] = i.Sha256 });
        return new JsonObject
        {
            ["format"] = r.FormatVersion,
            [ReferenceDigest.Key] = ReferenceDigest.Placeholder,
            ["created_utc"] = r.CreatedUtc.UtcDateTime.ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture),
            ["tool_version"] = r.ToolVersion,
            ["weight_column"] = r.WeightColumn,
            ["events"] = r.Events,
            ["sum_w"] = r.SumW,
            ["sum_w2"] = r.SumW2,
            ["inputs"] = inputs,
            ["features"] = features,
            [JointMomentsKey] = r.JointMoments is { } jm ? JointMomentsEntry(jm) : null,
            [SlicedKey] = r.Sliced is { } sl ? SlicedEntry(sl) : null,
            ["correlations"] = new JsonArray((r.Correlations ?? []).Select(c => (JsonNode)new JsonObject
            {
                ["first"] = c.First, ["second"] = c.Second, ["pearson"] = c.Pearson, ["spearman"] = c.Spearman, ["effective_count"] = c.EffectiveCount,
                ["pearson_variance"] = c.PearsonVariance, ["spearman_variance"] = c.SpearmanVariance,
                ["cells_2d_sum_w"] = c.Cells2DSumW is null ? null : new JsonArray(c.Cells2DSumW.Select(v => (JsonNode)JsonValue.Create(v)!).ToArray()),
                ["cells_2d_sum_w2"] = c.Cells2DSumW2 is null ? null : new JsonArray(c.Cells2DSumW2.Select(v => (JsonNode)JsonValue.Create(v)!).ToArray()),
            }).ToArray()),
        };
    }

    private static ReferenceHistograms FromHeader(string path, JsonObject h, JsonElement root,
        Dictionary<string, List<CellRow>> rows)
    {
        var features = new List<ReferenceFeature>();
        // The same features as elements, in the same order, for their fine grids.
        var featureElements = root.GetProperty("features").EnumerateArray().ToArray();
        foreach (var (node, element) in h["features"]!.AsArray().Zip(featureElements))
        {
            var f = node!.AsObject();
            var name = (string)f["name"]!;
            if (!rows.TryGetValue(name, out var stored))
                throw Unreadable(path, $"feature '{name}' has no histogram cells");
            var bins = (int)f["bins"]!;
            var cells = InCellOrder(path, name, stored, bins);
            var edges = new double[bins + 1];
            for (var i = 0; i < bins; i++) edges[i] = cells[i + 1].Lower;
            edges[bins] = cells[bins].Upper;
            var axis = Axis.FromEdges(edges);
            var histogram = Histogram.FromCells(axis,
                cells.Select(c => c.W).ToArray(), cells.Select(c => c.W2).ToArray(),
                (long)f["entries"]!, (long)f["nan_entries"]!, (double)f["nan_sum_w"]!, (double)f["nan_sum_w2"]!);
            var summary = new FeatureSummary((long)f["count"]!, (double)f["sum_w"]!, (double)f["sum_w2"]!,
                (double)f["mean"]!, (double)f["std"]!, (double)f["min"]!, (double)f["max"]!, (long)f["nan_entries"]!,
                f["kurtosis"] is JsonValue k ? (double)k : double.NaN);
            var quantiles = f["quantiles"]!.AsArray()
                .Select(p => new QuantilePoint((double)p![0]!, (double)p[1]!)).ToList();
            features.Add(new ReferenceFeature(name, (string)f["column"]!,
                (string)f["kind"]! == "discrete" ? FeatureKind.Discrete : FeatureKind.Continuous,
                (string)f["binning"]!, histogram, summary, quantiles,
                f["spike"] is JsonObject sp ? new SpikeTally((double)sp["value"]!, (long)sp["entries"]!, (double)sp["sum_w"]!, (double)sp["sum_w2"]!) : null,
                f["far_tail"] is JsonObject ft
                    ? new FarTailCounts((double)ft["low"]!, (double)ft["high"]!, (double)ft["below_w"]!, (double)ft["below_w2"]!,
                        (double)ft["above_w"]!, (double)ft["above_w2"]!, (double)ft["total_w"]!, (double)ft["total_w2"]!)
                    : null,
                FineGridFromJson(path, name, element.TryGetProperty("fine_grid", out var grid) ? grid : default)));
        }
        var inputs = h["inputs"]!.AsArray()
            .Select(i => new ReferenceInput((string)i!["path"]!, (long)i["bytes"]!, (string)i["sha256"]!)).ToList();
        return new ReferenceHistograms(
            (int)h["format"]!,
            DateTimeOffset.Parse((string)h["created_utc"]!, CultureInfo.InvariantCulture),
            (string)h["tool_version"]!,
            inputs,
            (string?)h["weight_column"],
            (long)h["events"]!,
            (double)h["sum_w"]!,
            (double)h["sum_w2"]!,
            features,
            Correlations: h["correlations"] is JsonArray pairs
                ? pairs.Select(c => new ReferenceCorrelation((string)c!["first"]!, (string)c["second"]!, (double)c["pearson"]!, (double)c["spearman"]!, (double)c["effective_count"]!,
                    (double)c["pearson_variance"]!, (double)c["spearman_variance"]!,
                    (c["cells_2d_sum_w"] as JsonArray)?.Select(v => (double)v!).ToArray(), (c["cells_2d_sum_w2"] as JsonArray)?.Select(v => (double)v!).ToArray())).ToList()
                : [],
            JointMoments: h[JointMomentsKey] is JsonObject moments ? ReadJointMoments(moments) : null,
            Sliced: h[SlicedKey] is JsonObject sliced ? ReadSliced(sliced) : null);
    }

    private const string SlicedKey = "joint_sliced";

    private static JsonArray Jagged(IEnumerable<double[]> rows) => new(rows.Select(r => (JsonNode)Numbers(r)).ToArray());

    /// <summary>
    /// The joint block's sliced grid and the reference's histograms on it (format 7 on, only for a block with a sliced
    /// check): features, directions [k·d + j], the standardisation, per projection its edges, packed cells and their Σw²
    /// (<see cref="SlicedHistograms"/>), each group's packed cells, the projected mean and standard deviation, and the
    /// rows taken and skipped.
    /// </summary>
    private static JsonObject SlicedEntry(ReferenceSliced s) => new()
    {
        ["features"] = new JsonArray(s.Grid.Features.Select(f => (JsonNode)JsonValue.Create(f)!).ToArray()),
        ["projections"] = s.Grid.Projections,
        ["groups"] = s.Histograms.Groups,
        ["directions"] = Numbers(s.Grid.Directions),
        ["means"] = Numbers(s.Grid.Means),
        ["standard_deviations"] = Numbers(s.Grid.StandardDeviations),
        ["edges"] = Jagged(s.Grid.Edges),
        ["cells"] = Jagged(s.Histograms.Cells),
        ["squares"] = Jagged(s.Histograms.Squares),
        ["group_cells"] = new JsonArray(s.Histograms.GroupCells.Select(g => (JsonNode)Jagged(g)).ToArray()),
        ["projected_means"] = Numbers(s.Histograms.Mean),
        ["projected_standard_deviations"] = Numbers(s.Histograms.StandardDeviation),
        ["rows"] = s.Histograms.Rows,
        ["skipped"] = s.Histograms.Skipped,
    };

    /// <summary>Reads what <see cref="SlicedEntry"/> wrote; numbers that do not fit each other are damage.</summary>
    private static ReferenceSliced ReadSliced(JsonObject s)
    {
        static double[] Read(JsonNode? n) => NumberList(n);
        static double[][] ReadJagged(JsonNode? n) => n!.AsArray().Select(Read).ToArray();
        var features = s["features"]!.AsArray().Select(f => (string)f!).ToList();
        var k = (int)s["projections"]!;
        var groups = (int)s["groups"]!;
        var grid = new SlicedGrid(features, Read(s["directions"]), Read(s["means"]), Read(s["standard_deviations"]), ReadJagged(s["edges"]));
        var cells = ReadJagged(s["cells"]);
        var squares = ReadJagged(s["squares"]);
        var groupCells = s["group_cells"]!.AsArray().Select(ReadJagged).ToArray();
        var mean = Read(s["projected_means"]);
        var sd = Read(s["projected_standard_deviations"]);
        var d = features.Count;
        if (k < 1 || groups < 2 || grid.Directions.Length != k * d || grid.Means.Length != d || grid.StandardDeviations.Length != d || grid.Edges.Length != k
            || cells.Length != k || squares.Length != k || groupCells.Length != k || mean.Length != k || sd.Length != k)
            throw new FormatException($"the sliced histograms do not fit {k} projections of {d} features");
        for (var p = 0; p < k; p++)
        {
            var length = grid.Edges[p].Length + 3; // below moment, the cells with both flows, above moment
            if (cells[p].Length != length || squares[p].Length != length || groupCells[p].Length != groups || groupCells[p].Any(g => g.Length != length))
                throw new FormatException($"projection {p}'s sliced cells do not fit its {grid.Edges[p].Length} edges");
        }
        // Built once here so that damage (edges not increasing, a spread not positive) is found on reading.
        _ = grid.Projection();
        foreach (var e in grid.Edges) _ = new SlicedCellLookup(e);
        var histograms = new SlicedHistograms(grid.Directions, grid.Edges, cells, squares, groupCells, mean, sd, (long)s["rows"]!, (long)s["skipped"]!);
        return new ReferenceSliced(grid, histograms);
    }

    /// <summary>
    /// A list of numbers, read from the node's JSON text with a forward-only reader: the sliced histograms hold about
    /// half a million numbers, and a node per number (JsonNode's indexer) took most of the time a check spent reading
    /// the reference. The same text gives the same doubles either way (both parse it to the nearest double).
    /// </summary>
    private static double[] NumberList(JsonNode? node)
    {
        if (node is not JsonArray array) throw new FormatException("a list of numbers is missing");
        var text = new System.Buffers.ArrayBufferWriter<byte>();
        using (var writer = new Utf8JsonWriter(text)) array.WriteTo(writer);
        var reader = new Utf8JsonReader(text.WrittenSpan);
        reader.Read(); // the list's start
        var values = new List<double>();
        while (reader.Read() && reader.TokenType != JsonTokenType.EndArray)
        {
            if (reader.TokenType != JsonTokenType.Number) throw new FormatException($"a list of numbers holds a {reader.TokenType}");
            values.Add(reader.GetDouble());
        }
        return values.ToArray();
    }

    private const string JointMomentsKey = "joint_moments";

    private static JsonArray Numbers(IEnumerable<double> values) => new(values.Select(v => (JsonNode)JsonValue.Create(v)!).ToArray());

    /// <summary>
    /// The joint block's streamed state (format 6 on): its features, the standardisation (means, standard deviations),
    /// rows taken in and skipped, the blocked moments and each block's kernel sums (null when not gathered).
    /// </summary>
    private static JsonObject JointMomentsEntry(ReferenceJointMoments m) => new()
    {
        ["features"] = new JsonArray(m.Features.Select(f => (JsonNode)JsonValue.Create(f)!).ToArray()),
        ["means"] = Numbers(m.Standardisation.Means),
        ["standard_deviations"] = Numbers(m.Standardisation.StandardDeviations),
        ["blocks"] = JointMoments.Blocks,
        ["rows"] = m.State.Rows,
        ["skipped"] = m.State.Skipped,
        ["moments"] = m.State.Moments is { } s ? Numbers(s) : null,
        ["kernel_sums"] = m.State.Kernel is { } k ? new JsonArray(k.Select(b => (JsonNode)Numbers(b)).ToArray()) : null,
    };

    /// <summary>Reads what <see cref="JointMomentsEntry"/> wrote; numbers that do not fit the features are damage.</summary>
    private static ReferenceJointMoments ReadJointMoments(JsonObject m)
    {
        static double[] Read(JsonNode? n) => n!.AsArray().Select(v => (double)v!).ToArray();
        var features = m["features"]!.AsArray().Select(f => (string)f!).ToList();
        var means = Read(m["means"]);
        var sds = Read(m["standard_deviations"]);
        if (means.Length != features.Count || sds.Length != features.Count || (int)m["blocks"]! != JointMoments.Blocks)
            throw new FormatException($"the joint moments' standardisation or blocks do not fit its {features.Count} features");
        var state = new JointMomentsState((long)m["rows"]!, (long)m["skipped"]!,
            m["moments"] is JsonArray s ? Read(s) : null,
            m["kernel_sums"] is JsonArray k ? k.Select(b => (IReadOnlyList<double>)Read(b)).ToList() : null);
        // Restored once here so that damage is found on reading, not when a check runs.
        AccumulatedJointMoments.From(features.Count, state);
        return new ReferenceJointMoments(features, new JointStandardisation(means, sds), state);
    }

    /// <summary>A feature's fine grid in the header: its edges, cells (flows first and last) and the four tail moments.</summary>
    private static JsonObject? FineGridJson(FineGridCells? g) => g is null ? null : new JsonObject
    {
        ["edges"] = Numbers(g.Edges),
        ["sum_w"] = Numbers(g.SumW),
        // Unit weights make every cell's Σw² its Σw: then stored once (null here), which saves a third of the grid.
        ["sum_w2"] = g.SumW2.AsSpan().SequenceEqual(g.SumW) ? null : Numbers(g.SumW2),
        ["below_moment"] = g.BelowMoment, ["below_moment2"] = g.BelowMoment2,
        ["above_moment"] = g.AboveMoment, ["above_moment2"] = g.AboveMoment2,
    };

    private static JsonArray Numbers(double[] values) => new(values.Select(v => (JsonNode)JsonValue.Create(v)!).ToArray());

    private static FineGridCells? FineGridFromJson(string path, string feature, JsonElement g)
    {
        if (g.ValueKind != JsonValueKind.Object) return null;
        // Thousands of numbers per feature: read from the document's elements into an array of their count, not
        // through a node per number, nor through text written again and a growing list.
        static double[] Read(JsonElement a)
        {
            var values = new double[a.GetArrayLength()];
            var i = 0;
            foreach (var v in a.EnumerateArray()) values[i++] = v.GetDouble();
            return values;
        }
        var edges = Read(g.GetProperty("edges"));
        var sumW = Read(g.GetProperty("sum_w"));
        var sumW2 = g.TryGetProperty("sum_w2", out var w2) && w2.ValueKind != JsonValueKind.Null ? Read(w2) : sumW.ToArray();
        if (edges.Length < 2 || sumW.Length != edges.Length + 1 || sumW2.Length != sumW.Length || edges.Zip(edges.Skip(1)).Any(p => !(p.Second > p.First)))
            throw Unreadable(path, $"feature '{feature}' has a fine grid of {edges.Length} edges and {sumW.Length} cells, which do not fit each other");
        return new FineGridCells(edges, sumW, sumW2, g.GetProperty("below_moment").GetDouble(), g.GetProperty("below_moment2").GetDouble(),
            g.GetProperty("above_moment").GetDouble(), g.GetProperty("above_moment2").GetDouble());
    }
}
