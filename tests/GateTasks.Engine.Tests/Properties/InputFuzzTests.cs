using System.Text;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Properties;

/// <summary>
/// Mutation fuzzing of the two parsers that take files from outside: the contract loader and the sample reader.
/// Every mutant must load, or be refused with a <see cref="GateInputException"/> (a code and a place), never
/// another exception. A fixed seed and a bounded number of mutants run in CI; set GATETASKS_FUZZ_ITERATIONS (and
/// GATETASKS_FUZZ_SEED) for a longer run on demand.
/// </summary>
public sealed class InputFuzzTests : IDisposable
{
    private static readonly int Iterations = int.TryParse(Environment.GetEnvironmentVariable("GATETASKS_FUZZ_ITERATIONS"), out var n) ? n : 300;
    private static readonly int Seed = int.TryParse(Environment.GetEnvironmentVariable("GATETASKS_FUZZ_SEED"), out var s) ? s : 20261202;
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-fuzz-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    // Pieces that tend to matter to YAML and to our keys.
    private static readonly string[] Splices =
        [":", " ", "\n", "- ", "[", "]", "{", "}", "&a ", "*a", "!!str ", "'", "\"", "#", "|", ">", "\t", "~", "null", "-1", "1e999", "nan",
         "0x10", "off", "on", "ks-max", "features", "expression: ", "sqrt(", "(((((", "\u0000", "\u202e", "\uFFFF"];

    [Fact]
    public void Mutated_contracts_load_or_are_refused_with_a_code_never_a_crash()
    {
        var rng = new Random(Seed);
        var original = DemoContract.Text;
        var refused = 0;
        for (var i = 0; i < Iterations; i++)
        {
            var text = Mutate(original, rng, 1 + rng.Next(4));
            try
            {
                ContractLoader.Parse(text, "fuzz.yaml");
            }
            catch (GateInputException e)
            {
                refused++;
                Assert.False(string.IsNullOrWhiteSpace(e.Message));
                Assert.StartsWith("GATE", e.Code);
            }
            catch (Exception e)
            {
                Assert.Fail($"mutant {i} (seed {Seed}) threw {e}\n--- contract ---\n{text}");
            }
        }
        Assert.InRange(refused, 1, Iterations); // the mutations do reach the error paths
    }

    [Fact]
    public void Damaged_parquet_samples_read_or_are_refused_with_a_code_never_a_crash()
    {
        var path = Path.Combine(_dir, "sample.parquet");
        DemoSampleWriter.Write(path, DemoScenarioParameters.FullSimulation, 3_000, 5, 1_000);
        var bytes = File.ReadAllBytes(path);
        var rng = new Random(Seed);
        var mutant = Path.Combine(_dir, "mutant.parquet");
        var refused = 0;
        for (var i = 0; i < Math.Max(20, Iterations / 3); i++)
        {
            var damaged = bytes.ToArray();
            switch (rng.Next(3))
            {
                case 0: // flip a few bits anywhere
                    for (var k = 0; k < 1 + rng.Next(8); k++) damaged[rng.Next(damaged.Length)] ^= (byte)(1 << rng.Next(8));
                    break;
                case 1: // cut the file short
                    damaged = damaged[..rng.Next(damaged.Length)];
                    break;
                default: // overwrite a run of bytes
                    var at = rng.Next(damaged.Length);
                    for (var k = at; k < Math.Min(damaged.Length, at + 1 + rng.Next(64)); k++) damaged[k] = (byte)rng.Next(256);
                    break;
            }
            File.WriteAllBytes(mutant, damaged);
            try
            {
                var sample = Sample.Open([mutant]);
                var names = sample.Columns.Where(c => c.Type != SampleValueType.Unsupported).Select(c => c.Name).ToList();
                foreach (var _ in sample.ReadBatches(names, new ReadPass("fuzz", Threads: 1 + i % 2))) { }
            }
            catch (GateInputException e)
            {
                refused++;
                Assert.StartsWith("GATE2", e.Code);
                Assert.Contains("mutant.parquet", e.Message);
            }
            catch (Exception e)
            {
                Assert.Fail($"mutant {i} (seed {Seed}) threw {e.GetType().Name}: {e.Message}");
            }
        }
        Assert.True(refused > 0);
    }

    private static string Mutate(string text, Random rng, int edits)
    {
        var sb = new StringBuilder(text);
        for (var e = 0; e < edits && sb.Length > 0; e++)
        {
            var at = rng.Next(sb.Length);
            switch (rng.Next(5))
            {
                case 0: sb.Remove(at, Math.Min(sb.Length - at, 1 + rng.Next(12))); break;
                case 1: sb.Insert(at, Splices[rng.Next(Splices.Length)]); break;
                case 2: sb[at] = (char)rng.Next(32, 127); break;
                case 3:
                {
                    // Duplicate a line (duplicate keys, duplicate features).
                    var lines = sb.ToString().Split('\n').ToList();
                    var line = rng.Next(lines.Count);
                    lines.Insert(line, lines[line]);
                    sb.Clear().Append(string.Join('\n', lines));
                    break;
                }
                default:
                {
                    // Swap two lines (structure out of place).
                    var lines = sb.ToString().Split('\n');
                    var (a, b) = (rng.Next(lines.Length), rng.Next(lines.Length));
                    (lines[a], lines[b]) = (lines[b], lines[a]);
                    sb.Clear().Append(string.Join('\n', lines));
                    break;
                }
            }
        }
        return sb.ToString();
    }
}
