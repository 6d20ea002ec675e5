using System.CommandLine;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Planning;
using GateTasks.Engine.References;
using GateTasks.Engine.Reports;

namespace GateTasks.Cli.Commands;

/// <summary>
/// <c>gatetasks plan</c>: per check, the surrogate size at which a perfect surrogate passes, and the smallest drift it
/// catches at a given size; then the size for the whole contract. By simulation from the reference.
/// </summary>
internal static class PlanCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var events = new Option<long?>("--events") { HelpName = "N", Description = "Surrogate size to state the detectable drifts at (default: the size the whole contract needs, else 1000000)." };
        var replicas = new Option<int>("--replicas") { HelpName = "N", Description = "Replicas per simulated point.", DefaultValueFactory = _ => 200 };
        var power = new Option<double>("--power") { HelpName = "PROBABILITY", Description = "Probability with which a detectable drift must fail its check.", DefaultValueFactory = _ => 0.95 };
        var seed = new Option<int>("--seed") { HelpName = "N", Description = "Seed of the simulation.", DefaultValueFactory = _ => 1 };
        var markdown = new Option<string?>("--markdown") { HelpName = "FILE", Description = "Also write the plan to this Markdown file." }.NotEmpty();
        var json = SharedOptions.Json("plan");
        var command = new Command("plan", "Plan the surrogate sample size: per check the events a perfect surrogate needs to pass and the smallest drift caught at a given size, by simulation from the reference.")
        {
            contract, events, replicas, power, seed, markdown, json,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () => ResultJsonRun.Run(parse.GetValue(json), "plan", parse.GetValue(contract)!,
            c => new RunPaths().Contract(c).Write(parse.GetValue(markdown), "--markdown"),
            (c, result) =>
        {
            var reference = ReferenceFile.Read(c.ReferenceFullPath, c.ReferenceLocation);
            if (parse.GetValue(events) is { } n && n < 1) throw new GateInputException(ErrorCodes.Usage, "--events must be a positive whole number.");
            var r = parse.GetValue(replicas);
            if (r < 20) throw new GateInputException(ErrorCodes.Usage, "--replicas must be at least 20 for a rate to mean anything.");
            var p = parse.GetValue(power);
            if (!(p > 0.5 && p < 1)) throw new GateInputException(ErrorCodes.Usage, "--power must lie between 0.5 and 1.");
            var plan = PlanStudy.Run(c, reference, parse.GetValue(events), r, parse.GetValue(seed), p);
            var table = PlanTable.Format(c, plan);
            stdout.Write(table);
            if (parse.GetValue(markdown) is { } path) AtomicFile.WriteText(path, table);
            if (result.Path is { } jsonPath)
            {
                PlanJson.Write(jsonPath, c, FileDigest.Sha256(c.ReferenceFullPath), plan);
                result.Finished();
                stdout.WriteLine($"JSON result: {Path.GetFullPath(jsonPath)}");
            }
            return ExitCodes.Success;
        })));
        return command;
    }
}
