using System.IO.Compression;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics.X86;
using System.Text.RegularExpressions;
using GateTasks.Engine.Demo;
using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// The linux-x64 native executable both packages carry. These tests compare the program with itself: the packed
/// native executable, the packed portable tool with the hand-over forced off (GATETASKS_PORTABLE=1), and the portable
/// tool as users start it (which hands over where it can) must give the same console output, JUnit and JSON reports,
/// apart from times and durations.
/// </summary>
[Collection(PackageCollection.Name)]
public class NativeExecutableTests(PackageFeed feed)
{
    [Theory]
    [InlineData("GateTasks", "tools/net8.0/")]
    [InlineData("GateTasks.Cli", "tools/net8.0/any/")]
    public void The_packed_native_executable_is_a_linux_x64_ELF_needing_no_newer_glibc_than_the_hand_over_checks(string id, string folder)
    {
        var bytes = PackedFile(id, folder + "runtimes/linux-x64/native/gatetasks");
        // System V ABI, ELF header (Tool Interface Standard ELF 1.2, "e_ident", "e_machine"): magic 7F 'E' 'L' 'F',
        // ELFCLASS64 = 2, ELFDATA2LSB = 1; e_type ET_EXEC = 2 or ET_DYN = 3 at offset 16; e_machine EM_X86_64 = 62
        // (System V AMD64 psABI) at offset 18.
        Assert.Equal(new byte[] { 0x7F, (byte)'E', (byte)'L', (byte)'F', 2, 1 }, bytes[..6]);
        Assert.Contains(BitConverter.ToUInt16(bytes, 16), new ushort[] { 2, 3 });
        Assert.Equal(62, BitConverter.ToUInt16(bytes, 18));
        // The glibc symbol versions it was linked against are named GLIBC_major.minor in its dynamic string table;
        // the newest must not exceed what NativeExecutable checks before running it (else an older glibc would start
        // it and fail to link it, with no fall-back).
        var versions = Regex.Matches(System.Text.Encoding.Latin1.GetString(bytes), @"GLIBC_(\d+)\.(\d+)")
            .Select(m => new Version(int.Parse(m.Groups[1].Value), int.Parse(m.Groups[2].Value))).ToList();
        Assert.NotEmpty(versions);
        var source = File.ReadAllText(Path.Combine(RepositoryRoot.Path, "src", "GateTasks.Cli", "NativeExecutable.cs"));
        var needed = Regex.Match(source, @"GlibcNeeded = new\((\d+), (\d+)\)");
        Assert.True(needed.Success, "NativeExecutable.cs names no GlibcNeeded");
        Assert.True(versions.Max() <= new Version(int.Parse(needed.Groups[1].Value), int.Parse(needed.Groups[2].Value)),
            $"the executable needs glibc {versions.Max()}, NativeExecutable.GlibcNeeded says {needed.Groups[1].Value}.{needed.Groups[2].Value}");
    }

    [NativeMachineTheory]
    [InlineData("GateTasks", "tools/net8.0/")]
    [InlineData("GateTasks.Cli", "tools/net8.0/any/")]
    public void The_native_executable_the_forced_portable_tool_and_the_handed_over_tool_give_the_same_results(string id, string folder)
    {
        var dir = Directory.CreateTempSubdirectory("gatetasks-native-").FullName;
        try
        {
            using (var zip = ZipFile.OpenRead(Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg")))
                foreach (var entry in zip.Entries.Where(e => e.FullName.StartsWith(folder, StringComparison.Ordinal) && e.Name != ""))
                {
                    var target = Path.Combine(dir, "tool", entry.FullName[folder.Length..]);
                    Directory.CreateDirectory(Path.GetDirectoryName(target)!);
                    entry.ExtractToFile(target);
                }
            var native = Path.Combine(dir, "tool", "runtimes", "linux-x64", "native", "gatetasks");
            // A zip entry carries no mode; NuGet's own extraction gives the owner execute permission.
            if (OperatingSystem.IsLinux()) File.SetUnixFileMode(native, File.GetUnixFileMode(native) | UnixFileMode.UserExecute);
            var dll = Path.Combine(dir, "tool", "gatetasks.dll");
            var demo = new DemoRun(feed.Demo);
            foreach (var (sample, exit) in new[] { (demo.FaithfulPath, 0), (demo.DriftedPath, 1) })
            {
                var nativeRun = Check(native, [], sample, Path.Combine(dir, "native"), null, exit);
                var portable = Check("dotnet", [dll], sample, Path.Combine(dir, "portable"), "1", exit);
                var handedOver = Check("dotnet", [dll], sample, Path.Combine(dir, "handed-over"), "", exit);
                Assert.Equal(portable, nativeRun);
                Assert.Equal(portable, handedOver);
            }
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }

    /// <summary>Console output, JUnit and JSON of one check, with times, durations and the report folder replaced.</summary>
    private string[] Check(string program, string[] first, string sample, string reports, string? portable, int expectedExit)
    {
        Directory.CreateDirectory(reports);
        var junit = Path.Combine(reports, "r.junit.xml");
        var json = Path.Combine(reports, "r.json");
        var environment = new Dictionary<string, string>(feed.Environment) { ["GATETASKS_PORTABLE"] = portable ?? "" };
        var (exit, stdout, stderr) = ProcessRunner.Run(program,
            [.. first, "check", "--contract", Path.Combine(feed.Demo, DemoContract.FileName), "--sample", sample, "--junit", junit, "--json", json],
            feed.Demo, environment);
        Assert.True(exit == expectedExit, $"{program} exited {exit}:\n{stdout}{stderr}");
        return [Normalise(stdout, reports), Normalise(stderr, reports), Normalise(File.ReadAllText(junit), reports), Normalise(File.ReadAllText(json), reports)];
    }

    private static string Normalise(string text, string reports)
    {
        text = text.Replace(reports, "REPORTS", StringComparison.Ordinal);
        text = Regex.Replace(text, @"\b(time|timestamp)=""[^""]*""", "$1=\"\"");
        text = Regex.Replace(text, @"""(started_utc|elapsed_seconds)"": [^,\n]*", "\"$1\": ?");
        text = Regex.Replace(text, @"\d{4}-\d\d-\d\d[T ]\d\d:\d\d:\d\d(\.\d+)?(Z| UTC)?", "WHEN");
        return Regex.Replace(text, @"\bin \d+(\.\d+)? s\b", "in ? s");
    }

    private byte[] PackedFile(string id, string name)
    {
        using var zip = ZipFile.OpenRead(Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg"));
        var entry = zip.GetEntry(name);
        Assert.True(entry is not null, $"{name} is not in {id}");
        using var copy = new MemoryStream();
        using (var stream = entry.Open()) stream.CopyTo(copy);
        return copy.ToArray();
    }
}

/// <summary>
/// A theory that runs the native executable: needs Linux on x64 with the instruction sets of its compile (x86-64-v3).
/// Skipped elsewhere, unless GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs and fails loudly.
/// </summary>
public sealed class NativeMachineTheoryAttribute : TheoryAttribute
{
    public NativeMachineTheoryAttribute()
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!OperatingSystem.IsLinux() || RuntimeInformation.ProcessArchitecture != Architecture.X64
            || !(Avx2.IsSupported && Bmi1.IsSupported && Bmi2.IsSupported && Fma.IsSupported && Lzcnt.IsSupported))
            Skip = "needs Linux on x64 with AVX2, BMI1/2, FMA and LZCNT (x86-64-v3)";
    }
}
