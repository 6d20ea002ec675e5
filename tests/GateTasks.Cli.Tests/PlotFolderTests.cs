using System.Buffers.Binary;
using System.Security.Cryptography;
using System.Text.Json.Nodes;
using System.Xml.Linq;
using GateTasks.Cli.Tests.Corpus;
using GateTasks.Engine.References;

namespace GateTasks.Cli.Tests;

/// <summary>
/// <c>check --plots DIR</c>: one standalone SVG file per feature and per declared pair, named from the contract and
/// safe for file systems, each a well-formed XML document; a folder that is a file (an input of the run included)
/// refused with GATE0018, one that cannot be created with GATE0019; a reference without a pair's 2-D cells gives a
/// note, never a crash; a partial of version 9 (no cells for a pair without a χ² test) refused. The expectations are
/// the documented behaviour (docs/cli.md, docs/reports.md, docs/error-codes.md, docs/shards.md).
/// </summary>
public sealed class PlotFolderTests : IDisposable
{
    private readonly string _dir;

    // Names that need care on a file system: a slash, a colon, two that differ only in case once made safe, and a
    // name Windows reserves for a device.
    private const string Contract = """
        contract-version: 1
        title: plots
        sample: sample.csv
        reference: reference.parquet
        defaults:
          binning: { bins: 30, spacing: quantile }
          checks:
            ks-max: 0.05
        features:
          - name: x/1
            column: x
          - name: X:1
            column: y
          - name: con
            column: n
            kind: discrete
            checks:
              fraction-max: 0.05
        correlations:
          - features: [x/1, X:1]
            pearson-max: 0.05
          - features: [x/1, con]
            pearson-max: 0.05
            chi2-2d-test: on
        """;

