using System.CommandLine;
using System.CommandLine.Parsing;
using GateTasks.Cli.Commands;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Cli;

/// <summary>
/// The command tree. A thin shell: it parses arguments, calls the engine and prints what the engine returns.
/// Input problems print as <c>file(line,col): error CODE: message</c> lines on stderr, never as stack traces.
/// </summary>
internal static class CliApp
{
    /// <summary>Runs the command line; the build step's record stream too when the environment names its file.</summary>
    public static int Run(string[] args, TextWriter stdout, TextWriter stderr)
    {
        RecordFile? records;
        try
        {
            records = RecordFile.FromEnvironment();
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException)
        {
            stderr.WriteLine(Diagnostic.Error(ErrorCodes.OutputNotWritable, $"Cannot write the record stream named by {RunRecord.EnvironmentVariable}: {e.Message}").Line);
            return ExitCodes.InputError;
        }
        using (records) return Run(args, new CommandOutput(stdout, stderr, records));
    }

    private static int Run(string[] args, CommandOutput output)
    {
        var parse = Build(output).Parse(args);
        var command = parse.CommandResult.Command;
        // A command that takes paths as arguments (rank, merge) takes a misspelt option as one of them; before a
        // "--" separator, a word starting with "--" is meant as an option.
        var strays = args.Contains("--") ? [] : parse.CommandResult.Children.OfType<ArgumentResult>()
            .SelectMany(a => a.Tokens).Select(t => t.Value).Where(v => v.StartsWith("--", StringComparison.Ordinal)).Distinct().ToList();
        if (parse.Errors.Count > 0 || strays.Count > 0)
        {
            var unknown = parse.UnmatchedTokens.Distinct().ToList();
            var messages = strays.Select(t => UnknownToken.Message(t, command)).ToList();
            foreach (var e in parse.Errors)
            {
                // The parser's "unrecognized" error for a word becomes a message that names the nearest valid one.
                var token = unknown.FirstOrDefault(t => e.Message.Contains($"'{t}'", StringComparison.Ordinal));
                var message = token is null ? e.Message : UnknownToken.Message(token, command);
                if (!messages.Contains(message)) messages.Add(message);
            }
            // A misspelt option leaves its value as a stray word; naming that too would only distract.
            if (messages.Any(UnknownToken.IsUnknownOption)) messages.RemoveAll(UnknownToken.IsUnexpectedArgument);
            foreach (var message in messages) output.Diagnostic(Diagnostic.Error(ErrorCodes.Usage, message));
            output.ErrorDetail($"Run '{HelpLayout.CommandPath(command)} --help' for usage.");
            return ExitCodes.InputError;
        }
        return parse.Invoke(new InvocationConfiguration { Output = output.Out, Error = output.Error, EnableDefaultExceptionHandler = false });
    }

    /// <summary>
    /// The command tree, its commands in the order of the workflow (draft, reference, plan, check, accept, history,
    /// rank), then the plumbing.
    /// </summary>
    internal static RootCommand Build(CommandOutput output)
    {
        var (stdout, stderr) = (output.Out, output.Error);
        var root = new RootCommand("GateTasks: holds a generative surrogate's sample to the tolerances of a precision contract, against full-simulation reference histograms.");
        root.Subcommands.Add(DraftCommand.Create(stdout, stderr));
        root.Subcommands.Add(ReferenceCommand.Create(stdout, stderr));
        root.Subcommands.Add(PlanCommand.Create(stdout, stderr));
        root.Subcommands.Add(CheckCommand.Create(output));
        root.Subcommands.Add(AcceptCommand.Create(stdout, stderr));
        root.Subcommands.Add(HistoryCommand.Create(stdout, stderr));
        root.Subcommands.Add(RankCommand.Create(stdout, stderr));
        root.Subcommands.Add(ShardCommands.Fill(stdout, stderr));
        root.Subcommands.Add(ShardCommands.Merge(stdout, stderr));
        root.Subcommands.Add(CalibrateCommand.Create(stdout, stderr));
        root.Subcommands.Add(DemoCommand.Create(stdout, stderr));
        root.Subcommands.Add(InputsCommand.Create(output));
        root.Subcommands.Add(SchemaCommand.Create(stdout));
        HelpLayout.Install(root, stdout);
        return root;
    }

    /// <summary>Runs a command body, turning input errors into one diagnostic line and exit code 2.</summary>
    public static int Guard(TextWriter stderr, Func<int> body) => Guard(new CommandOutput(TextWriter.Null, stderr), body);

    /// <summary>Runs a command body, turning input errors into one diagnostic (line and record) and exit code 2.</summary>
    public static int Guard(CommandOutput output, Func<int> body)
    {
        try
        {
            return body();
        }
        catch (GateInputException e)
        {
            output.Diagnostic(Diagnostic.From(e));
            return ExitCodes.InputError;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            // A bug, not bad input: say so in one line; the trace only on request.
            output.ErrorDetail($"internal error: {e.GetType().Name}: {e.Message}");
            if (Environment.GetEnvironmentVariable("GATETASKS_TRACE") == "1") output.Error.WriteLine(e);
            else output.ErrorDetail("Set GATETASKS_TRACE=1 for details and please report it.");
            return ExitCodes.InternalError;
        }
    }
}
