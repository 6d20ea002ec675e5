using System.CommandLine;
using GateTasks.Cli.Commands;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Cli;

/// <summary>
/// The command tree. A thin shell: it parses arguments, calls the engine and prints what the engine returns.
/// Input problems print as <c>file(line,col): error CODE: message</c> lines on stderr, never as stack traces.
/// </summary>
internal static class CliApp
{
    public static int Run(string[] args, TextWriter stdout, TextWriter stderr)
    {
        var root = new RootCommand("GateTasks: holds a generative surrogate's sample to the tolerances of a precision contract, against full-simulation reference histograms.");
        root.Subcommands.Add(CheckCommand.Create(stdout, stderr));
        root.Subcommands.Add(AcceptCommand.Create(stdout, stderr));
        root.Subcommands.Add(HistoryCommand.Create(stdout, stderr));
        root.Subcommands.Add(ReferenceCommand.Create(stdout, stderr));
        root.Subcommands.Add(DemoCommand.Create(stdout, stderr));
        root.Subcommands.Add(InputsCommand.Create(stdout, stderr));
        root.Subcommands.Add(CalibrateCommand.Create(stdout, stderr));
        root.Subcommands.Add(DraftCommand.Create(stdout, stderr));
        root.Subcommands.Add(PlanCommand.Create(stdout, stderr));
        root.Subcommands.Add(SchemaCommand.Create(stdout));
        root.Subcommands.Add(RankCommand.Create(stdout, stderr));
        root.Subcommands.Add(ShardCommands.Fill(stdout, stderr));
        root.Subcommands.Add(ShardCommands.Merge(stdout, stderr));

        var parse = root.Parse(args);
        if (parse.Errors.Count > 0)
        {
            foreach (var e in parse.Errors) stderr.WriteLine($"error {ErrorCodes.Usage}: {e.Message}");
            stderr.WriteLine("Run 'gatetasks --help' for usage.");
            return ExitCodes.InputError;
        }
        return parse.Invoke(new InvocationConfiguration { Output = stdout, Error = stderr, EnableDefaultExceptionHandler = false });
    }

    /// <summary>Runs a command body, turning input errors into one diagnostic line and exit code 2.</summary>
    public static int Guard(TextWriter stderr, Func<int> body)
    {
        try
        {
            return body();
        }
        catch (GateInputException e)
        {
            stderr.WriteLine(e.ToDiagnosticLine());
            return ExitCodes.InputError;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            // A bug, not bad input: say so in one line; the trace only on request.
            stderr.WriteLine($"internal error: {e.GetType().Name}: {e.Message}");
            if (Environment.GetEnvironmentVariable("GATETASKS_TRACE") == "1") stderr.WriteLine(e);
            else stderr.WriteLine("Set GATETASKS_TRACE=1 for details and please report it.");
            return ExitCodes.InternalError;
        }
    }
}
