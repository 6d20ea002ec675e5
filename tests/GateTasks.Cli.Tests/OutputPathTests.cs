using System.Security.Cryptography;
using System.Xml.Linq;
using GateTasks.Cli.Tests.Corpus;

namespace GateTasks.Cli.Tests;

/// <summary>
/// What the gatetasks program writes and what it opens, run in a process of its own as a build runs it: an output
/// never destroys an input (GATE0004), is never anything but a regular file or a new path (GATE0005), an input is never
/// a pipe or a device (GATE0006), a contract is never huge (GATE0007), an empty path is a usage error (GATE0001), and no
/// report still says PASSED after a run that did not finish. The expectations are the documented behaviour
/// (docs/error-codes.md, docs/cli.md); the scratch folder is the corpus's base (tests/corpus/README.md).
/// </summary>
public sealed class OutputPathTests : IDisposable
{
    private readonly string _dir;

    public OutputPathTests()
    {
        _dir = Directory.CreateTempSubdirectory("gatetasks-paths-").FullName;
        Directory.CreateDirectory(Path.Combine(_dir, ".git")); // the scratch folder is the repository
        CorpusData.Write(_dir);
        File.Copy(Path.Combine(CorpusCase.BaseFolder, "contract.yaml"), Path.Combine(_dir, "contract.yaml"));
        var (exit, stdout, stderr) = Gatetasks("reference", "build", "--contract", "contract.yaml", "--from", "reference.csv");
        Assert.True(exit == 0, stdout + stderr);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    private (int Exit, string Stdout, string Stderr) Gatetasks(params string[] args) => GatetasksProcess.Run(args, _dir, timeoutSeconds: 120);

    // A run that could hang (a pipe opened for reading) must not hold the suite: 30 s is ample for these tiny inputs.
    private (int Exit, string Stdout, string Stderr) GatetasksWithin30s(params string[] args) => GatetasksProcess.Run(args, _dir, timeoutSeconds: 30);

    private string In(string name) => Path.Combine(_dir, name);

    private string Digest(string name) => Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(In(name))));

    private static void AssertRefused((int Exit, string Stdout, string Stderr) run, string code, string says)
    {
        var all = run.Stdout + run.Stderr;
        Assert.True(run.Exit == 2, $"exit {run.Exit}, expected 2\n{all}");
        Assert.Contains($"error {code}:", run.Stderr);
        Assert.Contains(says, run.Stderr);
        Assert.DoesNotContain("internal error", all);
    }

    private void Accept() =>
        Assert.Equal(0, Gatetasks("accept", "--contract", "contract.yaml", "--reason", "first state", "--by", "test").Exit);

    private void Fill(string output) =>
        Assert.Equal(0, Gatetasks("fill", "--contract", "contract.yaml", "--sample", "sample.csv", "--output", output).Exit);

    // ---- An output that is an input of the run is refused, and the input is left as it was. ----

    public static TheoryData<string, string, string[]> OutputsOverInputs() => new()
    {
        { "check --junit over the ledger", "contract.ledger", ["check", "--contract", "contract.yaml", "--junit", "contract.ledger"] },
        { "check --markdown over the contract", "contract.yaml", ["check", "--contract", "contract.yaml", "--markdown", "contract.yaml"] },
        { "check --junit over the sample", "sample.csv", ["check", "--contract", "contract.yaml", "--junit", "sample.csv"] },
        { "check --text over the reference", "reference.parquet", ["check", "--contract", "contract.yaml", "--text", "reference.parquet"] },
        { "check --html over an explicit sample", "other.csv", ["check", "--contract", "contract.yaml", "--sample", "other.csv", "--html", "other.csv"] },
        { "check --junit over a partial it decides from", "a.partial", ["check", "--contract", "contract.yaml", "--partials", "a.partial", "--junit", "a.partial"] },
        { "check --markdown over the contract through a link", "contract.yaml", ["check", "--contract", "contract.yaml", "--markdown", "links/contract.yaml"] },
        { "reference build --output over its own --from", "reference.csv", ["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv", "--output", "reference.csv"] },
        { "reference build --output over the ledger", "contract.ledger", ["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv", "--output", "contract.ledger"] },
        { "fill --output over its sample", "sample.csv", ["fill", "--contract", "contract.yaml", "--sample", "sample.csv", "--output", "sample.csv"] },
        { "fill --output over the reference", "reference.parquet", ["fill", "--contract", "contract.yaml", "--sample", "sample.csv", "--output", "reference.parquet"] },
        { "merge --output over an input partial", "a.partial", ["merge", "--contract", "contract.yaml", "--output", "a.partial", "a.partial", "b.partial"] },
        { "draft --force --output over its --from", "reference.csv", ["draft", "--from", "reference.csv", "--data-events", "1000", "--output", "reference.csv", "--force"] },
        { "plan --markdown over the reference", "reference.parquet", ["plan", "--contract", "contract.yaml", "--replicas", "20", "--markdown", "reference.parquet"] },
        { "calibrate --markdown over the contract", "contract.yaml", ["calibrate", "--contract", "contract.yaml", "--replicas", "1", "--events", "100", "--markdown", "contract.yaml"] },
        { "rank --csv over a candidate", "sample.csv", ["rank", "--contract", "contract.yaml", "sample.csv", "other.csv", "--csv", "sample.csv"] },
        { "rank --json over the ledger", "contract.ledger", ["rank", "--contract", "contract.yaml", "sample.csv", "--json", "contract.ledger"] },
        { "accept into a ledger that is the contract", "ledger-is-contract.yaml", ["accept", "--contract", "ledger-is-contract.yaml", "--reason", "r", "--by", "t"] },
        { "check --json over the contract", "contract.yaml", ["check", "--contract", "contract.yaml", "--json", "contract.yaml"] },
        { "check --json over the sample", "sample.csv", ["check", "--contract", "contract.yaml", "--json", "sample.csv"] },
        { "accept --json over the reference", "reference.parquet", ["accept", "--contract", "contract.yaml", "--reason", "r", "--by", "t", "--json", "reference.parquet"] },
        { "accept --json over the sample", "sample.csv", ["accept", "--contract", "contract.yaml", "--reason", "r", "--by", "t", "--json", "sample.csv"] },
        { "plan --json over the reference", "reference.parquet", ["plan", "--contract", "contract.yaml", "--replicas", "20", "--json", "reference.parquet"] },
        { "rank --json over a candidate", "other.csv", ["rank", "--contract", "contract.yaml", "sample.csv", "other.csv", "--json", "other.csv"] },
    };

    [Theory]
    [MemberData(nameof(OutputsOverInputs))]
    public void An_output_that_names_an_input_is_refused_and_the_input_is_untouched(string about, string input, string[] args)
    {
        Accept(); // a real ledger, so there is one to destroy
        Fill("a.partial");
        Fill("b.partial");
        Directory.CreateSymbolicLink(In("links"), _dir);
        File.WriteAllText(In("ledger-is-contract.yaml"),
            File.ReadAllText(In("contract.yaml")) + "acceptance:\n  ledger: ledger-is-contract.yaml\n");
        var before = Digest(input);

        var run = Gatetasks(args);

        AssertRefused(run, "GATE0004", "writing it would destroy it");
        Assert.True(before == Digest(input), $"{about}: {input} was changed");
    }

    [Fact]
    public void Two_reports_that_name_one_file_are_refused_and_the_file_keeps_no_earlier_verdict()
    {
        File.WriteAllText(In("r.html"), "GateTasks check PASSED (an earlier run)");
        File.CreateSymbolicLink(In("r-link.md"), In("r.html"));

        var run = Gatetasks("check", "--contract", "contract.yaml", "--html", "r.html", "--markdown", "r-link.md");

        AssertRefused(run, "GATE0004", "name the same file");
        // The file is a report path, not an input: it loses the earlier verdict and says why the run stopped; the link stays.
        Assert.Contains("GATE0004", File.ReadAllText(In("r.html")));
        Assert.DoesNotContain("PASSED", File.ReadAllText(In("r.html")));
        Assert.NotNull(new FileInfo(In("r-link.md")).LinkTarget);
    }

    [Fact]
    public void A_hard_link_of_the_sample_as_a_report_is_refused()
    {
        // One file under two names: no path comparison sees it, the device and inode do.
        Assert.Equal(0, ProcessRunnerLn(In("sample.csv"), In("sample-hard.csv")));
        var before = Digest("sample.csv");

        var run = Gatetasks("check", "--contract", "contract.yaml", "--junit", "sample-hard.csv");

        AssertRefused(run, "GATE0004", "hard link");
        Assert.Equal(before, Digest("sample.csv"));
    }

    private static int ProcessRunnerLn(string target, string link) =>
        GateTasks.Tests.Shared.ProcessRunner.Run("ln", [target, link], Path.GetTempPath(), timeoutSeconds: 10).ExitCode;

    [Fact]
    public void The_demo_refuses_a_folder_holding_a_contract_it_did_not_write()
    {
        var folder = In("project");
        Directory.CreateDirectory(folder);
        File.WriteAllText(Path.Combine(folder, "precision-contract.yaml"), "contract-version: 1\n# the analysis's own contract\n");
        File.WriteAllText(Path.Combine(folder, "precision-contract.ledger"), "the analysis's own ledger\n");

        var run = Gatetasks("demo", "--dir", folder);

        AssertRefused(run, "GATE0004", "a contract the demo did not write");
        Assert.Equal("contract-version: 1\n# the analysis's own contract\n", File.ReadAllText(Path.Combine(folder, "precision-contract.yaml")));
        Assert.Equal("the analysis's own ledger\n", File.ReadAllText(Path.Combine(folder, "precision-contract.ledger")));
        Assert.False(File.Exists(Path.Combine(folder, "fullsim.parquet")));
    }

    // ---- Outputs are written only to regular files or new paths. ----

    [Fact]
    public void Accepting_into_a_ledger_that_is_a_named_pipe_is_refused_before_the_check_and_the_pipe_stays()
    {
        Assert.Equal(0, GateTasks.Tests.Shared.ProcessRunner.Run("mkfifo", [In("contract.ledger")], _dir, timeoutSeconds: 10).ExitCode);

        var run = GatetasksWithin30s("accept", "--contract", "contract.yaml", "--reason", "r", "--by", "t");

        AssertRefused(run, "GATE0005", "named pipe");
        Assert.Equal("fifo", Privileged.KindOf(In("contract.ledger")));
    }

    [Fact]
    public void A_report_path_that_is_a_named_pipe_or_a_folder_is_refused_and_stays_what_it_was()
    {
        Assert.Equal(0, GateTasks.Tests.Shared.ProcessRunner.Run("mkfifo", [In("pipe.xml")], _dir, timeoutSeconds: 10).ExitCode);
        Directory.CreateDirectory(In("folder.md"));

        var pipe = GatetasksWithin30s("check", "--contract", "contract.yaml", "--junit", "pipe.xml");
        var folder = GatetasksWithin30s("check", "--contract", "contract.yaml", "--markdown", "folder.md");
        var partial = GatetasksWithin30s("fill", "--contract", "contract.yaml", "--sample", "sample.csv", "--output", "folder.md");

        AssertRefused(pipe, "GATE0005", "named pipe");
        Assert.Equal("fifo", Privileged.KindOf(In("pipe.xml")));
        AssertRefused(folder, "GATE0005", "a directory");
        AssertRefused(partial, "GATE0005", "a directory");
        Assert.True(Directory.Exists(In("folder.md")));
    }

    [PrivilegedFact("mknod")]
    public void A_report_or_reference_path_that_is_a_device_is_refused_and_the_device_stays()
    {
        // Our own node with the null device's numbers, in the scratch folder: never the machine's /dev/null.
        Assert.True(Privileged.MakeNullDevice(In("null")));

        var report = GatetasksWithin30s("check", "--contract", "contract.yaml", "--junit", "null");
        var reference = GatetasksWithin30s("reference", "build", "--contract", "contract.yaml", "--from", "reference.csv", "--output", "null");

        AssertRefused(report, "GATE0005", "a character device");
        AssertRefused(reference, "GATE0005", "a character device");
        Assert.Equal("character special file", Privileged.KindOf(In("null")));
    }

    [Fact]
    public void A_report_path_that_is_a_link_is_written_through_and_the_link_stays()
    {
        Directory.CreateDirectory(In("kept"));
        File.WriteAllText(In("kept/report.xml"), "earlier");
        File.CreateSymbolicLink(In("report.xml"), In("kept/report.xml"));

        var run = Gatetasks("check", "--contract", "contract.yaml", "--junit", "report.xml");

        Assert.True(run.Exit == 0, run.Stdout + run.Stderr);
        Assert.Equal("symbolic link", Privileged.KindOf(In("report.xml")));
        var root = XDocument.Load(In("kept/report.xml")).Root!; // the link's target holds the report
        Assert.Equal("0", root.Attribute("errors")!.Value);
        Assert.Equal("0", root.Attribute("failures")!.Value);
    }

    // ---- Inputs are read only from regular files; a contract is never huge. ----

    public static TheoryData<string, string, string[]> PipesAsInputs() => new()
    {
        { "the contract", "pipe.yaml", ["check", "--contract", "pipe.yaml"] },
        { "the sample", "pipe.csv", ["check", "--contract", "contract.yaml", "--sample", "pipe.csv"] },
        { "a sample matched by a glob", "pipe.csv", ["check", "--contract", "contract.yaml", "--sample", "*.csv"] },
        { "a partial", "pipe.partial", ["check", "--contract", "contract.yaml", "--partials", "pipe.partial"] },
        { "the trusted sample", "pipe.csv", ["reference", "build", "--contract", "contract.yaml", "--from", "pipe.csv", "--output", "new.parquet"] },
        { "the reference", "reference.parquet", ["check", "--contract", "contract.yaml"] },
        { "the ledger", "contract.ledger", ["check", "--contract", "contract.yaml"] },
        { "a reference shown", "pipe.parquet", ["reference", "show", "pipe.parquet"] },
    };

    [Theory]
    [MemberData(nameof(PipesAsInputs))]
    public void A_named_pipe_as_an_input_is_refused_at_once(string about, string pipe, string[] args)
    {
        if (File.Exists(In(pipe))) File.Delete(In(pipe));
        Assert.Equal(0, GateTasks.Tests.Shared.ProcessRunner.Run("mkfifo", [In(pipe)], _dir, timeoutSeconds: 10).ExitCode);

        var run = GatetasksWithin30s(args); // before the refusal, opening the pipe waited for a writer for ever

        AssertRefused(run, "GATE0006", $"'{In(pipe)}' is a named pipe (FIFO)");
        Assert.True(run.Stderr.Contains(In(pipe), StringComparison.Ordinal), $"{about}: the path is not named");
    }

    [Fact]
    public void A_character_device_as_the_contract_is_refused_unread()
    {
        // Only read-refused, never written: /dev/zero is safe to name as an input.
        if (!File.Exists("/dev/zero")) return;
        var run = GatetasksWithin30s("check", "--contract", "/dev/zero");
        AssertRefused(run, "GATE0006", "'/dev/zero' is a character device");
    }

    [Fact]
    public void A_contract_above_one_megabyte_is_refused_unread()
    {
        File.WriteAllText(In("huge.yaml"), File.ReadAllText(In("contract.yaml")) + new string('#', 1 << 20) + "\n");
        var run = GatetasksWithin30s("check", "--contract", "huge.yaml");
        AssertRefused(run, "GATE0007", "at most 1048576 bytes");
        Assert.Contains(In("huge.yaml"), run.Stderr);
    }

    // ---- An empty path is a usage error naming the option. ----

    public static TheoryData<string, string[]> EmptyPaths() => new()
    {
        { "--contract", ["check", "--contract", ""] },
        { "--junit", ["check", "--junit", ""] },
        { "--text", ["check", "--text", " "] },
        { "--html", ["check", "--html", ""] },
        { "--markdown", ["check", "--markdown", ""] },
        { "--sample", ["check", "--sample", ""] },
        { "--partials", ["check", "--partials", ""] },
        { "--sample", ["accept", "--reason", "r", "--by", "t", "--sample", ""] },
        { "--output", ["reference", "build", "--from", "reference.csv", "--output", ""] },
        { "--from", ["reference", "build", "--from", ""] },
        { "file", ["reference", "show", ""] },
        { "--output", ["fill", "--sample", "sample.csv", "--output", ""] },
        { "--sample", ["fill", "--sample", "", "--output", "a.partial"] },
        { "--output", ["merge", "--output", "", "a.partial"] },
        { "partials", ["merge", "--output", "m.partial", ""] },
        { "--from", ["draft", "--from", "", "--data-events", "1000"] },
        { "--output", ["draft", "--from", "reference.csv", "--data-events", "1000", "--output", ""] },
        { "--markdown", ["plan", "--markdown", ""] },
        { "--markdown", ["calibrate", "--markdown", ""] },
        { "--csv", ["rank", "sample.csv", "--csv", ""] },
        { "--json", ["rank", "sample.csv", "--json", ""] },
        { "candidate", ["rank", ""] },
        { "--dir", ["demo", "--dir", ""] },
        { "--contract", ["inputs", "--contract", ""] },
        { "--contract", ["history", "--contract", ""] },
    };

    [Theory]
    [MemberData(nameof(EmptyPaths))]
    public void An_empty_path_is_a_usage_error_naming_the_option(string option, string[] args)
    {
        var run = Gatetasks(args);
        AssertRefused(run, "GATE0001", option);
        Assert.Contains("the path is empty", run.Stderr);
    }

    // ---- No report still says PASSED after a run that did not finish. ----

    private static readonly string PassingJUnit =
        """<testsuites name="gatetasks" tests="1" failures="0" errors="0" skipped="0"><testsuite name="old" tests="1" failures="0" errors="0"><testcase classname="x" name="y" /></testsuite></testsuites>""";

    private static void PlantPassingReports(string folder)
    {
        File.WriteAllText(Path.Combine(folder, "r.xml"), PassingJUnit);
        foreach (var name in new[] { "r.txt", "r.md", "r.html" })
            File.WriteAllText(Path.Combine(folder, name), "GateTasks check PASSED: all 9 checks (an earlier run)");
    }

    /// <summary>Each report is gone, or says the check did not finish (or failed); none says it passed.</summary>
    private static void AssertNoReportPasses(string folder)
    {
        var junit = Path.Combine(folder, "r.xml");
        if (File.Exists(junit))
        {
            var root = XDocument.Load(junit).Root!;
            Assert.True(int.Parse(root.Attribute("errors")!.Value) + int.Parse(root.Attribute("failures")!.Value) > 0, File.ReadAllText(junit));
        }
        foreach (var name in new[] { "r.txt", "r.md", "r.html" })
        {
            var path = Path.Combine(folder, name);
            if (File.Exists(path)) Assert.DoesNotContain("PASSED", File.ReadAllText(path));
        }
        Assert.Empty(Directory.EnumerateFiles(folder, "*.tmp"));
    }

    private string[] ReportOptions(string folder) =>
        ["--junit", Path.Combine(folder, "r.xml"), "--text", Path.Combine(folder, "r.txt"), "--markdown", Path.Combine(folder, "r.md"), "--html", Path.Combine(folder, "r.html")];

    [PrivilegedFact("tmpfs")]
    public void On_a_full_disk_a_run_that_cannot_write_its_reports_leaves_none_that_says_passed()
    {
        var disk = In("disk");
        Directory.CreateDirectory(disk);
        Privileged.MountTmpfs(disk, "64k");
        try
        {
            PlantPassingReports(disk);
            // Fill the disk to the last byte.
            try
            {
                using var filler = new FileStream(Path.Combine(disk, "filler"), FileMode.CreateNew);
                var block = new byte[4096];
                while (true) { filler.Write(block); filler.Flush(); }
            }
            catch (IOException) { }

            // A perfect surrogate: every check would pass, but its reports (the HTML one holds plots) cannot all be written.
            var run = Gatetasks(["check", "--contract", "contract.yaml", .. ReportOptions(disk)]);

            Assert.True(run.Exit == 2, $"exit {run.Exit}\n{run.Stdout}{run.Stderr}");
            Assert.Contains("error GATE0002:", run.Stderr);
            AssertNoReportPasses(disk);
        }
        finally
        {
            Privileged.Unmount(disk);
        }
    }

    [Fact]
    public void A_report_that_cannot_be_written_leaves_no_other_report_that_says_passed()
    {
        PlantPassingReports(_dir);
        File.Delete(In("r.xml")); // the JUnit report goes where it cannot be written
        File.WriteAllText(In("blocker"), "a file where a folder would have to be");

        var run = Gatetasks(["check", "--contract", "contract.yaml", .. ReportOptions(_dir)[2..], "--junit", In("blocker/r.xml")]);

        Assert.True(run.Exit == 2, $"exit {run.Exit}\n{run.Stdout}{run.Stderr}");
        Assert.Contains("error GATE0002:", run.Stderr);
        foreach (var name in new[] { "r.txt", "r.md", "r.html" })
            Assert.Contains("GATE0002", File.ReadAllText(In(name)));
        AssertNoReportPasses(_dir);
    }

    [Fact]
    public void A_refused_input_replaces_every_earlier_report_with_the_error()
    {
        PlantPassingReports(_dir);
        Assert.Equal(0, GateTasks.Tests.Shared.ProcessRunner.Run("mkfifo", [In("pipe.csv")], _dir, timeoutSeconds: 10).ExitCode);

        var run = GatetasksWithin30s(["check", "--contract", "contract.yaml", "--sample", "pipe.csv", .. ReportOptions(_dir)]);

        AssertRefused(run, "GATE0006", "named pipe");
        AssertNoReportPasses(_dir);
        Assert.Equal("GATE0006", XDocument.Load(In("r.xml")).Root!.Descendants("error").Single().Attribute("type")!.Value);
        foreach (var name in new[] { "r.txt", "r.md", "r.html" })
            Assert.Contains("GATE0006", File.ReadAllText(In(name)));
    }

    [Fact]
    public void A_report_refused_as_an_input_leaves_the_input_alone_and_no_other_report_that_says_passed()
    {
        Accept();
        PlantPassingReports(_dir);
        File.Delete(In("r.xml")); // not requested below: the JUnit path is the ledger
        var ledger = Digest("contract.ledger");

        // --junit names the ledger: refused; the other requested reports (planted as PASSED) must not keep that verdict.
        var run = Gatetasks("check", "--contract", "contract.yaml", "--junit", "contract.ledger", "--text", "r.txt", "--markdown", "r.md", "--html", "r.html");

        AssertRefused(run, "GATE0004", "acceptance ledger");
        Assert.Equal(ledger, Digest("contract.ledger"));
        foreach (var name in new[] { "r.txt", "r.md", "r.html" })
            Assert.Contains("GATE0004", File.ReadAllText(In(name)));
        AssertNoReportPasses(_dir);
    }

    // ---- A message quoting a sample's cell is text in every report. ----

    private const string Hostile = "<img src=x onerror=alert(1)>";

    private (int Exit, string Stdout, string Stderr) CheckHostileSample()
    {
        var lines = File.ReadAllLines(In("sample.csv"));
        lines[2] = Hostile + lines[2][lines[2].IndexOf(',', StringComparison.Ordinal)..];
        File.WriteAllLines(In("hostile.csv"), lines);
        return Gatetasks(["check", "--contract", "contract.yaml", "--sample", "hostile.csv", .. ReportOptions(_dir)]);
    }

    [Fact]
    public void Html_from_a_sample_cell_is_escaped_in_the_markdown_html_and_junit_reports()
    {
        var run = CheckHostileSample();

        AssertRefused(run, "GATE2006", Hostile); // the message quotes the cell as it is
        Assert.DoesNotContain("<img", File.ReadAllText(In("r.md")));
        Assert.Contains("&lt;img src=x onerror=alert(1)&gt;", File.ReadAllText(In("r.md")));
        Assert.DoesNotContain("<img", File.ReadAllText(In("r.html")));
        // The JUnit report is XML: the cell is character data, read back as the text it was (System.Xml.Linq).
        var error = XDocument.Load(In("r.xml")).Root!.Descendants("error").Single();
        Assert.Contains(Hostile, error.Attribute("message")!.Value);
        Assert.Empty(error.Elements());
    }

    /// <summary>
    /// Python-Markdown 3.4 (Debian's python3-markdown), an independent renderer, turns the Markdown report into HTML
    /// with no img element: the cell shows as text.
    /// </summary>
    [PythonModulesFact("markdown")]
    public void An_independent_markdown_renderer_shows_the_sample_cell_as_text()
    {
        CheckHostileSample();
        var (exit, html, error) = ExternalPython.Run(
            "import sys, markdown\nprint(markdown.markdown(open(sys.argv[1], encoding='utf-8').read(), extensions=['tables']))",
            [In("r.md")]);
        Assert.True(exit == 0, error);
        Assert.DoesNotContain("<img", html);
        Assert.Contains("&lt;img src=x onerror=alert(1)&gt;", html);
    }
}
