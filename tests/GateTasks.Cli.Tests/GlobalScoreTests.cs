using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The global score (the joint block's Fréchet distance ± its jackknife error) through the command line: its value
/// on the fixed joint data set against numpy and scipy, the same number whichever check the joint block states, "no
/// global score" without a joint block, never a verdict; and `rank` ordering candidates of equal counts by it, with
/// the score in every output and its plot.
/// </summary>
public sealed partial class GlobalScoreTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-global-score-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private const string FixtureContract = """
        contract-version: 1
        sample: { path: sample.csv, weight: w }
        reference: reference.parquet
        features:
          - name: a
            checks: { ks-max: 0.5 }
          - name: b
            checks: { ks-max: 0.5 }
          - name: c
            checks: { ks-max: 0.5 }
        """;

    /// <summary>The fixed data set of tests/fixtures/joint, under <paramref name="joint"/> (a joint block, or ""), with its reference built.</summary>
    private string FixtureSetup(string joint)
    {
        var folder = Path.Combine(_dir, "f" + Directory.GetDirectories(_dir).Length);
        Directory.CreateDirectory(folder);
        return JointTestData.FixedDataSet(folder, FixtureContract + "\n" + joint + "\n");
    }

    private sealed record Checked(int Code, string Stdout, string Stderr, Dictionary<string, string> Properties, string Markdown, string Html);

    private static Checked Check(string contractPath)
    {
        var folder = Path.GetDirectoryName(contractPath)!;
        var (junit, markdown, html) = (Path.Combine(folder, "gate.xml"), Path.Combine(folder, "gate.md"), Path.Combine(folder, "gate.html"));
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", junit, "--markdown", markdown, "--html", html);
        var properties = XDocument.Load(junit).Descendants("testsuite").Single().Element("properties")!.Elements("property")
            .ToDictionary(p => p.Attribute("name")!.Value, p => p.Attribute("value")!.Value);
        return new Checked(code, stdout, stderr, properties, File.ReadAllText(markdown), File.ReadAllText(html));
    }

    private static double Number(string s) => double.Parse(s, CultureInfo.InvariantCulture);

    [Fact]
    public void Check_reports_the_joint_blocks_frechet_distance_as_the_global_score_in_every_output()
    {
        var run = Check(FixtureSetup("""
            joint:
              features: [a, b, c]
              frechet-max: 0.05
              kernel-distance-max: 0.2
            """));
        // The joint checks pass on this data set (JointDistanceCheckTests): the score adds no verdict and keeps exit 0.
        Assert.True(run.Code == 0, run.Stdout + run.Stderr);
        var fixture = JsonNode.Parse(File.ReadAllText(Path.Combine(RepositoryRoot.Path, "tests", "fixtures", "scipy", "joint_distance.json")))!;
        var expected = Number(fixture["frechet"]!["extrapolated"]!.ToString());
        var expectedError = Number(fixture["frechet"]!["standard_error"]!.ToString());
        // tests/fixtures/scipy/joint_distance.json (make_joint_distance_fixtures.py, numpy 1.24.2, scipy 1.10.1): the
        // 1/N-extrapolated Fréchet distance (scipy.linalg.sqrtm, numpy.polyfit) and its delete-one-block jackknife error.
        var score = Number(run.Properties["gatetasks.global_score"]);
        var error = Number(run.Properties["gatetasks.global_score.standard_error"]);
        Assert.True(Math.Abs(score - expected) <= 1e-9 * Math.Abs(expected), $"{score:R} against {expected:R}");
        Assert.True(Math.Abs(error - expectedError) <= 1e-9 * Math.Abs(expectedError), $"{error:R} against {expectedError:R}");
        Assert.Equal("Fréchet distance of joint(a,b,c)", run.Properties["gatetasks.global_score.measure"]);

        // The console, Markdown and HTML say it with its error, and as no verdict.
        var text = $"global score {Short(score)} ± {Short(error)} (Fréchet distance of joint(a,b,c); lower is closer, not a verdict)";
        Assert.Contains(text, run.Stdout);
        Assert.Contains($"global score {Short(score)} ± {Short(error)}", run.Markdown);
        Assert.Matches("<span id=\"global-score\">" + Regex.Escape(Short(score)) + " ± " + Regex.Escape(Short(error)) + "</span>", System.Net.WebUtility.HtmlDecode(run.Html));
    }

    /// <summary>Four significant digits, as the reports print (InvariantNumber.Short: "G4").</summary>
    private static string Short(double v) => v.ToString("G4", CultureInfo.InvariantCulture);

    [Fact]
    public void The_score_needs_no_frechet_check_and_is_the_same_whichever_check_the_joint_block_states()
    {
        var withBoth = Check(FixtureSetup("""
            joint:
              features: [a, b, c]
              frechet-max: 0.05
              kernel-distance-max: 0.2
            """));
        var kernelOnly = Check(FixtureSetup("""
            joint:
              features: [a, b, c]
              kernel-distance-max: 0.2
            """));
        var slicedOnly = Check(FixtureSetup("""
            joint:
              features: [a, b, c]
              sliced-ks-max: { worst: 0.5 }
            """));
        // The program compared with itself: the reference standardises the joint rows the same way and the moments are
        // the same sums, whichever check reads them, so the score is the same number.
        Assert.True(kernelOnly.Code == 0, kernelOnly.Stdout + kernelOnly.Stderr);
        Assert.Equal(withBoth.Properties["gatetasks.global_score"], kernelOnly.Properties["gatetasks.global_score"]);
        Assert.Equal(withBoth.Properties["gatetasks.global_score.standard_error"], kernelOnly.Properties["gatetasks.global_score.standard_error"]);
        Assert.Equal(withBoth.Properties["gatetasks.global_score"], slicedOnly.Properties["gatetasks.global_score"]);
        // A sliced tolerance far above its floor passes: the score adds no verdict (docs/cli.md, exit 0).
        Assert.True(slicedOnly.Code == 0, slicedOnly.Stdout + slicedOnly.Stderr);
        Assert.Contains("global score ", slicedOnly.Stdout);
    }

    [Fact]
    public void Shards_filled_apart_and_merged_give_the_score_of_one_pass_without_a_frechet_check()
    {
        var contractPath = FixtureSetup("""
            joint:
              features: [a, b, c]
              kernel-distance-max: 0.2
            """);
        var folder = Path.GetDirectoryName(contractPath)!;
        File.WriteAllText(contractPath, File.ReadAllText(contractPath).Replace("path: sample.csv", "path: shard-*.csv", StringComparison.Ordinal));
        var lines = File.ReadAllLines(Path.Combine(folder, "sample.csv"));
        int[] cuts = [1, 1501, 3001, lines.Length];
        for (var k = 0; k < 3; k++)
            File.WriteAllLines(Path.Combine(folder, $"shard-{k}.csv"), lines.Take(1).Concat(lines[cuts[k]..cuts[k + 1]]));
        var whole = Check(contractPath);
        for (var k = 0; k < 3; k++)
        {
            var (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(folder, $"shard-{k}.csv"), "--output", Path.Combine(folder, $"part-{k}.partial"));
            Assert.True(code == 0, stdout + stderr);
        }
        var junit = Path.Combine(folder, "fanned.xml");
        var (exit, output, errors) = Cli.Run("check", "--contract", contractPath, "--partials", Path.Combine(folder, "part-2.partial"), Path.Combine(folder, "part-0.partial"),
            Path.Combine(folder, "part-1.partial"), "--junit", junit);
        Assert.True(exit == whole.Code, output + errors);
        var fanned = XDocument.Load(junit).Descendants("testsuite").Single().Element("properties")!.Elements("property")
            .ToDictionary(p => p.Attribute("name")!.Value, p => p.Attribute("value")!.Value);
        // The program compared with itself: the partials carry the joint block's covariance moments even without
        // frechet-max, merged by the pairwise update, so the score agrees with one pass to rounding (docs/shards.md).
        foreach (var key in new[] { "gatetasks.global_score", "gatetasks.global_score.standard_error" })
        {
            var (a, b) = (Number(whole.Properties[key]), Number(fanned[key]));
            Assert.True(Math.Abs(a - b) <= 1e-12 * Math.Abs(a), $"{key}: {a:R} one pass, {b:R} from partials");
        }
    }

    [Fact]
    public void Without_a_joint_block_there_is_no_global_score_never_a_zero()
    {
        var run = Check(FixtureSetup(""));
        Assert.True(run.Code == 0, run.Stdout + run.Stderr);
        // docs/cli.md: "no global score (no joint block)" in every output, and the JUnit property "none".
        Assert.Contains("no global score (no joint block)", run.Stdout);
        Assert.Contains("no global score (no joint block)", run.Markdown);
        Assert.Contains("no global score (no joint block)", System.Net.WebUtility.HtmlDecode(run.Html));
        Assert.Equal("none", run.Properties["gatetasks.global_score"]);
        Assert.Equal("no joint block", run.Properties["gatetasks.global_score.reason"]);
        Assert.False(run.Properties.ContainsKey("gatetasks.global_score.standard_error"));
    }

    [PythonModulesFact("numpy", "scipy")]
    public void Rank_orders_candidates_of_equal_counts_by_their_frechet_distance_and_plots_it_in_the_order_given()
    {
        // Three surrogates of the correlated pair drawn by numpy (tests/studies/joint_distance_data.py), y permuted
        // among all, half and none of the events: every marginal exact, the correlation 0, about 0.25 and 0.5. Given
        // in that order, as checkpoints that improve with training.
        Directory.CreateDirectory(Path.Combine(_dir, ".git"));
        Directory.CreateDirectory(Path.Combine(_dir, "checkpoints"));
        string[] fractions = ["1", "0.5", "0"];
        for (var k = 0; k < fractions.Length; k++)
        {
            var folder = Path.Combine(_dir, "draw" + k);
            var (exit, pyOut, pyErr) = ProcessRunner.Run(ExternalPython.Interpreter,
                [Path.Combine(RepositoryRoot.Path, "tests", "studies", "joint_distance_data.py"), "--out", folder, "--events", "20000", "--seed", "5",
                 "--surrogate", "partly-permuted", "--fraction", fractions[k]],
                _dir, null, 300);
            Assert.True(exit == 0, pyOut + pyErr);
            File.Copy(Path.Combine(folder, "sample.csv"), Path.Combine(_dir, "checkpoints", $"epoch-{k + 1}.csv"));
            if (k == 0) File.Copy(Path.Combine(folder, "reference.csv"), Path.Combine(_dir, "reference.csv")); // the same draw for every k (seed 5)
        }
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        // Loose marginal tolerances and a loose kernel bound: every candidate passes every check, so only the score separates them.
        File.WriteAllText(contractPath, """
            contract-version: 1
            sample: checkpoints/epoch-3.csv
            reference: reference.parquet
            features:
              - name: x
                checks: { ks-max: 0.5 }
              - name: y
                checks: { ks-max: 0.5 }
              - name: u
                checks: { ks-max: 0.5 }
            joint:
              features: [x, y, u]
              kernel-distance-max: 100
            """);
        var (code, stdout, stderr) = Cli.Run("reference", "build", "--contract", contractPath, "--from", Path.Combine(_dir, "reference.csv"));
        Assert.True(code == 0, stdout + stderr);
        string[] given = ["checkpoints/epoch-1.csv", "checkpoints/epoch-2.csv", "checkpoints/epoch-3.csv"];
        var (json, html, markdown) = (Path.Combine(_dir, "ranking.json"), Path.Combine(_dir, "ranking.html"), Path.Combine(_dir, "ranking.md"));
        (code, stdout, stderr) = GatetasksProcess.Run(["rank", "--contract", contractPath, .. given, "--json", json, "--html", html, "--markdown", markdown], _dir);
        Assert.True(code == 0, stdout + stderr);

        // The plain Fréchet distance between Gaussian fits of the reference-standardised rows, computed apart with
        // numpy 1.24.2 (mean, cov) and scipy 1.10.1 (linalg.sqrtm), Debian bookworm; its order is the expected ranking.
        var (pyCode, pyStdout, pyStderr) = ExternalPython.Run("""
            import sys, numpy as np, scipy.linalg as la
            ref = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1)
            m, s = ref.mean(axis=0), ref.std(axis=0)
            def fit(d):
                z = (d - m) / s
                return z.mean(axis=0), np.cov(z, rowvar=False)
            mr, cr = fit(ref)
            for path in sys.argv[2:]:
                ms, cs = fit(np.loadtxt(path, delimiter=",", skiprows=1))
                root = la.sqrtm(cr @ cs).real
                print(repr(float(((mr - ms) ** 2).sum() + np.trace(cr + cs - 2 * root))))
            """, [Path.Combine(_dir, "reference.csv"), .. given.Select(g => Path.Combine(_dir, g))]);
        Assert.True(pyCode == 0, pyStdout + pyStderr);
        var plain = pyStdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(Number).ToArray();
        var expectedOrder = given.Zip(plain).OrderBy(p => p.Second).Select(p => p.First).ToList();
        Assert.Equal(["checkpoints/epoch-3.csv", "checkpoints/epoch-2.csv", "checkpoints/epoch-1.csv"], expectedOrder);

        var candidates = JsonDocument.Parse(File.ReadAllText(json)).RootElement.GetProperty("candidates").EnumerateArray().ToList();
        Assert.Equal(expectedOrder, candidates.Select(c => c.GetProperty("candidate").GetString()));
        Assert.Equal([1, 2, 3], candidates.Select(c => c.GetProperty("rank").GetInt32()));
        Assert.All(candidates, c => Assert.Equal(0, c.GetProperty("failed").GetInt32()));
        Assert.All(candidates, c => Assert.Equal(0, c.GetProperty("inconclusive").GetInt32()));
        Assert.Equal(["first", "global-score", "global-score"], candidates.Select(c => c.GetProperty("decided_by").GetString()));
        foreach (var c in candidates)
        {
            var score = c.GetProperty("global_score").GetDouble();
            var error = c.GetProperty("global_score_standard_error").GetDouble();
            var index = Array.IndexOf(given, c.GetProperty("candidate").GetString());
            Assert.Equal(index, c.GetProperty("given").GetInt32());
            Assert.True(error > 0, $"{c}");
            // The extrapolated distance removes the plain one's finite-size bias (positive, about d(d+3)/2 · (1/n_ref +
            // 1/n_sample) ≈ 0.0009 here): it is a little below the plain numpy value, within a few errors.
            Assert.True(Math.Abs(score - plain[index]) < 0.002 + 5 * error, $"{score} against numpy {plain[index]} ± {error}");
            // The console shows each score with its error.
            Assert.Contains($"{Short(score)} ± {Short(error)}", stdout);
        }

        // The HTML page holds the plot inline, the Markdown links an SVG file beside it: one point per candidate, in
        // the order given (parsed as XML with System.Xml.Linq; SVG 1.1 namespace).
        XNamespace svg = "http://www.w3.org/2000/svg";
        var page = File.ReadAllText(html);
        var inline = SvgElement().Match(page);
        Assert.True(inline.Success, "no inline SVG in the HTML page");
        var plotFile = Path.Combine(_dir, "ranking.score.svg");
        Assert.Contains("](ranking.score.svg)", File.ReadAllText(markdown));
        var scores = given.Select(g => candidates.Single(c => c.GetProperty("candidate").GetString() == g).GetProperty("global_score").GetDouble()).ToList();
        foreach (var drawing in new[] { XDocument.Parse(inline.Value), XDocument.Load(plotFile) })
        {
            // OxyPlot draws each point as an ellipse and each candidate's label (its file name) as a text under it, at the same x.
            var labels = drawing.Descendants(svg + "text").Select(t => (Text: t.Value, X: TranslateX(t))).Where(t => t.Text.StartsWith("epoch-", StringComparison.Ordinal)).ToList();
            Assert.Equal(["epoch-1.csv", "epoch-2.csv", "epoch-3.csv"], labels.Select(l => l.Text));
            Assert.True(labels[0].X < labels[1].X && labels[1].X < labels[2].X, string.Join(",", labels));
            var points = drawing.Descendants(svg + "ellipse").Select(e => (X: Number(e.Attribute("cx")!.Value), Y: Number(e.Attribute("cy")!.Value))).ToList();
            Assert.Equal(["epoch-1.csv", "epoch-2.csv", "epoch-3.csv"], points.Select(p => labels.Single(l => Math.Abs(l.X - p.X) < 0.01).Text));
            // Higher scores are drawn higher up (SVG's y grows downwards).
            for (var i = 0; i < 3; i++)
                for (var j = 0; j < 3; j++)
                    if (scores[i] > scores[j]) Assert.True(points[i].Y < points[j].Y, $"{string.Join(",", scores)} drawn at {string.Join(",", points)}");
        }
    }

    /// <summary>The x of a text placed by <c>transform="translate(x,y)…"</c>, as OxyPlot's SVG export writes it.</summary>
    private static double TranslateX(XElement text)
    {
        var transform = text.Attribute("transform")?.Value ?? "";
        var open = transform.IndexOf("translate(", StringComparison.Ordinal);
        return open < 0 ? double.NaN : Number(transform[(open + 10)..transform.IndexOf(',', open)]);
    }

    [GeneratedRegex("<svg .*?</svg>", RegexOptions.Singleline)]
    private static partial Regex SvgElement();
}
