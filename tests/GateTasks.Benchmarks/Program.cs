using BenchmarkDotNet.Running;
using GateTasks.Benchmarks.Harness;

namespace GateTasks.Benchmarks;

/// <summary>
/// <c>kernels [BenchmarkDotNet options]</c> runs the kernel benchmarks; the other modes are the end-to-end
/// harness's steps (tests/benchmarks/run.sh): generate, contract, export-reference, export-npy, fill; and
/// <c>kernel-subsample</c>, the kernel distance's sample side timed alone on a sample.
/// </summary>
public static class Program
{
    private const string Usage = """
        usage: GateTasks.Benchmarks kernels [BenchmarkDotNet options, e.g. --filter '*' --job short]
               GateTasks.Benchmarks generate --out FILE --events N [--row-groups N] [--seed N]
               GateTasks.Benchmarks contract --out FILE --sample PATH --reference PATH [--kinds K1,K2,…]
               GateTasks.Benchmarks export-reference --reference FILE --out JSON
               GateTasks.Benchmarks export-npy --sample FILE --out NPY
               GateTasks.Benchmarks fill --reference FILE --sample FILE --out JSON
               GateTasks.Benchmarks kernel-subsample --sample FILE [--features N] [--rows K]
               GateTasks.Benchmarks sliced-fill --reference FILE --sample FILE [--repeat N]
        """;

    public static int Main(string[] args)
    {
        if (args.Length == 0)
        {
            Console.Error.WriteLine(Usage);
            return 2;
        }
        if (args[0] == "kernels")
        {
            BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args[1..]);
            return 0;
        }

        var options = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var i = 1; i < args.Length; i++)
        {
            if (!args[i].StartsWith("--", StringComparison.Ordinal) || i + 1 == args.Length)
                return Fail($"expected '--name value' pairs after the mode, got '{args[i]}'");
            options[args[i][2..]] = args[++i];
        }
        string Option(string name) => options.TryGetValue(name, out var v) ? v : throw new ArgumentException($"missing --{name}");
        long Number(string name, long fallback) =>
            options.TryGetValue(name, out var v) ? long.Parse(v, System.Globalization.CultureInfo.InvariantCulture) : fallback;

        try
        {
            switch (args[0])
            {
                case "generate":
                    SyntheticSampleWriter.WriteAsync(Option("out"), Number("events", 0), (int)Number("row-groups", 10), (int)Number("seed", 1))
                        .GetAwaiter().GetResult();
                    return 0;
                case "contract":
                    var kinds = options.TryGetValue("kinds", out var k) ? k.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries) : [];
                    File.WriteAllText(Option("out"), BenchmarkContract.Text(Option("sample"), Option("reference"), kinds));
                    return 0;
                case "export-reference":
                    ReferenceExport.Write(Option("reference"), Option("out"));
                    return 0;
                case "export-npy":
                    NpyWriter.Export(Option("sample"), SyntheticFeatures.Names, Option("out"));
                    return 0;
                case "fill":
                    TimedFill.Run(Option("reference"), Option("sample"), Option("out"));
                    return 0;
                case "kernel-subsample":
                    TimedKernelSubsample.Run(Option("sample"), (int)Number("features", 20), (int)Number("rows", 50_000));
                    return 0;
                case "pairs-cpu":
                    Console.WriteLine($"{Kernels.PairAccumulationBenchmarks.CpuNanosecondsPerEvent((int)Number("repeat", 20)):F2} ns CPU per event");
                    return 0;
                case "sliced-fill":
                    TimedSlicedFill.Run(Option("reference"), Option("sample"), (int)Number("repeat", 5));
                    return 0;
                default:
                    return Fail($"unknown mode '{args[0]}'");
            }
        }
        catch (Exception e) when (e is ArgumentException or FormatException or IOException or GateTasks.Engine.Diagnostics.GateInputException)
        {
            return Fail(e.Message);
        }
    }

    private static int Fail(string message)
    {
        Console.Error.WriteLine($"GateTasks.Benchmarks: {message}");
        Console.Error.WriteLine(Usage);
        return 2;
    }
}
