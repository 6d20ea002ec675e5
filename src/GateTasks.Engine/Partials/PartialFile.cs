using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Partials;

/// <summary>
/// A partial file: what a check gathered from one shard of a sample (or from several, merged), to be merged and
/// decided elsewhere. JSON: the format and version, a fingerprint of what the contract asks to be gathered, the
/// reference's SHA-256, the sample files counted (so no file is counted twice), the SHA-256 of merged inputs, and
/// the accumulation itself with every exact sum as its partials.
/// </summary>
internal static class PartialFile
{
    public const string Format = "gatetasks.partial";
    public const int Version = 1;

    /// <summary>What a partial was filled from: the sample files it counted, and the partials merged into it.</summary>
    internal sealed record Provenance(IReadOnlyList<string> SampleFiles, IReadOnlyList<(string File, string Sha256)> Inputs);

    /// <summary>
    /// SHA-256 of everything that decides what a check gathers: each feature's name and definition, whether its far tails
    /// are counted, the pairs and whether their 2-D cells are, the joint set and its subsample size.
    /// </summary>
    public static string Fingerprint(PrecisionContract contract)
    {
        var b = new StringBuilder();
        foreach (var f in contract.Features)
            b.Append("feature ").Append(f.Name).Append('|').Append(f.Column).Append('|').Append(f.ReferenceRequest)
             .Append(f.Checks.Any(c => c.Kind == CheckKind.FarTail) ? "|far-tail" : "").Append('\n');
        foreach (var p in contract.Pairs) b.Append("pair ").Append(p.Name).Append(p.Chi2 is null ? "" : "|2d").Append('\n');
        if (contract.Joint is { } j) b.Append("joint ").Append(j.Name).Append('|').Append(j.Subsample).Append('\n');
        b.Append("selection ").Append(contract.Selection?.Text ?? "").Append('\n');
        b.Append("weight ").Append(contract.Sample.Weight ?? "").Append('\n');
        return Convert.ToHexString(SHA256.HashData(Encoding.UTF8.GetBytes(b.ToString()))).ToLowerInvariant();
    }

    public static void Write(string path, ContractCheck.CheckSetup setup, SampleAccumulation accumulation, Provenance provenance)
    {
        AtomicFile.Write(path, stream =>
        {
            using var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = false });
            w.WriteStartObject();
            w.WriteString("format", Format);
            w.WriteNumber("version", Version);
            w.WriteString("contract_fingerprint", Fingerprint(setup.Contract));
            w.WriteString("reference_sha256", setup.ReferenceSha256);
            w.WriteStartArray("sample_files");
            foreach (var f in provenance.SampleFiles) w.WriteStringValue(f);
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
            accumulation.WriteState(w);
            w.WriteEndObject();
        });
    }

    /// <summary>Reads a partial filled for this contract and reference (GATE2201 unreadable, GATE2202 made for others).</summary>
    public static (SampleAccumulation Accumulation, Provenance Provenance) Read(string path, ContractCheck.CheckSetup setup)
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
                if (!root.TryGetProperty("format", out var format) || format.GetString() != Format)
                    throw new GateInputException(ErrorCodes.PartialUnreadable, "Not a partial file; partial files are written by 'gatetasks fill' and 'gatetasks merge'.", at);
                if (root.GetProperty("version").GetInt32() != Version)
                    throw new GateInputException(ErrorCodes.PartialUnreadable, $"Partial file version {root.GetProperty("version").GetInt32()}; this GateTasks reads version {Version}.", at);
                if (root.GetProperty("reference_sha256").GetString() != setup.ReferenceSha256)
                    throw new GateInputException(ErrorCodes.PartialMismatch,
                        $"Filled against another reference (sha256 {root.GetProperty("reference_sha256").GetString()?[..12]}…, in use {setup.ReferenceSha256[..12]}…); fill it again.", at);
                if (root.GetProperty("contract_fingerprint").GetString() != Fingerprint(setup.Contract))
                    throw new GateInputException(ErrorCodes.PartialMismatch,
                        "Filled for a contract that gathers other things (features, binning, selection, pairs or joint set differ); fill it again with this contract.", at);
                var accumulation = new SampleAccumulation(setup.Contract, setup.References);
                if (accumulation.ReadState(root.GetProperty("accumulation")) is { } misfit)
                    throw new GateInputException(ErrorCodes.PartialMismatch, $"The partial does not fit this contract: {misfit}.", at);
                var files = root.GetProperty("sample_files").EnumerateArray().Select(e => e.GetString()!).ToList();
                var inputs = root.GetProperty("merged_from").EnumerateArray()
                    .Select(e => (e.GetProperty("file").GetString()!, e.GetProperty("sha256").GetString()!)).ToList();
                return (accumulation, new Provenance(files, inputs));
            }
            catch (Exception e) when (e is KeyNotFoundException or InvalidOperationException or FormatException or ArgumentException or IndexOutOfRangeException)
            {
                throw new GateInputException(ErrorCodes.PartialUnreadable, $"The partial file is damaged ({e.Message}); fill it again.", at);
            }
        }
    }

    /// <summary>
    /// Reads partials and merges them, in the order of their first sample file so that the result does not depend on
    /// the order they are given in; refuses a sample file counted in two of them (GATE2203).
    /// </summary>
    public static (SampleAccumulation Accumulation, Provenance Provenance) ReadMerged(IReadOnlyList<string> paths, ContractCheck.CheckSetup setup)
    {
        if (paths.Count == 0) throw new GateInputException(ErrorCodes.Usage, "No partial files given.");
        var read = paths.Select(p => (Path: p, Part: Read(p, setup))).ToList();
        var seen = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (path, part) in read)
            foreach (var f in part.Provenance.SampleFiles)
                if (!seen.TryAdd(f, path))
                    throw new GateInputException(ErrorCodes.PartialOverlap,
                        $"Sample file {f} is counted in {seen[f]} and in {path}: its events would be counted twice.", new SourceLocation(path));
        var ordered = read.OrderBy(r => r.Part.Provenance.SampleFiles.FirstOrDefault() ?? "", StringComparer.Ordinal).ToList();
        var merged = ordered[0].Part.Accumulation;
        foreach (var r in ordered.Skip(1)) merged.Merge(r.Part.Accumulation);
        var files = ordered.SelectMany(r => r.Part.Provenance.SampleFiles).ToList();
        var inputs = ordered.Select(r => (Path.GetFileName(r.Path), FileDigest.Sha256(r.Path))).ToList();
        return (merged, new Provenance(files, inputs));
    }
}
