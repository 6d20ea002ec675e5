using System.Globalization;
using System.Text;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A reference whose bins miss its own events cannot be built any more (GATE2104 at 'reference build', a corpus
/// case), but one made otherwise (another tool, an older GateTasks, a hand-made file with a recomputed checksum) is
/// refused again when a check reads it, at the contract's binning line.
/// </summary>
public class BinCoverageAtCheckTests
{
    [Fact]
    public void A_reference_whose_bins_hold_none_of_it_is_refused_at_check()
    {
        var folder = Directory.CreateTempSubdirectory("gatetasks-coverage-").FullName;
        try
        {
            Directory.CreateDirectory(Path.Combine(folder, ".git"));
            var csv = new StringBuilder("x\n");
            var random = new Random(20261206);
            for (var i = 0; i < 2000; i++) csv.Append((random.NextDouble() * 8 - 4).ToString("R", CultureInfo.InvariantCulture)).Append('\n');
            File.WriteAllText(Path.Combine(folder, "data.csv"), csv.ToString());
            const string Body = """
                contract-version: 1
                sample: data.csv
                reference: reference.parquet
                features:
                  - name: x
                    binning: { edges: EDGES }
                    checks:
                      ks-max: 0.05
                """;
            var contractPath = Path.Combine(folder, "contract.yaml");
            File.WriteAllText(contractPath, Body.Replace("EDGES", "[-5, 0, 5]"));
            var built = ReferenceBuilder.Build(ContractLoader.Load(contractPath), [Path.Combine(folder, "data.csv")], null, "test");

            // The same events, all below the first edge of bins at [100, 300): what an outside-built reference could hold.
            var f = built.Features[0];
            var axis = Axis.FromEdges([100, 200, 300]);
            var total = f.Histogram.TotalSumW;
            var moved = Histogram.FromCells(axis, [total, 0, 0, 0], [f.Histogram.TotalSumW2, 0, 0, 0], f.Histogram.Entries, 0, 0, 0);
            var crafted = built with { Features = [f with { BinningRequest = "edges:100,200,300", Histogram = moved }] };
            ReferenceFile.Write(Path.Combine(folder, "reference.parquet"), crafted);
            File.WriteAllText(contractPath, Body.Replace("EDGES", "[100, 200, 300]"));

            var (exit, stdout, stderr) = GatetasksProcess.Run(["check", "--contract", "contract.yaml", "--junit", "report.xml"], folder);
            // The documented behaviour (docs/error-codes.md, GATE2104): exit 2, at the binning, with the share found.
            Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
            Assert.Contains("contract.yaml(6,14): error GATE2104:", stderr);
            Assert.Contains("hold 0% of the reference (100% below the first edge", stderr);
            Assert.DoesNotContain("PASSED", File.ReadAllText(Path.Combine(folder, "report.xml")));
        }
        finally
        {
            try { Directory.Delete(folder, recursive: true); } catch (IOException) { }
        }
    }
}
