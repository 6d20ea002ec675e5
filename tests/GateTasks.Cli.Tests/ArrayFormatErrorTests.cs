using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Array files GateTasks must refuse, written by NumPy and h5py (tests/fixtures/array-formats/write_bad_samples.py;
/// Debian bookworm: python3-numpy 1.24.2, python3-h5py 3.7.0) and damaged where the case says, each given to the real
/// program as a trusted sample (<c>reference build --from</c>) and as a surrogate sample (<c>check --sample</c>). The
/// expectation is the documented behaviour (docs/error-codes.md): exit code 2, the code, the file and the column or
/// dataset named, no stack trace.
/// </summary>
public sealed class ArrayFormatErrorTests(BadArrayFiles files) : IClassFixture<BadArrayFiles>
{
    private readonly string _dir = files.Folder;

    /// <summary>File, code, and phrases the message must hold (docs/error-codes.md, each code's row).</summary>
    public static TheoryData<string, string, string[]> Cases => new()
    {
        { "flipped.npz", "GATE2002", ["member 'x.npy' fails the CRC-32 checksum"] },
        { "flipped-deflated.npz", "GATE2002", ["member 'x.npy'"] },
        { "header.npy", "GATE2012", ["is not a readable NumPy array", "'descr'"] },
        { "notes.npz", "GATE2012", ["member 'readme.txt'", "not a NumPy array"] },
        { "wide.npy", "GATE2012", ["records are 8000000008 bytes wide"] },
        { "truncated.npy", "GATE2013", ["it is truncated"] },
        { "appended.npy", "GATE2013", ["bytes were appended"] },
        { "truncated.npz", "GATE2013", ["truncated or damaged"] },
        { "truncated.h5", "GATE2013", ["superblock records", "it is truncated"] },
        { "matrix.npy", "GATE2014", ["2-dimensional (shape (500, 2)", "numpy.savez"] },
        { "fortran.npy", "GATE2014", ["2-dimensional (shape (500, 2), stored in Fortran (column-major) order"] },
        { "plain.npy", "GATE2014", ["no field names", "numpy.savez"] },
        { "matrix.h5", "GATE2014", ["column 'x'", "dataset '/x' has shape (500, 2)"] },
        { "matrix.npz", "GATE2014", ["column 'x'", "member 'x.npy'", "2-dimensional"] },
        { "lengths.npz", "GATE2015", ["member 'x.npy' holds 500 rows but member 'w.npy' holds 499"] },
        { "lengths.h5", "GATE2015", ["dataset '/x' holds 500 rows but dataset '/w' holds 499"] },
        { "objects.npy", "GATE2016", ["Python objects", "never loads pickles"] },
        { "zip.npy", "GATE2017", ["named .npy", "ZIP archive"] },
        { "numpy.h5", "GATE2017", ["named .h5", "NumPy array"] },
        { "hdf5.csv", "GATE2017", ["named .csv", "HDF5 file"] },
        { "text.npz", "GATE2017", ["named .npz", "does not start with that format's signature"] },
        { "lzf.h5", "GATE2018", ["column 'x'", "dataset '/x'", "filter 'lzf' (id 32000)"] },
        { "empty.npz", "GATE2019", ["no arrays"] },
        { "empty.h5", "GATE2019", ["no dataset"] },
        { "complex.npy", "GATE2003", ["column 'x'", "complex128 (dtype '<c16')"] },
        { "subarray.npy", "GATE2003", ["column 'x'", "a sub-array of shape (3,) of '<f8'"] },
        { "strings.h5", "GATE2003", ["column 'x'", "dataset '/x' holds a string"] },
        { "bigendian.h5", "GATE2003", ["column 'x'", "float64, big-endian"] },
    };

    [PythonModulesTheory("numpy", "h5py")]
    [MemberData(nameof(Cases))]
    public void A_bad_array_file_is_refused_with_its_code(string file, string code, string[] says)
    {
        files.Write();
        File.WriteAllText(Path.Combine(_dir, $"contract-{file}.yaml"), Contract(file));
        foreach (var run in new[] { new[] { "reference", "build", "--contract", $"contract-{file}.yaml", "--from", file, "--output", $"built-{file}.parquet" },
                                    ["check", "--contract", $"contract-{file}.yaml", "--sample", file] })
        {
            var (exit, stdout, stderr) = GatetasksProcess.Run(run, _dir);
            // docs/error-codes.md: every sample input error exits 2 with its code, at the file, in one line.
            Assert.True(exit == 2, $"{run[0]} {file}: exit {exit}\n{stdout}{stderr}");
            Assert.Contains($"{file}: error {code}:", stderr);
            foreach (var phrase in says) Assert.Contains(phrase, stderr);
            Assert.DoesNotContain("   at ", stderr); // no stack trace
        }
    }

    [PythonModulesFact("numpy", "h5py")]
    public void A_column_missing_from_an_array_file_is_named()
    {
        files.Write();
        File.WriteAllText(Path.Combine(_dir, "contract-missing.yaml"), Contract("missing.h5"));
        var (exit, stdout, stderr) = GatetasksProcess.Run(["check", "--contract", "contract-missing.yaml", "--sample", "missing.h5"], _dir);
        // docs/error-codes.md, GATE1007: a feature reads a column the sample does not have, at the contract's feature.
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("contract-missing.yaml(5,11): error GATE1007: Feature 'x' reads column 'x', which the sample missing.h5 does not have", stderr);
    }

    internal static string Contract(string sample) => $"""
        contract-version: 1
        sample: {"{"} path: {sample}, weight: w {"}"}
        reference: reference.parquet
        features:
          - name: x
            binning: {"{"} bins: 10 {"}"}
            checks: {"{"} ks-max: 0.05 {"}"}
        """;
}

/// <summary>The bad files, written once for the test class, with a reference built from a good CSV file so that 'check' reaches the sample.</summary>
public sealed class BadArrayFiles : IDisposable
{
    private bool _written;

    public string Folder { get; } = Directory.CreateTempSubdirectory("gatetasks-bad-arrays-").FullName;

    public void Write()
    {
        lock (this)
        {
            if (_written) return;
            var script = Path.Combine(RepositoryRoot.Path, "tests", "fixtures", "array-formats", "write_bad_samples.py");
            var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter, [script, Folder], Folder);
            Assert.True(exit == 0, stdout + stderr);
            File.WriteAllText(Path.Combine(Folder, "good.csv"), "x,w\n" + string.Concat(Enumerable.Range(0, 500).Select(i => FormattableString.Invariant($"{(i - 250) / 80.0},1\n"))));
            File.WriteAllText(Path.Combine(Folder, "contract.yaml"), ArrayFormatErrorTests.Contract("good.csv"));
            var built = GatetasksProcess.Run(["reference", "build", "--contract", "contract.yaml", "--from", "good.csv"], Folder);
            Assert.True(built.Exit == 0, built.Stdout + built.Stderr);
            _written = true;
        }
    }

    public void Dispose()
    {
        try { Directory.Delete(Folder, recursive: true); } catch (IOException) { }
    }
}
