using System.Xml.Linq;

namespace GateTasks.Cli.Tests;

public partial class DemoEndToEndTests(DemoFixture demo) : IClassFixture<DemoFixture>
{
    [Fact]
    public void Demo_shows_the_faithful_sample_pass_and_the_drifted_one_fail()
    {
        Assert.True(demo.ExitCode == 0, demo.Stdout + demo.Stderr);
        Assert.Contains("PASSED", demo.Stdout);
        Assert.Contains("FAILED", demo.Stdout);
        Assert.Contains("as it should", demo.Stdout);
        Assert.True(File.Exists(Path.Combine(demo.Folder, "reports", "faithful.junit.xml")));
        Assert.True(File.Exists(Path.Combine(demo.Folder, "reports", "drifted.junit.xml")));
    }

    [Fact]
    public void Check_of_the_faithful_sample_exits_zero()
    {
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract);
        Assert.True(code == 0, stdout + stderr);
        Assert.Contains("PASSED", stdout);
    }

    [Fact]
    public void Check_of_the_drifted_sample_exits_one_with_located_errors_and_a_junit_report()
    {
        var junit = Path.Combine(demo.Folder, "drifted-check.xml");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract,
            "--sample", Path.Combine(demo.Folder, "surrogate-drifted.parquet"), "--junit", junit);
        Assert.True(code == 1, stdout + stderr);
        // Each failure is a compiler-style line pointing at the tolerance in the contract.
        Assert.Matches(@"precision-contract\.yaml\(\d+,\d+\): error GATE300\d: feature 'm_gg' ratio-max\[core\]", stderr);

        var doc = XDocument.Load(junit);
        var suites = doc.Root!;
        Assert.Equal("testsuites", suites.Name.LocalName);
        var failures = doc.Descendants("failure").ToList();
        Assert.NotEmpty(failures);
        Assert.Equal(int.Parse(suites.Attribute("failures")!.Value), failures.Count);
        Assert.Contains(failures, f => f.Parent!.Attribute("classname")!.Value.EndsWith(".m_gg") && f.Parent.Attribute("name")!.Value == "ratio-max[core]");
        Assert.Contains(failures, f => f.Parent!.Attribute("name")!.Value == "ratio-max[tails]");
        // Testcase identities are unique (some consumers keep only the first of duplicates).
        var ids = doc.Descendants("testcase").Select(t => t.Attribute("classname")!.Value + "/" + t.Attribute("name")!.Value).ToList();
        Assert.Equal(ids.Count, ids.Distinct().Count());
    }

    /// <summary>
    /// A standard JUnit consumer reads the report: junitparser 2.8 (Debian's python3-junitparser), an
    /// independent parser used by CI tooling.
    /// </summary>
    [PythonModulesFact("junitparser")]
    public void A_standard_junit_consumer_reads_failures_that_name_feature_and_region()
    {
        var junit = Path.Combine(demo.Folder, "drifted-for-junitparser.xml");
        var (code, _, _) = Cli.Run("check", "--contract", demo.Contract,
            "--sample", Path.Combine(demo.Folder, "surrogate-drifted.parquet"), "--junit", junit);
        Assert.Equal(1, code);
        const string script = """
            import sys
            from junitparser import JUnitXml, Failure
            xml = JUnitXml.fromfile(sys.argv[1])
            for suite in xml:
                for case in suite:
                    for r in case.result:
                        if isinstance(r, Failure):
                            print(f"{case.classname}|{case.name}|{r.type}|{r.message}")
                print(f"SUITE|{suite.name}|{suite.tests}|{suite.failures}")
            """;
        var (exit, stdout, stderr) = ExternalPython.Run(script, [junit]);
        Assert.True(exit == 0, stderr);
        var lines = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        var suite = lines.Single(l => l.StartsWith("SUITE|")).Split('|');
        Assert.Equal("demo-diphoton", suite[1]);
        var failures = lines.Where(l => !l.StartsWith("SUITE|")).Select(l => l.Split('|')).ToList();
        Assert.Equal(int.Parse(suite[3]), failures.Count);
        Assert.Contains(failures, f => f[0] == "demo-diphoton.m_gg" && f[1] == "ratio-max[core]" && f[2] == "GATE3004" && f[3].Contains("core"));
        Assert.Contains(failures, f => f[1] == "ratio-max[tails]" && f[2] == "GATE3005");
    }

    [Fact]
    public void Accept_and_history_record_a_loosened_tolerance_that_check_refused_before()
    {
        // A copy of the demo's accepted state, so the shared demo folder stays as it is.
        var dir = Path.Combine(Path.GetTempPath(), "gatetasks-ledger-cli-" + Guid.NewGuid().ToString("N")[..8]);
        Directory.CreateDirectory(Path.Combine(dir, "reference"));
        foreach (var f in new[] { "precision-contract.yaml", "precision-contract.ledger", "surrogate-faithful.parquet", "reference/fullsim-reference.parquet" })
            File.Copy(Path.Combine(demo.Folder, f), Path.Combine(dir, f));
        try
        {
            var contract = Path.Combine(dir, "precision-contract.yaml");
            Assert.Equal(0, Cli.Run("check", "--contract", contract).ExitCode);
            File.WriteAllText(contract, File.ReadAllText(contract).Replace("    ks-max: 0.01 ", "    ks-max: 0.012 "));
            var (code, stdout, stderr) = Cli.Run("check", "--contract", contract);
            Assert.True(code == 4, stdout + stderr); // checks pass, accepted state not respected
            Assert.Contains("error GATE4003: ks-max of 10 features (m_gg, e_lead, e_sublead, eta_lead, …) changed from 0.01 to 0.012", stderr);
            Assert.Single(stderr.Split('\n'), l => l.Contains("GATE4003")); // one line for the one changed default
            Assert.Contains("NOT ACCEPTED", stdout);

            Assert.Equal(2, Cli.Run("accept", "--contract", contract).ExitCode); // --reason is required
            (code, stdout, stderr) = Cli.Run("accept", "--contract", contract, "--reason", "KS loosened: the fit bins are twice as wide", "--by", "CLI Tester");
            Assert.True(code == 0, stdout + stderr);
            Assert.Contains("accepted as entry 2", stdout);
            Assert.Equal(0, Cli.Run("check", "--contract", contract).ExitCode);

            (code, stdout, _) = Cli.Run("history", "--contract", contract);
            Assert.Equal(0, code);
            Assert.Contains("2 accepted entries, chain intact", stdout);
            Assert.Contains("CLI Tester", stdout);
            Assert.Contains("why: KS loosened: the fit bins are twice as wide", stdout);
            Assert.Contains("loosened  m_gg ks-max: 0.01 → 0.012", stdout);
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void Reference_show_prints_provenance_and_features()
    {
        var (code, stdout, stderr) = Cli.Run("reference", "show", Path.Combine(demo.Folder, "reference", "fullsim-reference.parquet"));
        Assert.True(code == 0, stderr);
        Assert.Contains("fullsim.parquet", stdout);
        Assert.Contains("sha256", stdout);
        Assert.Contains("feature m_gg", stdout);
        Assert.Contains("feature n_jets (column n_jets, discrete)", stdout);
    }

    [Fact]
    public void A_misspelt_key_exits_two_with_location_and_suggestion()
    {
        var broken = Path.Combine(demo.Folder, "broken-contract.yaml");
        File.WriteAllText(broken, File.ReadAllText(demo.Contract).Replace("reference:", "refrence:"));
        var (code, _, stderr) = Cli.Run("check", "--contract", broken);
        Assert.Equal(2, code);
        Assert.Matches(@"broken-contract\.yaml\(\d+,1\): error GATE1003: Unknown key 'refrence'.*did you mean 'reference'", stderr);
        Assert.DoesNotContain("   at ", stderr);
    }

    [Fact]
    public void An_unknown_column_points_at_the_feature_with_a_suggestion()
    {
        var broken = Path.Combine(demo.Folder, "column-contract.yaml");
        File.WriteAllText(broken, File.ReadAllText(demo.Contract).Replace("  - name: pt_gg", "  - name: pt_gg\n    column: pt_g"));
        var (code, _, stderr) = Cli.Run("check", "--contract", broken);
        Assert.Equal(2, code);
        Assert.Matches(@"column-contract\.yaml\(\d+,13\): error GATE1007: .*'pt_g'.*did you mean 'pt_gg'", stderr);
    }
}
