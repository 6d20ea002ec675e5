using System.Text;
using System.Xml.Linq;
using GateTasks.Engine.References;
using GateTasks.Tests.Shared;
using ParquetSharp;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The same events, written by NumPy and h5py in every array layout GateTasks reads and by ParquetSharp as Parquet,
/// give the same reference and the same check results, to the bit, through the real program. The events and the
/// array files come from tests/fixtures/array-formats/write_samples.py (Debian bookworm: python3-numpy 1.24.2,
/// python3-h5py 3.7.0 over HDF5 1.10.8; the versions are recorded in the script's manifest.json); the Parquet file is
/// written by ParquetSharp (Apache Arrow's C++ writer) from each column's raw little-endian bytes, which NumPy's
/// <c>ndarray.tofile</c> wrote. The comparison is of the program with itself across formats: the outside sources are
/// the writers, which fix what every file holds.
/// </summary>
public sealed class ArrayFormatTests : IDisposable
{
    /// <summary>More events than one batch (65 536 rows), so every reader hands out several; HDF5 chunks (4 096, 3 000 and 2 500 rows) do not line up with batches.</summary>
    private const int Events = 100_000;

    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-arrays-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    internal static readonly string[] ArrayFiles =
        ["events.npy", "events-v2.npy", "events-v3.npy", "columns.npz", "compressed.npz", "table.npz", "table.h5", "columns.h5", "filters.h5", "contiguous.h5"];

    [PythonModulesFact("numpy", "h5py")]
    public void Every_array_layout_gives_the_histograms_of_the_same_events_in_Parquet_to_the_bit()
    {
        WriteSamples(_dir, Events);
        var parquet = Path.Combine(_dir, "events.parquet");
        WriteParquet(Path.Combine(_dir, "raw"), parquet, Events);
        var contract = Path.Combine(_dir, "contract.yaml");
        File.WriteAllText(contract, Contract);

        var fromParquet = Build("events.parquet");
        var expected = Fingerprint(ReferenceFile.Read(fromParquet));
        Assert.Contains($"events {Events}", expected); // every event was read
        File.Copy(fromParquet, Path.Combine(_dir, "reference.parquet")); // the contract's reference, for every check
        var expectedChecks = Check("events.parquet");
        foreach (var file in ArrayFiles)
        {
            // numpy.save / numpy.savez / numpy.savez_compressed and h5py wrote these events; ParquetSharp wrote the same
            // values as Parquet: every histogram cell, count and summary must be the same double.
            Assert.Equal(expected, Fingerprint(ReferenceFile.Read(Build(file))));
            // And a check of the file against the Parquet reference reports the same numbers as a check of the Parquet file.
            Assert.Equal(expectedChecks, Check(file));
        }

        string Build(string sample)
        {
            var output = Path.Combine(_dir, $"reference-{sample}.parquet");
            var (exit, stdout, stderr) = GatetasksProcess.Run(
                ["reference", "build", "--contract", contract, "--from", sample, "--output", output], _dir);
            Assert.True(exit == 0, $"{sample}: exit {exit}\n{stdout}{stderr}");
            return output;
        }

        string Check(string sample)
        {
            var junit = Path.Combine(_dir, $"check-{sample}.xml");
            var (exit, stdout, stderr) = GatetasksProcess.Run(
                ["check", "--contract", contract, "--sample", sample, "--junit", junit], _dir);
            Assert.True(exit is 0 or 1 or 5, $"{sample}: exit {exit}\n{stdout}{stderr}");
            // The check properties (estimate, interval, verdict …) of every test case; the sample's name and the times aside.
            var cases = XDocument.Load(junit).Descendants("testcase").ToList();
            foreach (var c in cases) c.Attribute("time")?.Remove();
            return string.Join('\n', cases.Select(t => t.ToString())).Replace(sample, "SAMPLE", StringComparison.Ordinal);
        }
    }

    [PythonModulesFact("numpy", "h5py")]
    public void Every_array_reader_hands_out_bounded_batches_in_buffers_it_reuses()
    {
        // Memory does not grow with the sample: a reader holds one block of at most 65 536 rows (fewer for wide
        // records) and hands every batch out in the same buffers, whatever the file's length. Checked on the readers
        // themselves (the program's own bound, docs/contract.md), on files NumPy and h5py wrote.
        const int rows = 150_000;
        WriteSamples(_dir, rows);
        foreach (var file in ArrayFiles)
        {
            var path = Path.Combine(_dir, file);
            using (var reader = GateTasks.Engine.Samples.SampleReaderFactory.Open(path))
                Assert.Equal((65_536, 65_536, 18_928), Batches(reader, file));
            // A smaller bound is kept as well.
            using var small = Path.GetExtension(file) switch
            {
                ".npy" => (GateTasks.Engine.Samples.ISampleReader)GateTasks.Engine.Samples.Numpy.NpySampleReader.Open(path, batchRows: 7_000),
                ".npz" => GateTasks.Engine.Samples.Numpy.NpzSampleReader.Open(path, batchRows: 7_000),
                _ => GateTasks.Engine.Samples.Hdf5.Hdf5SampleReader.Open(path, batchRows: 7_000),
            };
            Assert.Equal((7_000, 7_000, 3_000), Batches(small, file));
        }

        static (int First, int Largest, int Last) Batches(GateTasks.Engine.Samples.ISampleReader reader, string file)
        {
            Assert.Equal(rows, reader.RowCount);
            double[]? buffer = null;
            long read = 0;
            var (first, largest, last) = (0, 0, 0);
            foreach (var batch in reader.ReadBatches(["pt", "eta", "w"]))
            {
                buffer ??= batch.ColumnBuffer(0);
                Assert.Same(buffer, batch.ColumnBuffer(0)); // one buffer, reused for every batch
                if (first == 0) first = batch.RowCount;
                largest = Math.Max(largest, batch.RowCount);
                last = batch.RowCount;
                read += batch.RowCount;
            }
            Assert.True(read == rows, $"{file}: {read} rows read");
            Assert.True(buffer!.Length <= largest, $"{file}: a buffer of {buffer.Length} values for batches of {largest} rows");
            return (first, largest, last);
        }
    }

