using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

public sealed class SampleFilesTests : IDisposable
{
    private readonly TemporaryFolder _folder = new();

    public SampleFilesTests()
    {
        foreach (var name in new[] { "run/b.parquet", "run/a.pq", "run/c.csv", "run/notes.txt", "run/x1.parquet", "run/sub/z.parquet", "other/y.csv" })
            File.WriteAllText(_folder.File(name), "");
    }

    public void Dispose() => _folder.Dispose();

    private string[] Expect(params string[] relative) => relative.Select(r => Path.Combine(_folder.Path, r)).ToArray();

    [Fact]
    public void A_glob_follows_links_but_enters_every_real_folder_once()
    {
        if (OperatingSystem.IsWindows()) return; // symbolic links need privileges there
        // store/ holds the files; data is a link to it; inside, 'self' points at its own folder, 'deep/loop' at its
        // parent, 'back' at store through its absolute path: three loops, and a linked folder the walk must enter.
        var store = Path.Combine(_folder.Path, "store");
        Directory.CreateDirectory(Path.Combine(store, "deep"));
        File.WriteAllText(Path.Combine(store, "a.parquet"), "");
        File.WriteAllText(Path.Combine(store, "deep", "b.parquet"), "");
        Directory.CreateSymbolicLink(Path.Combine(_folder.Path, "data"), store);
        Directory.CreateSymbolicLink(Path.Combine(store, "self"), ".");
        Directory.CreateSymbolicLink(Path.Combine(store, "deep", "loop"), "..");
        Directory.CreateSymbolicLink(Path.Combine(store, "back"), store);
        var elsewhere = Path.Combine(_folder.Path, "elsewhere");
        Directory.CreateDirectory(elsewhere);
        File.WriteAllText(Path.Combine(elsewhere, "c.parquet"), "");
        Directory.CreateSymbolicLink(Path.Combine(store, "linked"), elsewhere);

        var files = SampleFiles.Resolve("data/**/*.parquet", _folder.Path);

        Assert.Equal(Expect("data/a.parquet", "data/deep/b.parquet", "data/linked/c.parquet"), files);
    }

    [Fact]
    public void FolderGivesItsNumpyAndHdf5FilesToo()
    {
        foreach (var name in new[] { "arrays/a.npy", "arrays/b.NPZ", "arrays/c.h5", "arrays/d.hdf5", "arrays/e.npy.txt", "arrays/f.csv" })
            File.WriteAllText(_folder.File(name), "");
        // The extensions docs/contract.md lists for a sample folder.
        Assert.Equal(Expect("arrays/a.npy", "arrays/b.NPZ", "arrays/c.h5", "arrays/d.hdf5", "arrays/f.csv"), SampleFiles.Resolve("arrays", _folder.Path));
    }

    [Fact]
    public void FolderGivesItsSampleFilesSortedNotSubfolders()
    {
        Assert.Equal(Expect("run/a.pq", "run/b.parquet", "run/c.csv", "run/x1.parquet"), SampleFiles.Resolve("run", _folder.Path));
    }

    [Fact]
    public void FilePathIsResolvedAgainstTheBaseDirectory()
    {
        Assert.Equal(Expect("run/c.csv"), SampleFiles.Resolve("run/c.csv", _folder.Path));
        Assert.Equal(Expect("run/c.csv"), SampleFiles.Resolve("../run/c.csv", Path.Combine(_folder.Path, "other")));
    }

    [Theory]
    [InlineData("run/*.parquet", new[] { "run/b.parquet", "run/x1.parquet" })]
    [InlineData("run/**/*.parquet", new[] { "run/b.parquet", "run/sub/z.parquet", "run/x1.parquet" })]
    [InlineData("run/?.p*", new[] { "run/a.pq", "run/b.parquet" })]
    [InlineData("*/*.csv", new[] { "other/y.csv", "run/c.csv" })]
    public void GlobMatchesRelativeToBase(string pattern, string[] expected)
    {
        Assert.Equal(Expect(expected), SampleFiles.Resolve(pattern, _folder.Path));
    }

    [Fact]
    public void AbsoluteGlobIgnoresBase()
    {
        var pattern = Path.Combine(_folder.Path, "run", "*.csv");

        Assert.Equal(Expect("run/c.csv"), SampleFiles.Resolve(pattern, "/nonexistent-base"));
    }

    [Theory]
    [InlineData("run/*.root")]
    [InlineData("absent/*.parquet")]
    [InlineData("absent.parquet")]
    public void NothingMatchingIsNotFoundNamingPatternAndBase(string pattern)
    {
        var error = Assert.Throws<GateInputException>(() => SampleFiles.Resolve(pattern, _folder.Path));

        Assert.Equal(ErrorCodes.SampleNotFound, error.Code);
        Assert.Contains(pattern, error.Message);
        Assert.Contains(_folder.Path, error.Message);
    }

    [Fact]
    public void FolderWithoutSampleFilesIsNotFound()
    {
        Directory.CreateDirectory(Path.Combine(_folder.Path, "empty"));

        var error = Assert.Throws<GateInputException>(() => SampleFiles.Resolve("empty", _folder.Path));

        Assert.Equal(ErrorCodes.SampleNotFound, error.Code);
    }
}
