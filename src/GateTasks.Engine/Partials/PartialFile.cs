using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Partials;

/// <summary>
/// A partial file: what a check gathered from one shard of a sample (or from several, merged), to be merged and
/// decided elsewhere. JSON: the format and version, a seal, and the sealed content — a fingerprint of what the
/// contract asks to be gathered, the reference's SHA-256, the sample files counted (path and XXH128 of their
/// content, so no shard is counted twice whatever its name), the SHA-256 of merged inputs, and the accumulation itself
/// with every exact sum as its terms.
/// </summary>
/// <remarks>
/// The seal is the SHA-256 of <c>gatetasks.partial\n9\n</c> followed by the content object written compactly (as
/// System.Text.Json writes a parsed element: no white space outside strings). It catches a damaged file or a
/// number edited by hand; it is not a signature (anyone can compute it again), which is why the content is also
/// checked for consistency on reading.
/// </remarks>
internal static class PartialFile
{
    public const string Format = "gatetasks.partial";
    public const int Version = 10; // 4: fine-grid cells of Wasserstein checks; 5: the joint subsample's rows carry their event weights; 6: correlation moments kept per sign of weight; 7: the joint block's streamed moments and kernel sums; 8: its sliced histograms with their grid's digest; 9: the kernel distance's subsample rows in place of its sums; 10: 2-D cells of every correlation pair (the map grid without a χ² test)

    /// <summary>A sample file counted in a partial: its path where it was filled (for messages) and the XXH128 of its bytes (its identity).</summary>
    internal sealed record CountedFile(string Path, string Xxh128);

    /// <summary>What a partial was filled from: the sample files it counted, and the partials merged into it.</summary>
    internal sealed record Provenance(IReadOnlyList<CountedFile> SampleFiles, IReadOnlyList<(string File, string Sha256)> Inputs);

    /// <summary>
    /// SHA-256 of everything that decides what a check gathers: each feature's name and definition, whether its far tails
    /// are counted and whether its fine grid is, the pairs and whether their 2-D cells are, the joint set, its subsample size (with
    /// an energy test), its moments (streamed for every joint block) and whether its kernel sums are.
    /// </summary>
    public static string Fingerprint(PrecisionContract contract)
    {
        var b = new StringBuilder();
        foreach (var f in contract.Features)
            b.Append("feature ").Append(f.Name).Append('|').Append(f.Column).Append('|').Append(f.ReferenceRequest)
             .Append(f.Checks.Any(c => c.Kind == CheckKind.FarTail) ? "|far-tail" : "")
             .Append(f.NeedsFineGrid ? "|fine-grid" : "").Append('\n');
        foreach (var p in contract.Pairs) b.Append("pair ").Append(p.Name).Append(p.Chi2 is null ? "" : "|2d").Append('\n');
        if (contract.Joint is { } j)
            b.Append("joint ").Append(j.Name).Append("|moments").Append(j.KernelDistance is null ? "" : "|kernel-rows:" + j.KernelRows)
             .Append(j.Slices ? "|sliced:" + j.Projections : "").Append('\n');
        b.Append("selection ").Append(contract.Selection?.Text ?? "").Append('\n');
        b.Append("weight ").Append(contract.Sample.Weight ?? "").Append('\n');
        return Convert.ToHexString(SHA256.HashData(Encoding.UTF8.GetBytes(b.ToString()))).ToLowerInvariant();
    }

    /// <summary>The seal of a content object: SHA-256 over the format, the version and the content written compactly.</summary>
    public static string Seal(JsonElement content)
    {
        using var buffer = new MemoryStream();
        var prefix = Encoding.UTF8.GetBytes($"{Format}\n{Version}\n");
        buffer.Write(prefix);
        using (var w = new Utf8JsonWriter(buffer, new JsonWriterOptions { Indented = false }))
            content.WriteTo(w);
        return Convert.ToHexString(SHA256.HashData(buffer.ToArray())).ToLowerInvariant();
    }

