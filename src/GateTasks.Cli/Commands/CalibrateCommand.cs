using System.CommandLine;
using System.Globalization;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.IO;
using GateTasks.Engine.References;
using GateTasks.Engine.Reports;

namespace GateTasks.Cli.Commands;

/// <summary>
/// <c>gatetasks calibrate</c>: measures the contract's false-alarm rate on null replicas and its detection rate on
/// injected drifts, by simulation from the reference (per-feature, pair and joint checks alike), and again on null
/// replicas whose surrogate events carry signed weights. Exit 0 when the null false-alarm rate is consistent with the
/// contract's level, 1 when it is not.
/// </summary>
internal static class CalibrateCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var replicas = new Option<int>("--replicas") { HelpName = "N", Description = "Replicas per row.", DefaultValueFactory = _ => 500 };
        var events = new Option<string>("--events") { HelpName = "N[,N...]", Description = "Surrogate sample sizes, comma-separated.", DefaultValueFactory = _ => "100000,1000000" };
        var feature = new Option<string?>("--feature") { HelpName = "FEATURE", Description = "Feature to drift (default: the first continuous one; the first discrete one for the spike-fraction drift)." };
        var seed = new Option<int>("--seed") { HelpName = "N", Description = "Seed of the study.", DefaultValueFactory = _ => 1 };
        var negative = new Option<double>("--negative-fraction")
        {
            HelpName = "FRACTION",
            Description = "Share of surrogate events weighing -1 (the rest +1) in the extra weighted null rows; 0: none.", DefaultValueFactory = _ => 0.1,
        };
        var markdown = new Option<string?>("--markdown") { HelpName = "FILE", Description = "Also write the table to this Markdown file." }.NotEmpty();
        var command = new Command("calibrate", "Measure the contract's false-alarm rate (null replicas) and detection rate (injected drifts) by simulation from the reference.")
        {
            contract, replicas, events, feature, seed, negative, markdown,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var f = parse.GetValue(negative);
            if (!(f >= 0 && f < 0.5)) throw new Engine.Diagnostics.GateInputException(Engine.Diagnostics.ErrorCodes.Usage, "--negative-fraction must be at least 0 and below 0.5.");
            var c = ContractLoader.Load(parse.GetValue(contract)!);
            new RunPaths().Contract(c).Write(parse.GetValue(markdown), "--markdown").Verify();
            var reference = ReferenceFile.Read(c.ReferenceFullPath, c.ReferenceLocation);
            var sizes = parse.GetValue(events)!.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
                .Select(s => long.TryParse(s, NumberStyles.Integer, CultureInfo.InvariantCulture, out var n) && n > 0 ? n
                    : throw new Engine.Diagnostics.GateInputException(Engine.Diagnostics.ErrorCodes.Usage, $"--events: '{s}' is not a positive whole number."))
                .ToList();
            var n = parse.GetValue(replicas);
            if (n < 1) throw new Engine.Diagnostics.GateInputException(Engine.Diagnostics.ErrorCodes.Usage, "--replicas must be at least 1.");
            var results = new List<CalibrationResult>();
            foreach (var size in sizes)
            {
                foreach (var drift in new[] { Drift.Null }.Concat(Drift.Standard))
                {
                    if (drift.Kind != DriftKind.None && (parse.GetValue(feature) ?? CalibrationStudy.DefaultFeature(c, drift)) is null) continue;
                    var target = drift.Kind == DriftKind.SpikeFraction ? null : parse.GetValue(feature);
                    results.Add(CalibrationStudy.Run(c, reference, drift, target, size, n, parse.GetValue(seed)));
                    stderr.WriteLine($"  {drift.Label} at {size} events: done");
                }
                if (f > 0)
                {
                    var law = new WeightLaw(f);
                    results.Add(CalibrationStudy.Run(c, reference, Drift.Null, null, size, n, parse.GetValue(seed), law));
                    stderr.WriteLine($"  {Drift.Null.Label}, weights {law.Label}, at {size} events: done");
                }
            }
            var table = CalibrationTable.Format(c, results);
            stdout.Write(table);
            if (parse.GetValue(markdown) is { } path) AtomicFile.WriteText(path, table);
            var ok = CalibrationTable.NullWithinLevel(c, results);
            stdout.WriteLine(ok
                ? "The false-alarm rate on null replicas is within the contract's level."
                : "The false-alarm rate on null replicas EXCEEDS the contract's level.");
            return ok ? ExitCodes.Success : ExitCodes.ChecksFailed;
        }));
        return command;
    }
}
