using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ranking;
using GateTasks.Engine.Tests.Samples;

namespace GateTasks.Engine.Tests.Ranking;

public sealed class CandidatePatternsTests : IDisposable
{
    private readonly TemporaryFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_glob_is_one_candidate_per_file_a_folder_one_candidate_and_each_file_is_named_once()
    {
        foreach (var name in new[] { "run/epoch-10.parquet", "run/epoch-2.parquet", "run/notes.txt", "shards/a.parquet", "shards/b.parquet" })
            File.WriteAllText(_dir.File(name), "");
        var globbed = Path.Combine(_dir.Path, "run", "epoch-*.parquet");
        var candidates = CandidatePatterns.Expand([globbed, Path.Combine(_dir.Path, "shards"), Path.Combine(_dir.Path, "run", "epoch-2.parquet")]);
        // Ordinal order, as the sample resolver sorts (so epoch-10 before epoch-2); the repeated file is dropped.
        Assert.Equal([_dir.File("run/epoch-10.parquet"), _dir.File("run/epoch-2.parquet"), Path.Combine(_dir.Path, "shards")], candidates);
    }

    [Fact]
    public void A_glob_that_matches_nothing_is_an_input_error_naming_it()
    {
        var pattern = Path.Combine(_dir.Path, "checkpoints", "epoch-*.parquet");
        var e = Assert.Throws<GateInputException>(() => CandidatePatterns.Expand([pattern]));
        Assert.Equal(ErrorCodes.SampleNotFound, e.Code);
        Assert.Contains(pattern, e.Message);
    }

    [Fact]
    public void A_missing_file_is_an_input_error_before_anything_is_checked()
    {
        var e = Assert.Throws<GateInputException>(() => CandidatePatterns.Expand([Path.Combine(_dir.Path, "epoch-1.parquet")]));
        Assert.Equal(ErrorCodes.SampleNotFound, e.Code);
        Assert.Contains("epoch-1.parquet", e.Message);
    }
}