    public static void Write(string path, MatchedReference setup, SampleAccumulation accumulation, Provenance provenance)
    {
        // The content is written once to memory (a partial's size depends on the binning, not on the sample), sealed, then
        // written to the file after the seal.
        using var content = new MemoryStream();
        using (var w = new Utf8JsonWriter(content, new JsonWriterOptions { Indented = false }))
        {
            w.WriteStartObject();
            w.WriteString("contract_fingerprint", Fingerprint(setup.Contract));
            w.WriteString("reference_sha256", setup.ReferenceSha256);
            w.WriteStartArray("sample_files");
            foreach (var f in provenance.SampleFiles)
            {
                w.WriteStartObject();
                w.WriteString("path", f.Path);
                w.WriteString("xxh128", f.Xxh128);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("merged_from");
            foreach (var (file, sha) in provenance.Inputs)
            {
                w.WriteStartObject();
                w.WriteString("file", file);
                w.WriteString("sha256", sha);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WritePropertyName("accumulation");
            AccumulationJson.Write(w, accumulation.State());
            w.WriteEndObject();
        }
        using var parsed = JsonDocument.Parse(content.ToArray());
        var seal = Seal(parsed.RootElement);
        AtomicFile.Write(path, stream =>
        {
            using var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = false });
            w.WriteStartObject();
            w.WriteString("format", Format);
            w.WriteNumber("version", Version);
            w.WriteString("seal_sha256", seal);
            w.WritePropertyName("content");
            parsed.RootElement.WriteTo(w);
            w.WriteEndObject();
        });
    }

    /// <summary>A partial read back: what it gathered, what it was filled from, and its seal (equal seals: equal content).</summary>
    internal sealed record ReadPartial(SampleAccumulation Accumulation, Provenance Provenance, string Seal);

