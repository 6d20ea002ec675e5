using System.Globalization;
using System.Text.RegularExpressions;
using GateTasks.Engine.Contracts;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A draft from a large trusted sample must not ask for more than its own reference can resolve. The trusted sample
/// (400 000 events) and a perfect surrogate (10⁶ events, another seed, the same law) are written by numpy, not by
/// GateTasks: a 31-value jet multiplicity (geometric, capped at 30: 12% of events at 0), a reconstructed pT and η, and
/// the generator-level gen_pt and gen_eta they were smeared from. Through the real program: draft for 10⁴ data
/// events leaving gen_* out, build the reference from the trusted sample, plan, and check the surrogate.
/// </summary>
public sealed class DraftReferenceNoiseTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-draft-noise-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    // numpy 1.24.2 (Debian bookworm's python3-numpy): default_rng(seed).geometric(0.12) − 1 capped at 30,
    // 20 + exponential(50) smeared by normal(1, 0.1), normal(0, 1.5) smeared by normal(0, 0.05); written with savetxt.
    private const string Generator = """
        import sys, numpy as np
        seed, n, path = int(sys.argv[1]), int(sys.argv[2]), sys.argv[3]
        rng = np.random.default_rng(seed)
        n_jets = np.minimum(rng.geometric(0.12, n) - 1, 30)
        gen_pt = 20.0 + rng.exponential(50.0, n)
        pt = gen_pt * rng.normal(1.0, 0.1, n)
        gen_eta = rng.normal(0.0, 1.5, n)
        eta = gen_eta + rng.normal(0.0, 0.05, n)
        np.savetxt(path, np.column_stack([n_jets, pt, eta, gen_pt, gen_eta]), fmt=["%d", "%.9g", "%.9g", "%.9g", "%.9g"],
                   delimiter=",", header="n_jets,pt,eta,gen_pt,gen_eta", comments="")
        print(len(np.unique(n_jets)))
        """;

    private string Generate(int seed, int events, string name)
    {
        var path = Path.Combine(_dir, name);
        var (code, stdout, stderr) = ExternalPython.Run(Generator, [seed.ToString(CultureInfo.InvariantCulture), events.ToString(CultureInfo.InvariantCulture), path]);
        Assert.True(code == 0, stderr);
        Assert.Equal("31", stdout.Trim()); // every multiplicity 0–30 occurs (numpy's np.unique on the generated column)
        return path;
    }

    [PythonModulesFact("numpy")]
    public void A_draft_from_a_large_sample_leaves_no_check_a_perfect_surrogate_could_never_pass()
    {
        var trusted = Generate(1, 400_000, "trusted.csv");
        var surrogate = Generate(2, 1_000_000, "surrogate.csv");
        var contract = Path.Combine(_dir, "precision-contract.yaml");

        // Every column drafted (the generator-level ones too: they are features like any other here).
        var (code, stdout, stderr) = Cli.Run("draft", "--from", trusted, "--data-events", "10000",
            "--sample-path", surrogate, "--reference-path", Path.Combine(_dir, "reference.parquet"), "--output", contract);
        Assert.True(code == 0, stdout + stderr);
        var text = File.ReadAllText(contract);
        var loaded = ContractLoader.Load(contract);
        (code, stdout, stderr) = Cli.Run("reference", "build", "--contract", contract, "--from", trusted);
        Assert.True(code == 0, stdout + stderr);

        // The criterion: checked on a perfect surrogate of 10⁶ events, no check fails, and every check either passes
        // or is inconclusive with a finite number of surrogate events that would decide it — none waits for "more
        // reference events", as every ks-max did before tolerances were checked against the reference's noise.
        // The full table (--all-checks): the default console shows only the verdict, binding checks and failures.
        (code, stdout, stderr) = Cli.Run("check", "--contract", contract, "--sample", surrogate, "--all-checks");
        var rows = Regex.Matches(stdout, @"^(\S+) +(\S+-max) +(\S+) [^\n]*? (pass|fail|inconclusive)[ \t]*([^\n]*)$", RegexOptions.Multiline);
        Assert.Equal(loaded.Features.Sum(f => f.Checks.Count), rows.Count);
        foreach (Match row in rows)
        {
            var verdict = row.Groups[4].Value;
            Assert.True(verdict != "fail", $"a perfect surrogate failed {row.Value}\n{stdout}{stderr}");
            if (verdict == "inconclusive")
                Assert.True(Regex.IsMatch(row.Groups[5].Value, @"^≈\d+$"), $"undecidable at any surrogate size: {row.Value}\n{stdout}{stderr}");
        }
        Assert.DoesNotContain("more reference events", stdout + stderr);

        // The plan simulates each check with fresh references drawn from this one (a comparison of the program with
        // itself, by another route than the draft's formulas): no binned check may be reference-limited. Moment checks
        // are left out here: the plan takes their σ and kurtosis from the histogram's bin centres, not from the
        // unbinned moments the check uses, so its verdict on them is not the check's.
        (code, stdout, stderr) = Cli.Run("plan", "--contract", contract, "--replicas", "100");
        Assert.True(code == 0, stdout + stderr);
        var planned = Regex.Matches(stdout, @"^\| (\S+) \| (ks-max|ratio-max\[\w+\]|fraction-max) \| [^|]+ \| ([^|]+) \|", RegexOptions.Multiline);
        Assert.Equal(loaded.Features.Sum(f => f.Checks.Count(c => c.Kind is CheckKind.KolmogorovSmirnov or CheckKind.BinRatio or CheckKind.Fraction)), planned.Count);
        Assert.All(planned, row => Assert.StartsWith("≈", row.Groups[3].Value));

        // docs/drafting.md: the rule's ks-max for 10⁴ data events, 1/3 × 0.5/√10⁴ = 0.0016, is below what the reference
        // resolves, so it is widened and the comment says from what: to √(ln 80/(2·400 000)) + √(ln(2·21/0.05)/(2·400 000))
        // = 0.00234 + 0.00290, rounded up to 0.0053 (hand computation; 21 drafted checks).
        Assert.Contains("ks-max: 0.0053 # widened from 0.0016 (1/3 × 0.5/√10000", text);
        // docs/drafting.md: a whole-number column with at most 100 distinct values is discrete, with no spike.
        var jets = loaded.Features.Single(f => f.Name == "n_jets");
        Assert.Equal(FeatureKind.Discrete, jets.Kind);
        Assert.Null(jets.Spike);
        // docs/cli.md: a name that looks generator-level is flagged, not dropped.
        Assert.Contains("- name: gen_pt # continuous: fractional values; the name looks generator-level ('gen*')", text);

        // docs/cli.md: --exclude leaves matching columns out, and the draft lists them.
        (code, stdout, stderr) = Cli.Run("draft", "--from", trusted, "--data-events", "10000", "--exclude", "gen_*", "--exclude", "e?a",
            "--output", contract, "--force");
        Assert.True(code == 0, stdout + stderr);
        text = File.ReadAllText(contract);
        Assert.Equal(["n_jets", "pt"], ContractLoader.Load(contract).Features.Select(f => f.Name));
        Assert.Contains("#   gen_pt: left out by --exclude 'gen_*'", text);
        Assert.Contains("#   eta: left out by --exclude 'e?a'", text);

        // docs/cli.md: a glob matching no column is refused (GATE0001, exit 2), and the draft is not replaced.
        (code, stdout, stderr) = Cli.Run("draft", "--from", trusted, "--data-events", "10000", "--exclude", "truth_*",
            "--output", contract, "--force");
        Assert.Equal(2, code);
        Assert.Contains("GATE0001", stderr);
        Assert.Contains("--exclude 'truth_*' matches no column", stderr);
        Assert.Equal(text, File.ReadAllText(contract));
    }
}