    public PlotFolderTests()
    {
        _dir = Directory.CreateTempSubdirectory("gatetasks-plots-").FullName;
        CorpusData.Write(_dir);
        File.WriteAllText(In("contract.yaml"), Contract);
        var (exit, stdout, stderr) = Gatetasks("reference", "build", "--contract", "contract.yaml", "--from", "reference.csv");
        Assert.True(exit == 0, stdout + stderr);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    private (int Exit, string Stdout, string Stderr) Gatetasks(params string[] args) => GatetasksProcess.Run(args, _dir, timeoutSeconds: 120);

    private string In(string name) => Path.Combine(_dir, name);

    private static void AssertFinished((int Exit, string Stdout, string Stderr) run)
    {
        // A finished run: passed, failed, not accepted (no ledger yet) or undecided — never an input error or a crash.
        Assert.True(run.Exit is 0 or 1 or 4 or 5, $"exit {run.Exit}\n{run.Stdout}{run.Stderr}");
        Assert.DoesNotContain("internal error", run.Stdout + run.Stderr);
    }

    private static void AssertRefused((int Exit, string Stdout, string Stderr) run, string code, string says)
    {
        Assert.True(run.Exit == 2, $"exit {run.Exit}, expected 2\n{run.Stdout}{run.Stderr}");
        Assert.Contains($"error {code}:", run.Stderr);
        Assert.Contains(says, run.Stderr);
        Assert.DoesNotContain("internal error", run.Stdout + run.Stderr);
    }

    [Fact]
    public void One_svg_file_per_feature_and_pair_with_safe_names_each_well_formed_xml()
    {
        var run = Gatetasks("check", "--contract", "contract.yaml", "--plots", "plots");
        AssertFinished(run);
        var files = Directory.GetFiles(In("plots")).Select(Path.GetFileName).OrderBy(f => f, StringComparer.Ordinal).ToList();
        // docs/cli.md: unsafe characters become '_', a case-insensitive clash gets "-2", a reserved device name a leading '_';
        // pairs are "first-vs-second".
        Assert.Equal(["X_1-2.svg", "_con.svg", "x_1-vs-X_1.svg", "x_1-vs-_con.svg", "x_1.svg"], files);
        foreach (var file in Directory.GetFiles(In("plots")))
        {
            // System.Xml.Linq parses each file as a standalone XML document whose root is an SVG element.
            var svg = XDocument.Load(file);
            Assert.Equal(XName.Get("svg", "http://www.w3.org/2000/svg"), svg.Root!.Name);
        }
        var map = XDocument.Load(In("plots/x_1-vs-X_1.svg"));
        Assert.Equal(["reference", "surrogate", "pull"], map.Root!.Elements().Select(e => (string?)e.Attribute("data-panel")).ToList());
        Assert.Contains("plots: 5 SVG files in", run.Stdout + run.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Plots_pointing_at_an_input_is_refused_and_the_input_left_as_it_was()
    {
        var before = SHA256.HashData(File.ReadAllBytes(In("sample.csv")));
        AssertRefused(Gatetasks("check", "--contract", "contract.yaml", "--plots", "sample.csv"), "GATE0018", "not a folder");
        Assert.Equal(before, SHA256.HashData(File.ReadAllBytes(In("sample.csv"))));
    }

    [Fact]
    public void Plots_pointing_at_a_file_is_refused_before_the_check_runs()
    {
        File.WriteAllText(In("notes.txt"), "keep me");
        AssertRefused(Gatetasks("check", "--contract", "contract.yaml", "--plots", "notes.txt", "--html", "report.html"), "GATE0018", "is a regular file, not a folder");
        Assert.Equal("keep me", File.ReadAllText(In("notes.txt")));
        // The other report says why the run stopped, with the code (the "did not finish" form).
        Assert.Contains("GATE0018", File.ReadAllText(In("report.html")));
    }

    [Fact]
    public void A_plots_folder_that_cannot_be_created_is_a_coded_error()
    {
        File.WriteAllText(In("notes.txt"), "a file, so no folder can be made under it");
        AssertRefused(Gatetasks("check", "--contract", "contract.yaml", "--plots", Path.Combine("notes.txt", "plots")), "GATE0019", "Cannot create the plots folder");
    }

    [Fact]
    public void A_reference_without_a_pairs_cells_gives_a_note_in_the_report_and_the_pairs_file()
    {
        // A reference as 'reference build' wrote it before every pair kept its 2-D cells: the pearson-only pair has none.
        var reference = ReferenceFile.Read(In("reference.parquet"));
        ReferenceFile.Write(In("reference.parquet"), reference with
        {
            Correlations = reference.Correlations!.Select(c => c.Second == "X:1" ? c with { Cells2DSumW = null, Cells2DSumW2 = null } : c).ToList(),
        });
        var run = Gatetasks("check", "--contract", "contract.yaml", "--plots", "plots", "--html", "report.html");
        AssertFinished(run);
        var html = File.ReadAllText(In("report.html"));
        Assert.Contains("data-pair=\"x/1~X:1\" data-map=\"missing\"", html);
        Assert.Contains("<figure class=\"pairmap\" data-pair=\"x/1~con\">", html);
        var note = XDocument.Load(In("plots/x_1-vs-X_1.svg"));
        Assert.Contains("holds no 2-D cells", note.Root!.Value);
    }

    [Fact]
    public void A_version_9_partial_is_refused_and_must_be_filled_again()
    {
        var (code, stdout, stderr) = Gatetasks("fill", "--contract", "contract.yaml", "--sample", "sample.csv", "--output", "sample.partial");
        Assert.True(code == 0, stdout + stderr);
        // A partial as version 9 wrote it: no 2-D cells for a pair without a χ² test.
        var json = JsonNode.Parse(File.ReadAllText(In("sample.partial")))!.AsObject();
        foreach (var pair in json["content"]!["accumulation"]!["pairs"]!.AsArray())
            if ((string?)pair!["pair"] == "x/1~X:1") { pair.AsObject().Remove("cells_w"); pair.AsObject().Remove("cells_w2"); }
        json["version"] = 9;
        File.WriteAllText(In("sample.partial"), json.ToJsonString());
        (code, stdout, stderr) = Gatetasks("check", "--contract", "contract.yaml", "--partials", "sample.partial");
        // docs/error-codes.md: GATE2201, a partial of another version, filled again.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("error GATE2201", stderr);
        Assert.Contains("Partial file version 9; this GateTasks reads version 10", stderr);
        Assert.Contains("the 2-D cells of every correlation pair", stderr);
    }

    /// <summary>Debian's chromium draws a map file: the screenshot is a PNG of the window's size, not a blank page.</summary>
    [ChromiumFact]
    public void A_headless_browser_draws_a_map_file_that_is_not_blank()
    {
        AssertFinished(Gatetasks("check", "--contract", "contract.yaml", "--plots", "plots"));
        var png = In("map.png");
        var (exit, _, stderr) = HeadlessChromium.Run(In("plots/x_1-vs-_con.svg"), $"--screenshot={png}", "--window-size=1080,330", "--hide-scrollbars");
        Assert.True(exit == 0, stderr);
        var bytes = File.ReadAllBytes(png);
        // PNG (ISO/IEC 15948): 8-byte signature, then IHDR with width and height as big-endian integers.
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, bytes[..8]);
        Assert.Equal(1080, BinaryPrimitives.ReadInt32BigEndian(bytes.AsSpan(16)));
        // A blank 1080×330 page compresses to a few kB; three panels of coloured cells with axes do not.
        Assert.True(bytes.Length > 12_000, $"screenshot of {bytes.Length} bytes looks blank");
    }
}