    /// <summary>
    /// Reads a partial filled for this contract and reference: GATE2201 unreadable, GATE2205 content that does not match
    /// its seal, GATE2202 made for others, GATE2206 numbers that contradict each other.
    /// </summary>
    public static ReadPartial Read(string path, MatchedReference setup)
    {
        var at = new SourceLocation(path);
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(File.ReadAllBytes(path));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new GateInputException(ErrorCodes.PartialUnreadable, $"Cannot read the partial file: {e.Message}", at);
        }
        catch (JsonException e)
        {
            throw new GateInputException(ErrorCodes.PartialUnreadable, $"Not a partial file (not valid JSON: {e.Message}); partial files are written by 'gatetasks fill' and 'gatetasks merge'.", at);
        }
        using (doc)
        {
            try
            {
                var root = doc.RootElement;
                if (root.ValueKind != JsonValueKind.Object || !root.TryGetProperty("format", out var format) || format.ValueKind != JsonValueKind.String || format.GetString() != Format)
                    throw new GateInputException(ErrorCodes.PartialUnreadable, "Not a partial file; partial files are written by 'gatetasks fill' and 'gatetasks merge'.", at);
                var version = root.GetProperty("version").GetInt32();
                if (version != Version)
                    throw new GateInputException(ErrorCodes.PartialUnreadable,
                        $"Partial file version {version}; this GateTasks reads version {Version} (sealed, with content digests of the sample files, the fourth moments of each correlation pair, the fine-grid cells of each Wasserstein check and the joint subsample's event weights, correlation moments kept per sign of weight, the joint block's streamed moments and kernel sums, its sliced histograms with their grid's digest, the kernel distance's subsample rows in place of the sample's kernel sums, and the 2-D cells of every correlation pair); fill it again.", at);
                var content = root.GetProperty("content");
                var stated = root.GetProperty("seal_sha256").GetString();
                var seal = Seal(content);
                if (stated != seal)
                    throw new GateInputException(ErrorCodes.PartialSealBroken,
                        $"The partial's content does not match its seal (sealed {Short(stated)}, content {Short(seal)}): it was edited or damaged after it was written; fill it again.", at);
                if (content.GetProperty("reference_sha256").GetString() != setup.ReferenceSha256)
                    throw new GateInputException(ErrorCodes.PartialMismatch,
                        $"Filled against another reference (sha256 {Short(content.GetProperty("reference_sha256").GetString())}, in use {Short(setup.ReferenceSha256)}); fill it again.", at);
                if (content.GetProperty("contract_fingerprint").GetString() != Fingerprint(setup.Contract))
                    throw new GateInputException(ErrorCodes.PartialMismatch,
                        "Filled for a contract that gathers other things (features, binning, selection, pairs, joint set or kernel-rows differ); fill it again with this contract.", at);
                var accumulation = new SampleAccumulation(setup.Contract, setup.Layouts, setup.JointStandardisation, setup.SlicedGrid);
                // Sliced cells are added cell by cell: only histograms filled on this reference's grid may be (GATE3026).
                if (AccumulationJson.SlicedGridDigest(content.GetProperty("accumulation")) is { } filledOn && accumulation.SlicedGridDigest is { } expected && filledOn != expected)
                    throw new GateInputException(ErrorCodes.PartialSlicedGridMismatch,
                        $"The partial's sliced histograms were filled on another grid of projections (digest {Short(filledOn)}, this reference's {Short(expected)}); " +
                        "their cells cannot be added to these. Fill it again against this reference.", at);
                if (accumulation.SetState(AccumulationJson.Read(content.GetProperty("accumulation"))) is { } misfit)
                    throw new GateInputException(ErrorCodes.PartialMismatch, $"The partial does not fit this contract: {misfit}.", at);
                if (AccumulationConsistency.Find(setup.Contract, accumulation.Finish()) is { } contradiction)
                    throw new GateInputException(ErrorCodes.PartialInconsistent,
                        $"The partial's numbers contradict each other: {contradiction}. It was edited or damaged; fill it again.", at);
                var files = content.GetProperty("sample_files").EnumerateArray()
                    .Select(e => new CountedFile(e.GetProperty("path").GetString()!, e.GetProperty("xxh128").GetString()!)).ToList();
                if (files.Count == 0)
                    throw new GateInputException(ErrorCodes.PartialInconsistent, "The partial names no sample file it was filled from. It was edited or damaged; fill it again.", at);
                var inputs = content.GetProperty("merged_from").EnumerateArray()
                    .Select(e => (e.GetProperty("file").GetString()!, e.GetProperty("sha256").GetString()!)).ToList();
                return new ReadPartial(accumulation, new Provenance(files, inputs), seal);
            }
            catch (Exception e) when (e is KeyNotFoundException or InvalidOperationException or FormatException or ArgumentException or IndexOutOfRangeException or OverflowException)
            {
                throw new GateInputException(ErrorCodes.PartialUnreadable, $"The partial file is damaged ({e.Message}); fill it again.", at);
            }
        }
    }

    private static string Short(string? digest) => digest is null ? "(none)" : digest.Length > 12 ? digest[..12] + "…" : digest;

    /// <summary>
    /// Reads partials and merges them, in the order of their first sample file's digest so that the result depends
    /// neither on the order they are given in nor on file names; refuses two partials with the same content, and a
    /// sample file (by content) counted twice, in one partial or in two (GATE2203).
    /// </summary>
    public static (SampleAccumulation Accumulation, Provenance Provenance) ReadMerged(IReadOnlyList<string> paths, MatchedReference setup)
    {
        if (paths.Count == 0) throw new GateInputException(ErrorCodes.Usage, "No partial files given.");
        var read = paths.Select(p => (Path: p, Part: Read(p, setup))).ToList();
        var sealedIn = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (path, part) in read)
            if (!sealedIn.TryAdd(part.Seal, path))
                throw new GateInputException(ErrorCodes.PartialOverlap,
                    $"Partial files {sealedIn[part.Seal]} and {path} have the same content: its events would be counted twice.", new SourceLocation(path));
        var seen = new Dictionary<string, (string Partial, string File)>(StringComparer.Ordinal);
        foreach (var (path, part) in read)
            foreach (var f in part.Provenance.SampleFiles)
                if (!seen.TryAdd(f.Xxh128, (path, f.Path)))
                {
                    var (firstPartial, firstFile) = seen[f.Xxh128];
                    var where = firstPartial == path ? $"twice in {path}" : $"in {firstPartial} and in {path}";
                    throw new GateInputException(ErrorCodes.PartialOverlap,
                        $"The same sample content (XXH128 {Short(f.Xxh128)}) is counted {where}, as {firstFile} and as {f.Path}: its events would be counted twice.",
                        new SourceLocation(path));
                }
        var ordered = read.OrderBy(r => r.Part.Provenance.SampleFiles[0].Xxh128, StringComparer.Ordinal).ToList();
        var merged = ordered[0].Part.Accumulation;
        foreach (var r in ordered.Skip(1)) merged.Merge(r.Part.Accumulation);
        var files = ordered.SelectMany(r => r.Part.Provenance.SampleFiles).ToList();
        var inputs = ordered.Select(r => (Path.GetFileName(r.Path), FileDigest.Sha256(r.Path))).ToList();
        return (merged, new Provenance(files, inputs));
    }
}
