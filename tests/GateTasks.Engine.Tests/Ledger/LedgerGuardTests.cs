using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Ledger;

/// <summary>The acceptance ledger end to end on small CSV samples: accept, change, detect, accept again, tamper.</summary>
public sealed class LedgerGuardTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-ledger-").FullName;
    private static readonly DateTimeOffset When = new(2026, 12, 2, 9, 30, 0, TimeSpan.Zero);

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private const string ContractText = """
        contract-version: 1
        title: ledger-case
        sample: surrogate.csv
        reference: ref.parquet
        defaults:
          binning: { bins: 10 }
          checks:
            ks-max: 0.03
            mean-shift-max: 0.05
            ratio-max: { core: 0.15, tails: 0.3 }
        features:
          - name: x
            checks:
              chi2-test: on
        """;

    private string ContractPath => Path.Combine(_dir, "precision-contract.yaml");
    private string LedgerPath => Path.Combine(_dir, "precision-contract.ledger");

    private void WriteCsv(string name, int rows, int seed, double shift, double scale = 1)
    {
        var normal = new Normal(0, 1, new Xoshiro256StarStar(seed));
        File.WriteAllLines(Path.Combine(_dir, name), new[] { "x" }.Concat(Enumerable.Range(0, rows)
            .Select(_ => (scale * normal.Sample() + shift).ToString("R", CultureInfo.InvariantCulture))));
    }

    private PrecisionContract Contract(string text)
    {
        File.WriteAllText(ContractPath, text);
        return ContractLoader.Load(ContractPath);
    }

    private void BuildReference(int seed)
    {
        WriteCsv("fullsim.csv", 40_000, seed, 0);
        var contract = ContractLoader.Load(ContractPath);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [Path.Combine(_dir, "fullsim.csv")], null, "test"));
    }

    /// <summary>The accepted starting point: contract, reference, a faithful sample and entry 1.</summary>
    private RunResult Start(string text = ContractText)
    {
        Contract(text);
        BuildReference(1);
        WriteCsv("surrogate.csv", 20_000, 2, 0);
        var report = ContractRun.Run(ContractLoader.Load(ContractPath));
        Assert.True(report.NoCheckFailed());
        Acceptance.Accept(report, "Ada Analyst <ada@example.org>", "first accepted tolerances", When);
        return ContractRun.Run(ContractLoader.Load(ContractPath));
    }

    [Fact]
    public void Without_a_ledger_a_check_warns_and_names_the_command_that_starts_one()
    {
        Contract(ContractText);
        BuildReference(1);
        WriteCsv("surrogate.csv", 20_000, 2, 0);
        var f = Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);
        Assert.Equal(ErrorCodes.LedgerMissing, f.Code);
        Assert.False(f.IsError);
        Assert.Contains("gatetasks accept --contract", f.Message);

        var required = ContractText.Replace("defaults:", "acceptance: { required: on }\ndefaults:");
        Contract(required);
        Assert.True(Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance).IsError);
    }

    [Fact]
    public void An_accepted_state_holds_and_a_loosened_tolerance_fails_at_its_line_until_accepted()
    {
        var accepted = Start();
        Assert.Empty(accepted.Acceptance);
        Assert.True(accepted.AcceptanceHolds);
        var entries = LedgerFile.Read(LedgerPath);
        var e = Assert.Single(entries);
        Assert.Equal("Ada Analyst <ada@example.org>", e.By);
        Assert.Equal(When, e.When);
        Assert.Equal(IO.FileDigest.Sha256(ContractPath), e.ContractSha256);
        Assert.Equal(IO.FileDigest.Sha256(Path.Combine(_dir, "ref.parquet")), e.ReferenceSha256);
        Assert.Equal(LedgerFile.FirstAfter, e.After);

        Contract(ContractText.Replace("ks-max: 0.03", "ks-max: 0.05"));
        var loosened = ContractRun.Run(ContractLoader.Load(ContractPath));
        Assert.True(loosened.NoCheckFailed());
        var f = Assert.Single(loosened.Acceptance);
        Assert.Equal(ErrorCodes.LedgerUnrecordedLoosening, f.Code);
        Assert.Equal(new SourceLocation(ContractPath, 8, 13), f.Location); // the ks-max value
        Assert.Contains("x ks-max changed from 0.03 to 0.05 since entry 1", f.Message);
        Assert.Contains($"gatetasks accept --contract {ContractPath} --reason", f.Message);

        Acceptance.Accept(loosened, "Ada Analyst <ada@example.org>", "KS loosened after review", When.AddDays(1));
        Assert.True(ContractRun.Run(ContractLoader.Load(ContractPath)).AcceptanceHolds);
        Assert.Equal(2, LedgerFile.Read(LedgerPath).Count);
    }

    [Fact]
    public void Tightening_passes_unless_the_contract_asks_to_record_it_and_removing_a_check_is_loosening()
    {
        Start();
        Contract(ContractText.Replace("ks-max: 0.03", "ks-max: 0.025"));
        Assert.Empty(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);

        Start(ContractText.Replace("defaults:", "acceptance: { tightening: record }\ndefaults:"));
        Contract(ContractText.Replace("defaults:", "acceptance: { tightening: record }\ndefaults:").Replace("ks-max: 0.03", "ks-max: 0.025"));
        Assert.Equal(ErrorCodes.LedgerUnrecordedTightening, Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance).Code);

        File.Delete(LedgerPath);
        Start();
        Contract(ContractText.Replace("      chi2-test: on", "      chi2-test: off"));
        var removed = Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);
        Assert.Equal(ErrorCodes.LedgerUnrecordedLoosening, removed.Code);
        Assert.Contains("x chi2-test (was on) was removed", removed.Message);
        Assert.Equal(LedgerPath, removed.Location!.File); // the removed check is shown where it was accepted
    }

    [Fact]
    public void A_lowered_confidence_and_a_replaced_reference_need_an_entry()
    {
        Start();
        Contract(ContractText.Replace("defaults:", "decision: { confidence: 0.9 }\ndefaults:"));
        var f = Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);
        Assert.Equal(ErrorCodes.LedgerUnrecordedLoosening, f.Code);
        Assert.Contains("decision confidence changed from 0.95 to 0.9", f.Message);

        Contract(ContractText);
        BuildReference(7); // another full-simulation sample: another reference
        var r = Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);
        Assert.Equal(ErrorCodes.LedgerUnrecordedReference, r.Code);
        Assert.Equal(4, r.Location!.Line); // the contract's reference line
    }

    [Fact]
    public void An_edited_removed_or_reordered_entry_is_detected_and_named()
    {
        var report = Start();
        Acceptance.Accept(report, "Bo Reviewer", "re-recorded", When.AddDays(2));
        var original = File.ReadAllLines(LedgerPath);
        LedgerFinding Tampered(string[] lines)
        {
            File.WriteAllLines(LedgerPath, lines);
            var f = Assert.Single(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);
            Assert.Equal(ErrorCodes.LedgerTampered, f.Code);
            Assert.True(f.IsError);
            return f;
        }

        var edited = original.Select(l => l == "why \"first accepted tolerances\"" ? "why \"first accepted tolerance\"" : l).ToArray();
        Assert.NotEqual(original, edited);
        Assert.Contains("Entry 1 (line 5) was edited", Tampered(edited).Message);

        var second = Array.FindIndex(original, l => l == "[accepted 2]");
        var header = original[..4];
        var entry1 = original[4..(second - 1)];
        var entry2 = original[second..];
        Assert.Contains("entry 1 was removed", Tampered([.. header, .. entry2]).Message);
        Assert.Contains("reordered", Tampered([.. header, .. entry2, "", .. entry1]).Message);

        File.WriteAllLines(LedgerPath, original);
        Assert.Empty(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance);
    }

    [Fact]
    public void A_failing_run_cannot_be_accepted()
    {
        Contract(ContractText);
        BuildReference(1);
        WriteCsv("surrogate.csv", 20_000, 2, 0.3);
        var report = ContractRun.Run(ContractLoader.Load(ContractPath));
        Assert.False(report.NoCheckFailed());
        var e = Assert.Throws<GateInputException>(() => Acceptance.Accept(report, "Ada", "try", When));
        Assert.Equal(ErrorCodes.AcceptRefused, e.Code);
        Assert.False(File.Exists(LedgerPath));
    }

    [Fact]
    public void The_ratchet_fails_a_degraded_margin_inside_tolerance_and_lets_a_faithful_sample_pass()
    {
        var text = ContractText.Replace("defaults:", "acceptance: { ratchet: on }\ndefaults:");
        Start(text);
        // A mean shift of 0.035σ stays inside the 0.05 tolerance (upper bound ≈ 0.035 + 1.645·0.0055 = 0.044 at
        // 2·10⁵ events) but its point margin falls by about 0.6, against an allowance of
        // 1.645·√(0.174² + 0.11²) ≈ 0.34 (σ of the shift √(1/40000 + 1/n) over the tolerance, by hand).
        WriteCsv("surrogate.csv", 200_000, 3, 0.035);
        var degraded = ContractRun.Run(ContractLoader.Load(ContractPath));
        // The mean shift itself still passes (the χ² test of course sees a shift at 2·10⁵ events).
        Assert.Equal(Verdict.Pass, degraded.Outcomes.Single(o => o.Check.Kind == CheckKind.MeanShift).Verdict);
        var ratchet = degraded.Acceptance.Where(f => f.Code == ErrorCodes.RatchetDegraded).ToList();
        Assert.Contains(ratchet, f => f.Message.StartsWith("x mean-shift-max: point margin"));

        WriteCsv("surrogate.csv", 20_000, 4, 0);
        Assert.DoesNotContain(ContractRun.Run(ContractLoader.Load(ContractPath)).Acceptance, f => f.Code == ErrorCodes.RatchetDegraded);
    }

    [Fact]
    public void Ledger_fields_with_spaces_quotes_and_backslashes_round_trip()
    {
        var line = new LedgerLine("by").Add("Ada \"the\" Analyst \\ CERN").Add("plain").Add("");
        var text = line.ToString();
        Assert.Equal("by \"Ada \\\"the\\\" Analyst \\\\ CERN\" plain \"\"", text);
        Assert.Equal(["by", "Ada \"the\" Analyst \\ CERN", "plain", ""], LedgerLine.Parse(text, "l", 1).Fields);
        var bad = Assert.Throws<GateInputException>(() => LedgerLine.Parse("by \"open", "l.ledger", 7));
        Assert.Equal(ErrorCodes.LedgerSyntax, bad.Code);
        Assert.Equal(new SourceLocation("l.ledger", 7, 4), bad.Location);
    }
}