    /// <summary>The contract: every column type of the fixture, signed weights.</summary>
    internal const string Contract = """
        contract-version: 1
        sample: { path: events.parquet, weight: w }
        reference: reference.parquet
        defaults:
          checks:
            ks-max: 0.05
            ratio-max: 0.5
        features:
          - name: pt
            binning: { bins: 25 }
          - name: eta
            binning: { bins: 20 }
          - name: njet
            kind: discrete
          - name: charge
            kind: discrete
          - name: ntrk
            binning: { bins: 16 }
          - name: flag
            kind: discrete
        """;

    /// <summary>Runs write_samples.py into <paramref name="folder"/>.</summary>
    internal static void WriteSamples(string folder, int events)
    {
        var script = Path.Combine(RepositoryRoot.Path, "tests", "fixtures", "array-formats", "write_samples.py");
        var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter, [script, folder, "--events", events.ToString(System.Globalization.CultureInfo.InvariantCulture)], folder);
        Assert.True(exit == 0, stdout + stderr);
    }

    /// <summary>Writes the raw columns as Parquet with ParquetSharp, in their NumPy types (bool as BOOLEAN, int8 as INT(8), uint16 as INT(16, unsigned)).</summary>
    internal static void WriteParquet(string raw, string parquet, int events)
    {
        byte[] Bytes(string name, int size)
        {
            var bytes = File.ReadAllBytes(Path.Combine(raw, name + ".bin"));
            Assert.Equal(events * size, bytes.Length);
            return bytes;
        }
        T[] Values<T>(string name, int size, Func<byte[], int, T> read)
        {
            var bytes = Bytes(name, size);
            return Enumerable.Range(0, events).Select(i => read(bytes, i * size)).ToArray();
        }
        var columns = new Column[]
        {
            new Column<double>("pt"), new Column<float>("eta"), new Column<int>("njet"), new Column<sbyte>("charge"),
            new Column<ushort>("ntrk"), new Column<bool>("flag"), new Column<double>("w"),
        };
        using var properties = new WriterPropertiesBuilder().Compression(Compression.Snappy).Build();
        using var file = new ParquetFileWriter(parquet, columns, properties);
        using (var group = file.AppendRowGroup())
        {
            Write(group, Values("pt", 8, BitConverter.ToDouble));
            Write(group, Values("eta", 4, BitConverter.ToSingle));
            Write(group, Values("njet", 4, BitConverter.ToInt32));
            Write(group, Values("charge", 1, (b, i) => (sbyte)b[i]));
            Write(group, Values("ntrk", 2, BitConverter.ToUInt16));
            Write(group, Values("flag", 1, (b, i) => b[i] != 0));
            Write(group, Values("w", 8, BitConverter.ToDouble));
        }
        file.Close();
    }

    private static void Write<T>(RowGroupWriter group, T[] values)
    {
        using var writer = group.NextColumn().LogicalWriter<T>();
        writer.WriteBatch(values);
    }

    /// <summary>Every number of a reference that comes from the events, each double by its bits; where it came from aside.</summary>
    internal static string Fingerprint(ReferenceHistograms reference)
    {
        static string Bits(double v) => BitConverter.DoubleToInt64Bits(v).ToString("X16", System.Globalization.CultureInfo.InvariantCulture);
        var text = new StringBuilder();
        text.Append($"events {reference.Events} sumw {Bits(reference.SumW)} sumw2 {Bits(reference.SumW2)}\n");
        foreach (var f in reference.Features)
        {
            var h = f.Histogram;
            text.Append($"{f.Name} {f.Kind} {f.BinningRequest} entries {h.Entries} nan {h.NanEntries} {Bits(h.NanSumW)} {Bits(h.NanSumW2)}\n");
            text.Append(" edges ").AppendJoin(' ', h.Axis.Edges.ToArray().Select(Bits)).Append('\n');
            text.Append(" sumw ").AppendJoin(' ', h.SumW.ToArray().Select(Bits)).Append('\n');
            text.Append(" sumw2 ").AppendJoin(' ', h.SumW2.ToArray().Select(Bits)).Append('\n');
            var s = f.Summary;
            text.Append($" summary {s.Count} {Bits(s.SumW)} {Bits(s.SumW2)} {Bits(s.Mean)} {Bits(s.StandardDeviation)} {Bits(s.Min)} {Bits(s.Max)} {s.NanCount} {Bits(s.Kurtosis)}\n");
            text.Append(" quantiles ").AppendJoin(' ', f.Quantiles.Select(q => $"{Bits(q.Probability)}:{Bits(q.Value)}")).Append('\n');
        }
        return text.ToString();
    }
}
