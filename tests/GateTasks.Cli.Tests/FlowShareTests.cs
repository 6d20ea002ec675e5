using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Every check's output says how much of each feature, in reference and sample, lies outside the bins (the flow
/// cells, which no binned check compares): in the printed table, the text and JUnit reports, and the HTML report.
/// </summary>
public class FlowShareTests
{
    [Fact]
    public void Flow_shares_of_reference_and_sample_are_printed_and_reported()
    {
        var folder = Directory.CreateTempSubdirectory("gatetasks-flows-").FullName;
        try
        {
            Directory.CreateDirectory(Path.Combine(folder, ".git"));
            var reference = Normal(20261204, 0);
            var sample = Normal(20261205, 3); // shifted by 3σ: much of it lies above the last edge
            Write(folder, "reference.csv", reference);
            Write(folder, "sample.csv", sample);
            File.WriteAllText(Path.Combine(folder, "contract.yaml"), """
                contract-version: 1
                sample: sample.csv
                reference: reference.parquet
                features:
                  - name: x
                    binning: { bins: 16, spacing: uniform, range: [-4, 4] }
                    checks:
                      ks-max: 0.05
                """);
            Assert.Equal(0, GatetasksProcess.Run(["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv"], folder).Exit);
            var (exit, stdout, stderr) = GatetasksProcess.Run(
                // The console shows the flows with the full table (--all-checks); the compact default leaves them to the reports.
                ["check", "--contract", "contract.yaml", "--all-checks", "--text", "out.txt", "--junit", "out.xml", "--html", "out.html"], folder);
            Assert.True(exit == 1, $"exit {exit}\n{stdout}{stderr}");

            // The expected shares are counted here, straight from the events written (bins are [lower, upper), so a
            // value equal to the upper edge 4 is a flow): not the program compared with itself.
            static string Share(double[] v, Func<double, bool> outside) =>
                (100.0 * v.Count(outside) / v.Length).ToString("0.##", CultureInfo.InvariantCulture) + "%";
            var expected = new[]
            {
                Share(reference, v => v < -4), Share(reference, v => v >= 4), Share(sample, v => v < -4), Share(sample, v => v >= 4),
            };
            Assert.NotEqual("0%", expected[3]); // the test means something only if the sample does leave the bins
            foreach (var text in new[] { stdout, File.ReadAllText(Path.Combine(folder, "out.txt")), File.ReadAllText(Path.Combine(folder, "out.xml")) })
            {
                var row = Regex.Match(text, @"^x\s+(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$", RegexOptions.Multiline);
                Assert.True(row.Success, $"no flow row in\n{text}");
                Assert.Contains("outside the bins", text);
                Assert.Equal(expected, row.Groups.Values.Skip(1).Select(g => g.Value).ToArray());
            }
            Assert.Contains($"outside the bins: reference {expected[0]} below, {expected[1]} above; surrogate {expected[2]} below, {expected[3]} above",
                File.ReadAllText(Path.Combine(folder, "out.html")));
        }
        finally
        {
            try { Directory.Delete(folder, recursive: true); } catch (IOException) { }
        }
    }

    private static double[] Normal(int seed, double mean)
    {
        var random = new Random(seed);
        // Box–Muller, as the corpus data are drawn.
        return Enumerable.Range(0, 4000)
            .Select(_ => mean + Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble())).ToArray();
    }

    private static void Write(string folder, string name, double[] values)
    {
        var csv = new StringBuilder("x\n");
        foreach (var v in values) csv.Append(v.ToString("R", CultureInfo.InvariantCulture)).Append('\n');
        File.WriteAllText(Path.Combine(folder, name), csv.ToString());
    }
}
