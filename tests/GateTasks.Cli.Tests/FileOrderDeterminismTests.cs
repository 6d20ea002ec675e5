using System.Text.RegularExpressions;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The same inputs give the same report content, timestamps and durations aside, whatever the order in which the
/// sample's files were written, listed or named, and whatever the number of threads: files are read, and partial
/// files merged, in one canonical order.
/// </summary>
public sealed class FileOrderDeterminismTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-order-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public void Reports_are_identical_whatever_the_file_order_and_thread_count()
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, DemoContract.Text);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 100_000, 11, 25_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));

        // The same three shards in two folders, written in different orders and with different modification times.
        var shards = Enumerable.Range(0, 3).Select(k => Path.Combine(_dir, $"made-{k}.parquet")).ToArray();
        for (var k = 0; k < 3; k++) DemoSampleWriter.Write(shards[k], DemoScenarioParameters.Drifted, 20_000, 300 + k, 7_000);
        var a = Directory.CreateDirectory(Path.Combine(_dir, "a")).FullName;
        var b = Directory.CreateDirectory(Path.Combine(_dir, "b")).FullName;
        foreach (var k in new[] { 0, 1, 2 }) File.Copy(shards[k], Path.Combine(a, $"shard-{k}.parquet"));
        foreach (var k in new[] { 2, 0, 1 })
        {
            File.Copy(shards[k], Path.Combine(b, $"shard-{k}.parquet"));
            File.SetLastWriteTimeUtc(Path.Combine(b, $"shard-{k}.parquet"), new DateTime(2020, 1, 1 + k, 0, 0, 0, DateTimeKind.Utc));
        }

        var glob = Reports("glob-a", ["--sample", Path.Combine(a, "shard-*.parquet")]);
        Assert.Equal(glob, Reports("folder-b-one-thread", ["--sample", b], oneThread: true));

        // Partial files, one per shard, decided from in two orders and after merging in another.
        var partials = new string[3];
        for (var k = 0; k < 3; k++)
        {
            partials[k] = Path.Combine(_dir, $"part-{k}.partial");
            Assert.Equal(0, Gatetasks(["fill", "--contract", contractPath, "--sample", Path.Combine(a, $"shard-{k}.parquet"), "--output", partials[k]]).Exit);
        }
        var forward = Reports("partials-forward", ["--partials", partials[0], partials[1], partials[2]]);
        Assert.Equal(forward, Reports("partials-backward", ["--partials", partials[2], partials[1], partials[0]], oneThread: true));
        var merged = Path.Combine(_dir, "merged.partial");
        Assert.Equal(0, Gatetasks(["merge", "--contract", contractPath, "--output", merged, partials[1], partials[2], partials[0]]).Exit);
        var mergedOnce = Reports("merged", ["--partials", merged]);
        // The merged file records its inputs, so only the list of partials may differ; every number must not.
        Assert.Equal(Numbers(forward), Numbers(mergedOnce));

        Dictionary<string, string> Reports(string name, string[] source, bool oneThread = false)
        {
            var files = new Dictionary<string, string>
            {
                ["junit"] = Path.Combine(_dir, name + ".xml"), ["text"] = Path.Combine(_dir, name + ".txt"),
                ["markdown"] = Path.Combine(_dir, name + ".md"), ["html"] = Path.Combine(_dir, name + ".html"),
            };
            var (exit, stdout, stderr) = Gatetasks(["check", "--contract", contractPath, .. source, .. files.SelectMany(f => new[] { "--" + f.Key, f.Value })],
                oneThread ? new Dictionary<string, string> { ["DOTNET_PROCESSOR_COUNT"] = "1" } : null);
            Assert.True(exit == 1, stdout + stderr); // the drifted scenario fails some checks
            return files.ToDictionary(f => f.Key, f => Normalise(File.ReadAllText(f.Value), a, b));
        }
    }

    /// <summary>Report text with what may differ between runs of the same inputs replaced: times, durations and the two folders' names.</summary>
    private static string Normalise(string text, string a, string b)
    {
        text = text.Replace(a, "SAMPLES", StringComparison.Ordinal).Replace(b, "SAMPLES", StringComparison.Ordinal);
        text = Regex.Replace(text, @"\b(time|timestamp)=""[^""]*""", "$1=\"\"");
        text = Regex.Replace(text, @"\d{4}-\d\d-\d\d[T ]\d\d:\d\d:\d\d(\.\d+)?(Z| UTC)?", "WHEN");
        return Regex.Replace(text, @"\bin \d+(\.\d+)? s\b", "in ? s");
    }

    /// <summary>The JUnit report's check properties (estimate, interval, verdict…), without the provenance of the sample.</summary>
    private static string Numbers(Dictionary<string, string> reports) =>
        string.Join('\n', System.Xml.Linq.XDocument.Parse(reports["junit"]).Descendants("testcase").Select(t => t.ToString()));

    private static (int Exit, string Stdout, string Stderr) Gatetasks(IEnumerable<string> args, IReadOnlyDictionary<string, string>? environment = null) =>
        GatetasksProcess.Run(args, Path.GetTempPath(), environment);
}
