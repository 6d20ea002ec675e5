using System.Globalization;
using System.Text;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Drafting;
using GateTasks.Engine.Tests.Samples;

namespace GateTasks.Engine.Tests.Drafting;

public sealed class ContractDrafterTests : IDisposable
{
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    /// <summary>A trusted sample of 20 000 weighted events: a normal x, counts n of 0–3, z zero in 30% of events, a constant c.</summary>
    private string Sample()
    {
        var random = new Random(20261202);
        var csv = new StringBuilder("x,n,z,c,w\n");
        for (var i = 0; i < 20_000; i++)
        {
            var x = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            var n = random.Next(4);
            var z = random.NextDouble() < 0.3 ? 0 : 1 + random.NextDouble();
            csv.Append(CultureInfo.InvariantCulture, $"{x:R},{n},{z:R},4.5,{0.5 + random.NextDouble():R}\n");
        }
        var path = _folder.File("fullsim.csv");
        File.WriteAllText(path, csv.ToString());
        return path;
    }

    [Fact]
    public void A_draft_loads_with_kinds_inferred_and_every_tolerance_explained()
    {
        var text = ContractDrafter.Draft([Sample()], "w", new DraftOptions(10_000), "surrogate/*.parquet", "reference/fullsim-reference.parquet");
        var path = _folder.File("precision-contract.yaml");
        File.WriteAllText(path, text);

        var contract = ContractLoader.Load(path);

        Assert.Equal(["x", "n", "z"], contract.Features.Select(f => f.Name));
        Assert.Equal(FeatureKind.Continuous, contract.Features[0].Kind);
        Assert.Equal(FeatureKind.Discrete, contract.Features[1].Kind);
        Assert.Equal(0, contract.Features[2].Spike);
        Assert.Equal("w", contract.Sample.Weight);
        Assert.Contains("#   c: takes the single value 4.5", text);
        Assert.Contains("Derived features (expressions) are not guessed", text);
        // docs/contract.md, "Derived features and the selection": the draft's hint spells expressions as the language does.
        Assert.Contains("# An expression writes logic as && || ! and a column name that is not an identifier in braces,", text);
        Assert.Contains("expression: \"{jet pt} * cosh(eta)\"", text);
        // Every generated number carries a comment; every tolerance its derivation.
        var numbers = text.Split('\n').Where(l => System.Text.RegularExpressions.Regex.IsMatch(l, @"^\s+[a-z-]+: [0-9.]+( |$)")).ToList();
        Assert.All(numbers, l => Assert.Contains(" # ", l));
        Assert.All(text.Split('\n').Where(l => l.Contains(": ") && !l.TrimStart().StartsWith('#') && !l.TrimEnd().EndsWith(':')), l => Assert.Contains(" # ", l));
        var tolerances = numbers.Where(l => !l.Contains("bins:") && !l.Contains("core: 0.9") && !l.Contains("spike:")).ToList();
        Assert.Equal(5 + 1 + 6, tolerances.Count); // x: ratio core and tails, ks, mean, width; n: fraction; z: those of x and the spike's fraction
        Assert.All(tolerances, l => Assert.Matches(@" # (widened from [0-9.]+ \()?1(/3)? × ", l));
        // x: the rule's values for 10⁴ data events and 20 bins (hand computation in PrecisionRuleTests) are below what a
        // 20 000-event reference resolves, so each is widened and its comment keeps the rule's value; the widened values
        // are tested in ReferenceNoiseFloorTests.
        var x = contract.Features[0].Checks.OfType<ToleranceCheck>().Select(c => c.Tolerance).ToList();
        Assert.Contains("ratio-max:\n      core: ", text.Replace("\r", ""));
        Assert.Contains(" # widened from 0.014 (1/3 × √(20 bins", text);   // ratio-max core
        Assert.Contains(" # widened from 0.044 (1 × √(20 bins", text);     // ratio-max tails
        Assert.Contains(" # widened from 0.0016 (1/3 × 0.5/√10000", text); // ks-max
        Assert.All(x, t => Assert.True(t > 0.0016, $"{t}"));
    }
}
