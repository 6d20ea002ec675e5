using System.CommandLine;
using GateTasks.Engine.Contracts;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks schema</c>: prints the contract's JSON Schema, for editors.</summary>
internal static class SchemaCommand
{
    public static Command Create(TextWriter stdout)
    {
        var command = new Command("schema", "Print the JSON Schema of precision contracts (for editor completion and validation).");
        command.SetAction(_ =>
        {
            stdout.Write(ContractSchema.Text);
            return ExitCodes.Success;
        });
        return command;
    }
}
