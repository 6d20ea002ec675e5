using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>The whole check on small CSV samples: a faithful sample passes, a shifted one fails, bad set-ups are located.</summary>
public sealed class ContractCheckTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-check-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private const string ContractText = """
        contract-version: 1
        title: csv-case
        sample: surrogate.csv
        reference: ref.parquet
        defaults:
          binning: { bins: 10 }
          checks:
            ks-max: 0.03
            wasserstein-max: 0.05
            ratio-max: { core: 0.15, tails: 0.3 }
        features:
          - name: x
        """;

    private string WriteCsv(string name, int rows, int seed, double shift)
    {
        // A Gaussian sample from MathNet's seeded generator; the same seed gives the same rows everywhere.
        var normal = new Normal(0, 1, new Xoshiro256StarStar(seed));
        var path = Path.Combine(_dir, name);
        File.WriteAllLines(path, new[] { "x" }.Concat(Enumerable.Range(0, rows)
            .Select(_ => (normal.Sample() + shift).ToString("R", CultureInfo.InvariantCulture))));
        return path;
    }

    private PrecisionContract Setup(string contractText = ContractText)
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, contractText);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = WriteCsv("fullsim.csv", 40_000, 1, 0);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], null, "test"));
        return contract;
    }

    private void AppendRows(string path, params string[] rows) => File.AppendAllLines(path, rows);

    [Fact]
    public void NaN_and_infinities_in_the_surrogate_stop_the_check_at_the_feature_line_with_their_counts()
    {
        var contract = Setup();
        var sample = WriteCsv("surrogate.csv", 20_000, 2, 0);
        AppendRows(sample, "nan", "inf", "-inf", "inf");

        var error = Assert.Throws<GateInputException>(() => ContractRun.Run(contract));

        Assert.Equal(ErrorCodes.SampleNonFinite, error.Code);
        Assert.Equal(contract.Features[0].Location, error.Location); // the feature's name in the contract
        Assert.Contains("1 NaN, 2 +∞, 1 −∞ among 20004 values", error.Message);
        Assert.Contains("non-finite: allow", error.Message);
    }

    [Theory]
    [InlineData("features:\n  - name: x\n    non-finite: allow")]
    [InlineData("  non-finite: allow\nfeatures:\n  - name: x")]
    public void Allowed_NaN_and_infinities_are_counted_apart_and_the_check_decides_on_the_rest(string allowing)
    {
        var contract = Setup(ContractText.Replace("features:\n  - name: x", allowing));
        Assert.True(contract.Features[0].AllowNonFinite);
        var sample = WriteCsv("surrogate.csv", 20_000, 2, 0);
        AppendRows(sample, "nan", "inf", "-inf");

        var report = ContractRun.Run(contract);

        Assert.True(report.NoCheckFailed(), string.Join("\n", report.Outcomes.Select(o => o.Summary)));
        var summary = report.Comparisons[0].SurrogateSummary;
        Assert.Equal((1, 1, 1), (summary.NanCount, summary.PositiveInfinityCount, summary.NegativeInfinityCount));
        Assert.Equal(20_000, summary.Count);
        var cells = report.Comparisons[0].Surrogate;
        Assert.Equal(1, cells.NanEntries); // NaN apart; ±∞ in the flow cells
        Assert.True(cells.SumW[0] >= 1 && cells.SumW[^1] >= 1);
    }

    [Fact]
    public void A_misspelt_non_finite_setting_names_the_choices()
    {
        var path = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(path, ContractText.Replace("  - name: x", "  - name: x\n    non-finite: alow"));
        var error = Assert.Throws<GateInputException>(() => ContractLoader.Load(path));
        Assert.Equal(ErrorCodes.ContractBadValue, error.Code);
        Assert.Contains("did you mean 'allow'", error.Message);
        Assert.Equal(13, error.Location?.Line);
    }

    [Fact]
    public void Faithful_csv_sample_passes_and_a_shifted_one_fails_in_the_core()
    {
        var contract = Setup();
        WriteCsv("surrogate.csv", 20_000, 2, 0);
        var pass = ContractRun.Run(contract);
        Assert.True(pass.NoCheckFailed(), string.Join("\n", pass.Outcomes.Select(o => o.Summary)));
        Assert.Equal(20_000, pass.Events);
        Assert.Equal(4, pass.Outcomes.Count);

        // A shift of 0.2σ moves about 8% of the probability across the median: far outside 3% KS distance.
        var shifted = WriteCsv("shifted.csv", 20_000, 3, 0.2);
        var fail = ContractRun.Run(contract, shifted);
        Assert.False(fail.NoCheckFailed());
        var ks = fail.Outcomes.Single(o => o.Check.Kind == CheckKind.KolmogorovSmirnov);
        Assert.Equal(Verdict.Fail, ks.Verdict);
        Assert.InRange(ks.Value, 0.05, 0.11); // Φ(0.1) − Φ(−0.1) ≈ 0.0797 (standard normal table), binned and noisy
        Assert.Equal(new SourceLocation(contract.FilePath, 8, 13), ks.Check.Location);
    }

    [Fact]
    public void A_small_faithful_sample_is_inconclusive_and_says_how_many_events_would_decide()
    {
        var contract = Setup();
        var small = WriteCsv("small.csv", 2000, 4, 0);
        var report = ContractRun.Run(contract, small);
        Assert.Equal(0, report.Failures);
        // docs/cli.md: undecided, not failed — no tolerance was shown exceeded (it still fails the build by default).
        Assert.Equal(GateTasks.Engine.Runs.RunOutcome.Undecided, report.ChecksOutcome);
        var undecided = report.Outcomes.Where(o => o.Verdict == Verdict.Inconclusive).ToList();
        Assert.NotEmpty(undecided);
        foreach (var o in undecided)
        {
            // The figure reports show (docs/cli.md, events needed): more than it has, or "more reference events" where a
            // part's estimate sits so near the tolerance that the reference's own error leaves no room on either side
            // (a ratio-max bin estimated just beyond 0.15 with σ_ref ≈ 0.016 of 4 000 reference events per bin).
            Assert.True(o.Needed is { } n && (n.ReferenceLimits || (double.IsFinite(n.Events) && n.Events > 2000)), $"{o.Check.Label}: {o.Needed}");
        }
        // Drawing the number of events it asked for decides the KS check (within a factor for noise).
        var ks = undecided.FirstOrDefault(o => o.Check.Kind == CheckKind.KolmogorovSmirnov);
        if (ks is not null)
        {
            Assert.True(ks.Needed is { ReferenceLimits: false } kn && double.IsFinite(kn.Events) && kn.Events > 2000, $"{ks.Needed}");
            var bigger = WriteCsv("bigger.csv", (int)Math.Min(2 * ks.Needed!.Events, 400_000), 5, 0);
            var again = ContractRun.Run(contract, bigger);
            Assert.Equal(Verdict.Pass, again.Outcomes.Single(o => o.Check.Kind == CheckKind.KolmogorovSmirnov).Verdict);
        }
    }

    [Fact]
    public void Inconclusive_can_be_set_to_warn()
    {
        var contract = Setup(ContractText.Replace("defaults:", "decision: { inconclusive: warn }\ndefaults:"));
        var report = ContractRun.Run(contract, WriteCsv("small.csv", 2000, 4, 0));
        Assert.True(report.Inconclusive > 0);
        Assert.True(report.NoCheckFailed());
    }

    [Fact]
    public void Negative_weights_enter_the_uncertainties_and_never_crash_a_check()
    {
        var contract = Setup(ContractText.Replace("sample: surrogate.csv", "sample: { path: surrogate.csv, weight: w }")
            .Replace("ks-max: 0.03", "ks-max: 0.03\n    jsd-max: 0.01"));
        // Every tenth event carries weight −0.2, as next-to-leading-order generators produce.
        var normal = new Normal(0, 1, new Xoshiro256StarStar(8));
        File.WriteAllLines(Path.Combine(_dir, "surrogate.csv"), new[] { "x,w" }.Concat(Enumerable.Range(0, 20_000)
            .Select(i => string.Create(CultureInfo.InvariantCulture, $"{normal.Sample():R},{(i % 10 == 0 ? -0.2 : 1.0)}"))));
        var report = ContractRun.Run(contract);
        // Kish (1965): n_eff = (Σw)²/Σw² = (18000 − 400)²/(18000 + 80) = 17132.7 (hand-computed).
        Assert.Equal(17132.7, report.EffectiveEvents, 1);
        Assert.All(report.Outcomes.Where(o => o.Check.Kind != CheckKind.JensenShannon), o => Assert.True(double.IsFinite(o.Value), o.Summary));
    }

    [Fact]
    public void A_check_that_cannot_be_computed_is_undecided_with_its_reason_in_every_report()
    {
        // docs/contract.md: an effect that cannot be computed (here a divergence of probabilities over cells with negative
        // sums of weights) is inconclusive with its reason, never a p-value of 0; the other checks are measured.
        var contract = Setup(ContractText.Replace("sample: surrogate.csv", "sample: { path: surrogate.csv, weight: w }")
            .Replace("ks-max: 0.03", "ks-max: 0.03\n    jsd-max: 0.01").Replace("defaults:", "decision: { inconclusive: warn }\ndefaults:"));
        var normal = new Normal(0, 1, new Xoshiro256StarStar(8));
        // Every event beyond ±1.5 carries weight −1: the outer cells hold negative sums.
        File.WriteAllLines(Path.Combine(_dir, "surrogate.csv"), new[] { "x,w" }.Concat(Enumerable.Range(0, 20_000)
            .Select(_ => normal.Sample()).Select(x => string.Create(CultureInfo.InvariantCulture, $"{x:R},{(Math.Abs(x) > 1.5 ? -1.0 : 1.0)}"))));
        var report = ContractRun.Run(contract);
        var jsd = report.Outcomes.Single(o => o.Check.Kind == CheckKind.JensenShannon);
        Assert.True(jsd.Measured.Uncomputable, jsd.Summary);
        Assert.Equal(Verdict.Inconclusive, jsd.Verdict);
        Assert.NotEqual(0, jsd.AdjustedPValue);
        Assert.All(report.Outcomes.Where(o => o.Check.Kind is CheckKind.KolmogorovSmirnov or CheckKind.BinRatio),
            o => Assert.False(o.Measured.Uncomputable, o.Summary));
        const string reason = "cannot be computed:";
        Assert.Contains(reason, GateTasks.Engine.Reports.JUnitReport.Render([report]));
        Assert.Contains(reason, GateTasks.Engine.Reports.HtmlReport.Render(report));
        Assert.Contains(reason, GateTasks.Engine.Reports.MarkdownSummary.Render(report));
        Assert.Contains("not computable", GateTasks.Engine.Reports.ResultTable.Format(report));
        Assert.Contains(GateTasks.Engine.Reports.RunDiagnostics.Of(report), d => d.Text.Contains(reason) && d.Text.Contains("not computable"));
    }

    [Fact]
    public void A_wrong_zero_spike_fraction_fails_the_spike_check_while_the_rest_passes()
    {
        const string spiky = """
            contract-version: 1
            sample: surrogate.csv
            reference: ref.parquet
            features:
              - name: x
                spike: 0
                binning: { bins: 10 }
                checks:
                  fraction-max: 0.01
                  ks-max: 0.03
                  ratio-max: { core: 0.15, tails: 0.3 }
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, spiky);
        var contract = ContractLoader.Load(contractPath);
        // 30% of the events sit at exactly 0 (an absent object); the rest is |N(0,1)| + 1.
        string Csv(string name, int rows, int seed, double zeroShare)
        {
            var rng = new Xoshiro256StarStar(seed);
            var normal = new Normal(0, 1, rng);
            var path = Path.Combine(_dir, name);
            File.WriteAllLines(path, new[] { "x" }.Concat(Enumerable.Range(0, rows).Select(_ =>
                rng.NextDouble() < zeroShare ? "0" : (Math.Abs(normal.Sample()) + 1).ToString("R", CultureInfo.InvariantCulture))));
            return path;
        }
        var reference = ReferenceBuilder.Build(contract, [Csv("full.csv", 60_000, 1, 0.30)], null, "test");
        Assert.Equal(0.30, reference.Find("x")!.Spike!.SumW / reference.Events, 2);
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        Assert.Equal(reference.Find("x")!.Spike, ReferenceFile.Read(contract.ReferenceFullPath).Find("x")!.Spike);

        Csv("surrogate.csv", 60_000, 2, 0.35); // 5 points too many zeros, the non-zero part faithful
        var report = ContractRun.Run(contract);
        Assert.Equal(Verdict.Fail, report.Outcomes.Single(o => o.Check.Kind == CheckKind.Fraction).Verdict);
        Assert.All(report.Outcomes.Where(o => o.Check.Kind != CheckKind.Fraction), o => Assert.Equal(Verdict.Pass, o.Verdict));

        Csv("surrogate.csv", 60_000, 3, 0.30);
        Assert.True(ContractRun.Run(contract).NoCheckFailed());
    }

    [Fact]
    public void Shuffled_correlations_fail_the_joint_checks_while_every_marginal_passes()
    {
        const string text = """
            contract-version: 1
            sample: surrogate.csv
            reference: ref.parquet
            defaults:
              binning: { bins: 20 }
              checks:
                ks-max: 0.03
                ratio-max: { core: 0.15, tails: 0.3 }
            features:
              - name: x
              - name: y
            correlations:
              - features: [x, y]
                pearson-max: 0.05
                spearman-max: 0.05
                chi2-2d-test: on
            joint:
              features: [x, y]
              frechet-max: 0.02
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, text);
        var contract = ContractLoader.Load(contractPath);
        // y = 0.6 x + 0.8 z with x, z standard normal: correlation 0.6 and standard normal marginals.
        (double[] X, double[] Y) Draw(int n, int seed)
        {
            var normal = new Normal(0, 1, new Xoshiro256StarStar(seed));
            var x = Enumerable.Range(0, n).Select(_ => normal.Sample()).ToArray();
            var y = x.Select(v => 0.6 * v + 0.8 * normal.Sample()).ToArray();
            return (x, y);
        }
        void Write(string name, double[] x, double[] y) =>
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "x,y" }.Concat(x.Select((v, i) =>
                string.Create(CultureInfo.InvariantCulture, $"{v:R},{y[i]:R}"))));
        var (rx, ry) = Draw(50_000, 1);
        Write("full.csv", rx, ry);
        var reference = ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test");
        Assert.NotNull(reference.JointMoments);
        Assert.Equal(0.6, reference.FindPair("x", "y")!.Pearson, 1);
        // Spearman's ρ of a bivariate normal is (6/π)·asin(r/2) = 0.5822 for r = 0.6 (Pearson 1907) — ranks via binned marginals, approximate.
        Assert.Equal(6 / Math.PI * Math.Asin(0.3), reference.FindPair("x", "y")!.Spearman, 1);
        ReferenceFile.Write(contract.ReferenceFullPath, reference);

        var (sx, sy) = Draw(50_000, 2);
        Write("surrogate.csv", sx, sy);
        var faithful = ContractRun.Run(contract);
        Assert.True(faithful.NoCheckFailed(), string.Join("\n", faithful.Outcomes.Select(o => $"{o.Subject.Name} {o.Check.Label} {o.Verdict}: {o.Summary}")));
        // Each outcome names what it was made on, at its declaration in the contract above (the program against its own
        // contract): the features, the pair (its entry, line 13), the joint block (its tolerance, line 19).
        Assert.Equal(["x", "y"], faithful.Outcomes.Where(o => o.Subject is FeatureSubject).Select(o => o.Subject.Name).Distinct());
        var pairOutcomes = faithful.Outcomes.Where(o => o.Subject is PairSubject).ToList();
        // The 2-D χ² is a goodness-of-fit test: read beside the verdict, not a check of it (docs/contract.md).
        Assert.Equal([CheckKind.PearsonDifference, CheckKind.SpearmanDifference], pairOutcomes.Select(o => o.Check.Kind));
        Assert.All(pairOutcomes, o => Assert.Equal(("x~y", 13), (o.Subject.Name, o.Subject.Location.Line)));
        Assert.DoesNotContain(faithful.Outcomes, o => o.Check is GoodnessOfFitTest);
        var jointOutcome = Assert.Single(faithful.Outcomes, o => o.Subject is JointSubject);
        Assert.Equal((CheckKind.FrechetDistance, "joint(x,y)", 19), (jointOutcome.Check.Kind, jointOutcome.Subject.Name, jointOutcome.Check.Location.Line));
        var pairReading = Assert.Single(faithful.Readings);
        Assert.Equal((CheckKind.ChiSquare2DTest, "x~y", 13), (pairReading.Test.Kind, pairReading.Subject.Name, pairReading.Subject.Location.Line));
        Assert.Empty(faithful.UncoveredSubjects);
        Assert.Equal(RunOutcome.Passed, faithful.ChecksOutcome);

        // Same marginals, joint structure destroyed: y shuffled against x.
        var shuffled = sy.OrderBy(v => BitConverter.DoubleToInt64Bits(v) * 2654435761L).ToArray();
        Write("surrogate.csv", sx, shuffled);
        var broken = ContractRun.Run(contract);
        foreach (var o in broken.Outcomes)
        {
            // Fréchet distance of two standard bivariate normals, correlation 0.6 against 0: 4 − 2(√1.6 + √0.4) = 0.205
            // (closed form of Dowson & Landau 1982 for Gaussians, by hand), ten times the tolerance.
            var joint = o.Check.Kind is CheckKind.PearsonDifference or CheckKind.SpearmanDifference or CheckKind.FrechetDistance;
            Assert.True(joint ? o.Verdict == Verdict.Fail : o.Verdict == Verdict.Pass, $"{o.Subject.Name} {o.Check.Label} {o.Verdict}: {o.Summary}");
        }
        // The 2-D test tells the shuffled sample apart, and says so without failing anything.
        Assert.Single(broken.Readings);
        Assert.All(broken.Readings, r => Assert.Equal(Distinguishability.Distinguishable, r.Finding));
    }

    [Fact]
    public void A_pair_whose_cells_hold_negative_sums_of_weights_is_measured_where_it_can_be_and_never_crashes()
    {
        // docs/contract.md: an uncomputable measurement is undecided (a test: not distinguishable), never a crash or
        // p = 0. Every event with x and y both beyond 1 carries weight −1, so the 2-D histogram's corner cells hold
        // negative sums, where the χ² homogeneity test of probabilities is undefined; Pearson and Spearman accept them.
        const string text = """
            contract-version: 1
            sample: { path: surrogate.csv, weight: w }
            reference: ref.parquet
            decision: { inconclusive: warn }
            defaults:
              binning: { bins: 10 }
              checks: { ks-max: 0.05 }
            features:
              - name: x
              - name: y
            correlations:
              - features: [x, y]
                pearson-max: 0.2
                chi2-2d-test: on
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, text);
        var contract = ContractLoader.Load(contractPath);
        void Write(string name, int n, int seed, bool weighted)
        {
            var normal = new Normal(0, 1, new Xoshiro256StarStar(seed));
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "x,y,w" }.Concat(Enumerable.Range(0, n).Select(_ =>
            {
                var x = normal.Sample();
                var y = 0.6 * x + 0.8 * normal.Sample();
                var w = weighted && x > 1 && y > 1 ? -1.0 : 1.0;
                return string.Create(CultureInfo.InvariantCulture, $"{x:R},{y:R},{w:R}");
            })));
        }
        Write("full.csv", 40_000, 1, weighted: false);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test"));
        Write("surrogate.csv", 40_000, 2, weighted: true);
        var report = ContractRun.Run(contract);
        var chi2 = Assert.Single(report.Readings, r => r.Subject is PairSubject);
        Assert.True(chi2.Measured.Uncomputable, chi2.Measured.Summary);
        Assert.NotEqual(Distinguishability.Distinguishable, chi2.Finding);
        var pearson = Assert.Single(report.Outcomes, o => o.Check.Kind == CheckKind.PearsonDifference);
        Assert.False(pearson.Measured.Uncomputable, pearson.Summary);
    }

    [Fact]
    public void A_pair_whose_weights_sum_to_zero_is_undecided_not_a_crash()
    {
        // Signed weights whose sum passes through zero leave no weighted mean: Pearson's r is undefined, so its check
        // cannot be measured (undecided, with the reason) rather than dividing by zero.
        const string text = """
            contract-version: 1
            sample: { path: surrogate.csv, weight: w }
            reference: ref.parquet
            decision: { inconclusive: warn }
            defaults:
              binning: { bins: 10 }
              checks: { ks-max: 0.05 }
            features:
              - name: x
              - name: y
            correlations:
              - features: [x, y]
                pearson-max: 0.2
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, text);
        var contract = ContractLoader.Load(contractPath);
        var normal = new Normal(0, 1, new Xoshiro256StarStar(3));
        var rows = Enumerable.Range(0, 2_000).Select(_ => (X: normal.Sample(), Y: normal.Sample())).ToArray();
        File.WriteAllLines(Path.Combine(_dir, "full.csv"), new[] { "x,y,w" }.Concat(rows.Select(r => string.Create(CultureInfo.InvariantCulture, $"{r.X:R},{r.Y:R},1"))));
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test"));
        // Each event once at +1 and once at −1: Σw = 0 exactly.
        File.WriteAllLines(Path.Combine(_dir, "surrogate.csv"), new[] { "x,y,w" }.Concat(rows.SelectMany(r => new[]
            { string.Create(CultureInfo.InvariantCulture, $"{r.X:R},{r.Y:R},1"), string.Create(CultureInfo.InvariantCulture, $"{r.X:R},{r.Y:R},-1") })));
        var e = Record.Exception(() => ContractRun.Run(contract));
        if (e is GateInputException input)
            Assert.NotEqual(0, input.Code.Length); // a coded input error (a zero total weight) is as good as a measured "undecided"
        else
        {
            Assert.Null(e);
            var pearson = Assert.Single(ContractRun.Run(contract).Outcomes, o => o.Check.Kind == CheckKind.PearsonDifference);
            Assert.True(pearson.Measured.Uncomputable, pearson.Summary);
            Assert.Equal(Verdict.Inconclusive, pearson.Verdict);
        }
    }

    private const string DerivedContract = """
        contract-version: 1
        sample: surrogate.csv
        reference: ref.parquet
        selection: "n >= 1"
        defaults:
          binning: { bins: 10 }
          checks: { ks-max: 0.05, ratio-max: { core: 0.2, tails: 0.4 } }
        features:
          - name: m
            expression: sqrt(2*pt1*pt2*(cosh(eta1 - eta2) - cos(phi1 - phi2)))
          - name: pt1
        """;

    private string PairsCsv(string name, int rows, int seed)
    {
        var rng = new Xoshiro256StarStar(seed);
        var path = Path.Combine(_dir, name);
        File.WriteAllLines(path, new[] { "pt1,eta1,phi1,pt2,eta2,phi2,n" }.Concat(Enumerable.Range(0, rows).Select(_ =>
            string.Create(CultureInfo.InvariantCulture,
                $"{20 + 60 * rng.NextDouble():R},{4 * rng.NextDouble() - 2:R},{6.28 * rng.NextDouble():R},{20 + 40 * rng.NextDouble():R},{4 * rng.NextDouble() - 2:R},{6.28 * rng.NextDouble():R},{rng.Next(0, 3)}"))));
        return path;
    }

    [Fact]
    public void Derived_features_and_the_selection_apply_to_reference_and_sample_alike()
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, DerivedContract);
        var contract = ContractLoader.Load(contractPath);
        var full = PairsCsv("full.csv", 30_000, 1);
        var reference = ReferenceBuilder.Build(contract, [full], null, "test");
        // The selection keeps n ∈ {1, 2}: about two thirds of the rows, counted directly from the file.
        var kept = File.ReadLines(full).Skip(1).Count(l => l.Split(',')[6] != "0");
        Assert.Equal(kept, reference.Events);
        Assert.Equal(kept, reference.Find("m")!.Histogram.Entries);
        Assert.Contains("|expression:", reference.Find("m")!.BinningRequest);
        ReferenceFile.Write(contract.ReferenceFullPath, reference);

        PairsCsv("surrogate.csv", 30_000, 2);
        var report = ContractRun.Run(contract);
        Assert.True(report.NoCheckFailed(), string.Join("\n", report.Outcomes.Select(o => $"{o.Subject.Name} {o.Check.Label} {o.Verdict}: {o.Summary}")));

        // A changed expression is a changed feature: the reference no longer fits.
        File.WriteAllText(contractPath, DerivedContract.Replace("cos(phi1 - phi2)", "cos(phi2 - phi1) * 1.0"));
        Assert.Equal(ErrorCodes.ReferenceMismatch, Assert.Throws<GateInputException>(() => ContractRun.Run(ContractLoader.Load(contractPath))).Code);
    }

    [Fact]
    public void An_expression_error_points_inside_the_expression()
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, DerivedContract.Replace("sqrt(2*pt1", "sqrtt(2*pt1"));
        PairsCsv("surrogate.csv", 100, 2);
        var e = Assert.Throws<GateInputException>(() => ContractRun.Run(ContractLoader.Load(contractPath)));
        Assert.Equal(ErrorCodes.ContractExpression, e.Code);
        Assert.Equal(10, e.Location!.Line);
        Assert.Equal(17, e.Location.Column); // "    expression: " is 16 characters; the unknown function starts right after
        Assert.Contains("sqrt", e.Message);

        File.WriteAllText(contractPath, DerivedContract.Replace("\"n >= 1\"", "\"n >= 1 && ptt > 3\""));
        var c = Assert.Throws<GateInputException>(() => ContractRun.Run(ContractLoader.Load(contractPath)));
        Assert.Equal(ErrorCodes.ContractExpression, c.Code);
        Assert.Equal(new SourceLocation(contractPath, 4, 23), c.Location); // 'selection: "' is 12 characters, 'n >= 1 && ' 10 more
        Assert.Contains("pt1", c.Message);
    }

    [Fact]
    public void A_heavier_far_tail_fails_the_far_tail_check()
    {
        var contract = Setup(ContractText.Replace("ks-max: 0.03", "ks-max: 0.03\n    far-tail-max: 0.001"));
        Assert.NotNull(ReferenceFile.Read(contract.ReferenceFullPath).Find("x")!.FarTail);
        // 40 000 reference events: 40 ± 6 beyond each 0.1% quantile (binomial, by construction).
        WriteCsv("surrogate.csv", 40_000, 2, 0);
        Assert.Equal(Verdict.Pass, ContractRun.Run(contract).Outcomes.Single(o => o.Check.Kind == CheckKind.FarTail).Verdict);

        // The same sample with 0.4% of its events moved far out (x → 5): four times the reference's upper far tail.
        var lines = File.ReadAllLines(Path.Combine(_dir, "surrogate.csv"));
        for (var i = 1; i < lines.Length; i += 250) lines[i] = "5";
        File.WriteAllLines(Path.Combine(_dir, "surrogate.csv"), lines);
        var far = ContractRun.Run(contract).Outcomes.Single(o => o.Check.Kind == CheckKind.FarTail);
        Assert.Equal(Verdict.Fail, far.Verdict);
        Assert.True(far.Value > 0.002, far.Summary);
    }

    [Fact]
    public void A_category_block_repeats_the_checks_per_category_and_checks_their_fractions()
    {
        const string text = """
            contract-version: 1
            sample: surrogate.csv
            reference: ref.parquet
            features:
              - name: x
                binning: { bins: 10 }
                checks:
                  ks-max: 0.07
                  mean-shift-max: 0.1
                categories:
                  by: min(k, 3)
                  values: [0, 1, 2, 3]
                  fraction-max: 0.02
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, text);
        var contract = ContractLoader.Load(contractPath);
        Assert.Equal(["x", "x[category=0]", "x[category=1]", "x[category=2]", "x[category=3]", "x[category]"], contract.Features.Select(f => f.Name));

        // k ~ Poisson(λ) objects; x ~ N(min(k,3), 1), shifted by `shift` in category 2 only.
        void Write(string name, int rows, int seed, double lambda, double shift)
        {
            var rng = new Xoshiro256StarStar(seed);
            var normal = new Normal(0, 1, rng);
            var poisson = new Poisson(lambda, rng);
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "x,k" }.Concat(Enumerable.Range(0, rows).Select(_ =>
            {
                var k = poisson.Sample();
                var c = Math.Min(k, 3);
                return string.Create(CultureInfo.InvariantCulture, $"{c + normal.Sample() + (c == 2 ? shift : 0):R},{k}");
            })));
        }
        Write("full.csv", 60_000, 1, 1.2, 0);
        var reference = ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test");
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        // Poisson(1.2): P(k = 2) = e^−1.2·1.2²/2 = 0.2169 (hand-computed), the share of category 2.
        Assert.Equal(0.2169, reference.Find("x[category=2]")!.Histogram.TotalSumW / reference.Events, 2);

        Write("surrogate.csv", 60_000, 2, 1.2, 0);
        var faithful = ContractRun.Run(contract);
        Assert.True(faithful.NoCheckFailed(), string.Join("\n", faithful.Outcomes.Select(o => $"{o.Subject.Name} {o.Check.Label} {o.Verdict}: {o.Summary}")));

        Write("surrogate.csv", 60_000, 3, 1.2, 0.3); // category 2 shifted by 0.3σ
        var shifted = ContractRun.Run(contract);
        Assert.All(shifted.Outcomes, o => Assert.True(
            o.Subject.Name == "x[category=2]" ? o.Verdict == Verdict.Fail : o.Verdict != Verdict.Fail || o.Subject.Name == "x",
            $"{o.Subject.Name} {o.Check.Label} {o.Verdict}: {o.Summary}"));
        Assert.Contains(shifted.Outcomes, o => o.Subject.Name == "x[category=2]" && o.Verdict == Verdict.Fail);

        Write("surrogate.csv", 60_000, 4, 1.5, 0); // more objects per event: the category fractions move
        var fractions = ContractRun.Run(contract);
        Assert.Equal(Verdict.Fail, fractions.Outcomes.Single(o => o.Subject.Name == "x[category]").Verdict);
    }

    [Fact]
    public void A_response_surrogate_with_worse_resolution_in_one_true_energy_bin_fails_in_that_bin_only()
    {
        const string text = """
            contract-version: 1
            sample: surrogate.csv
            reference: ref.parquet
            features:
              - name: response
                expression: e_reco / e_gen
                binning: { bins: 20 }
                checks:
                  width-ratio-max: 0.02
                  iqr-width-ratio-max: 0.02
                  quantile-shift-max: 0.05
                categories:
                  by: min(floor(e_gen / 25), 7)
                  values: [0, 1, 2, 3, 4, 5, 6, 7]
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, text);
        var contract = ContractLoader.Load(contractPath);
        // e_gen uniform in [0, 200) GeV; reco = gen·(1 + σ_rel·z), σ_rel = 0.1/√E ⊕ 0.01 (stochastic and constant
        // terms, the calorimetry parametrisation of the Review of Particle Physics); `worse` widens bin 3 (75–100 GeV).
        void Write(string name, int rows, int seed, double worse)
        {
            var rng = new Xoshiro256StarStar(seed);
            var normal = new Normal(0, 1, rng);
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "e_gen,e_reco" }.Concat(Enumerable.Range(0, rows).Select(_ =>
            {
                var gen = 200 * rng.NextDouble() + 1e-9;
                var sigma = Math.Sqrt(0.01 / gen + 0.0001) * (Math.Min(Math.Floor(gen / 25), 7) == 3 ? worse : 1);
                return string.Create(CultureInfo.InvariantCulture, $"{gen:R},{gen * (1 + sigma * normal.Sample()):R}");
            })));
        }
        Write("full.csv", 400_000, 1, 1);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test"));

        Write("surrogate.csv", 200_000, 2, 1.05); // 5% worse resolution in 75–100 GeV only
        var report = ContractRun.Run(contract);
        var failed = report.Outcomes.Where(o => o.Verdict == Verdict.Fail).Select(o => $"{o.Subject.Name} {o.Check.Label}").ToList();
        Assert.Contains("response[category=3] width-ratio-max", failed);
        // The interquartile width sees the same 5% (it is robust, not blind), but with 37% of σ's efficiency it cannot
        // yet fail at 25 000 events per bin: inconclusive, never a pass.
        var robust = report.Outcomes.Single(o => o.Subject.Name == "response[category=3]" && o.Check.Kind == CheckKind.InterquartileWidthRatio);
        Assert.NotEqual(Verdict.Pass, robust.Verdict);
        Assert.InRange(robust.Measured.Estimate, 0.02, 0.08);
        Assert.All(failed, f => Assert.True(f.StartsWith("response[category=3]") || f.StartsWith("response "), f));
        Assert.All(report.Outcomes.Where(o => o.Subject.Name.StartsWith("response[category=") && !o.Subject.Name.EndsWith("=3]")),
            o => Assert.NotEqual(Verdict.Fail, o.Verdict));
    }

    [Fact]
    public void An_unfolding_surrogate_that_misses_closure_in_one_reconstructed_bin_fails_there_only()
    {
        // Closure: the surrogate's generator-level prediction against the true values, per bin of the
        // reconstructed p_T (the layout of docs/examples/unfolding-surrogate.yaml).
        const string text = """
            contract-version: 1
            sample: unfolded.csv
            reference: ref.parquet
            defaults:
              binning: { bins: 15 }
              checks:
                ks-max: 0.03
                mean-shift-max: 0.02
            features:
              - name: pt_true
                categories:
                  by: min(floor(pt_reco / 20), 4)
                  values: [1, 2, 3, 4]
            """;
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, text);
        var contract = ContractLoader.Load(contractPath);
        // True p_T = 20 + an exponential of mean 25 GeV, reco = true·(1 + 0.1 z); `bias` scales the prediction of
        // events whose reco p_T lies in 40–60 GeV (category 2), as an unfolding that learnt that bin wrong would.
        void Write(string name, int rows, int seed, double bias)
        {
            var rng = new Xoshiro256StarStar(seed);
            var normal = new Normal(0, 1, rng);
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "pt_true,pt_reco" }.Concat(Enumerable.Range(0, rows).Select(_ =>
            {
                var truth = 20 - 25 * Math.Log(1 - rng.NextDouble());
                var reco = truth * (1 + 0.1 * normal.Sample());
                var predicted = Math.Min(Math.Floor(reco / 20), 4) == 2 ? truth * bias : truth;
                return string.Create(CultureInfo.InvariantCulture, $"{predicted:R},{reco:R}");
            })));
        }
        Write("truth.csv", 300_000, 1, 1);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [Path.Combine(_dir, "truth.csv")], null, "test"));

        Write("unfolded.csv", 200_000, 2, 1);
        var closed = ContractRun.Run(contract);
        Assert.True(closed.NoCheckFailed(), string.Join("\n", closed.Outcomes.Select(o => $"{o.Subject.Name} {o.Check.Label} {o.Verdict}: {o.Summary}")));

        Write("unfolded.csv", 200_000, 3, 1.03); // 3% high in 40–60 GeV of reco p_T only
        var open = ContractRun.Run(contract);
        var failed = open.Outcomes.Where(o => o.Verdict == Verdict.Fail).Select(o => $"{o.Subject.Name} {o.Check.Label}").ToList();
        Assert.Contains("pt_true[category=2] mean-shift-max", failed);
        Assert.All(open.Outcomes.Where(o => o.Subject.Name.StartsWith("pt_true[category=") && !o.Subject.Name.EndsWith("=2]")),
            o => Assert.NotEqual(Verdict.Fail, o.Verdict));
    }

    [Fact]
    public void Weights_whose_squares_overflow_are_an_input_error_not_a_crash()
    {
        var contract = Setup(ContractText.Replace("sample: surrogate.csv", "sample: { path: surrogate.csv, weight: w }"));
        File.WriteAllLines(Path.Combine(_dir, "surrogate.csv"), new[] { "x,w" }.Concat(Enumerable.Range(0, 100)
            .Select(i => string.Create(CultureInfo.InvariantCulture, $"{i * 0.01:R},1e200"))));
        var e = Assert.Throws<GateInputException>(() => ContractRun.Run(contract));
        Assert.Equal(ErrorCodes.SampleBadWeight, e.Code);
        Assert.Contains("rescale", e.Message);
    }

    [Fact]
    public void A_missing_sample_is_reported_at_the_contract_line_that_names_it()
    {
        var contract = Setup();
        var e = Assert.Throws<GateInputException>(() => ContractRun.Run(contract));
        Assert.Equal(ErrorCodes.SampleNotFound, e.Code);
        Assert.Equal(new SourceLocation(contract.FilePath, 3, 9), e.Location);
    }

    [Fact]
    public void A_reference_built_with_other_binning_is_refused()
    {
        Setup();
        WriteCsv("surrogate.csv", 1000, 2, 0);
        var path = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(path, ContractText.Replace("bins: 10", "bins: 12"));
        var e = Assert.Throws<GateInputException>(() => ContractRun.Run(ContractLoader.Load(path)));
        Assert.Equal(ErrorCodes.ReferenceMismatch, e.Code);
        Assert.Equal(6, e.Location!.Line);
        Assert.Contains("quantile:10", e.Message);
    }

    [Fact]
    public void A_missing_reference_is_reported_at_the_contract_line_that_names_it()
    {
        var contract = Setup();
        WriteCsv("surrogate.csv", 1000, 2, 0);
        File.Delete(contract.ReferenceFullPath);
        var e = Assert.Throws<GateInputException>(() => ContractRun.Run(contract));
        Assert.Equal(ErrorCodes.ReferenceNotFound, e.Code);
        Assert.Equal(new SourceLocation(contract.FilePath, 4, 12), e.Location);
    }
}
