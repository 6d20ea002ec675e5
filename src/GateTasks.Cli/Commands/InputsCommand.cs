using System.CommandLine;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Runs;

namespace GateTasks.Cli.Commands;

/// <summary>
/// <c>gatetasks inputs</c>: lists, one absolute path per line, the files a check would read. The build step uses
/// it to know when a check is up to date.
/// </summary>
internal static class InputsCommand
{
    public static Command Create(CommandOutput output)
    {
        var contract = SharedOptions.Contract();
        var sample = SharedOptions.Sample();
        var dependencies = new Option<bool>("--dependencies")
        {
            Description = "Also list, each after 'depends ', the files and folders whose state decides the list (for caching it).",
        };
        var command = new Command("inputs", "List the files a check reads (contract, reference, sample files), one per line.") { contract, sample, dependencies };
        command.SetAction(parse => CliApp.Guard(output, () =>
        {
            var loaded = ContractLoader.Load(parse.GetValue(contract)!);
            foreach (var path in ContractInputs.All(loaded, parse.GetValue(sample)))
                output.Input(path);
            if (parse.GetValue(dependencies))
                foreach (var path in ContractInputs.Dependencies(loaded, parse.GetValue(sample)))
                    output.Dependency(path);
            return ExitCodes.Success;
        }));
        return command;
    }
}
