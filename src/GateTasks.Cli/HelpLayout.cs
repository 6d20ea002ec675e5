using System.CommandLine;
using System.CommandLine.Help;
using System.CommandLine.Invocation;

namespace GateTasks.Cli;

/// <summary>
/// What the help shows beyond the parser's default sections: the root's <c>--help</c> ends with the exit codes, and
/// a command that only groups others (the root, <c>reference</c>), run without one of them, lists them instead of
/// failing with a bare parse error.
/// </summary>
internal static class HelpLayout
{
    /// <summary>Adds the exit-code section to the root's help and the listing action to every command group.</summary>
    public static void Install(RootCommand root, TextWriter stdout)
    {
        if (root.Options.OfType<HelpOption>().SingleOrDefault() is { Action: { } standard } help)
            help.Action = new WithExitCodes(standard, stdout);
        foreach (var group in Groups(root))
            group.SetAction(_ =>
            {
                WriteListing(group, stdout);
                return ExitCodes.InputError;
            });
    }

    /// <summary>The first clause of a command's description: a listing keeps one line per command.</summary>
    public static string Summary(string? description)
    {
        if (string.IsNullOrEmpty(description)) return "";
        for (var i = 0; i < description.Length - 1; i++)
        {
            if (description[i + 1] != ' ') continue;
            if (description[i] == ':' || (description[i] == '.' && !EndsWithAbbreviation(description, i))) return description[..i] + ".";
        }
        return description.TrimEnd('.') + ".";
    }

    // "e.g." and "i.e." end no sentence.
    private static bool EndsWithAbbreviation(string text, int dot) =>
        dot >= 3 && (text.Substring(dot - 3, 4) is "e.g." or "i.e.");

    private static IEnumerable<Command> Groups(Command command)
    {
        if (command.Subcommands.Count > 0 && command.Action is null) yield return command;
        foreach (var sub in command.Subcommands)
            foreach (var group in Groups(sub))
                yield return group;
    }

    private static void WriteListing(Command group, TextWriter output)
    {
        var path = CommandPath(group);
        output.WriteLine($"{path}: name one of these commands.");
        output.WriteLine();
        var width = group.Subcommands.Max(c => c.Name.Length);
        foreach (var sub in group.Subcommands.Where(c => !c.Hidden))
            output.WriteLine($"  {sub.Name.PadRight(width)}  {Summary(sub.Description)}");
        output.WriteLine();
        output.WriteLine($"Run '{path} COMMAND --help' for a command's options{(group is RootCommand ? ", 'gatetasks --help' for the exit codes" : "")}.");
    }

    /// <summary>"gatetasks reference" for the <c>reference</c> command: the words that run it.</summary>
    public static string CommandPath(Command command)
    {
        var words = new List<string>();
        for (Command? c = command; c is not null; c = c.Parents.OfType<Command>().FirstOrDefault())
            words.Insert(0, c is RootCommand ? "gatetasks" : c.Name);
        return string.Join(' ', words);
    }

    // The parser's help, then, for the root alone, the table of exit codes.
    private sealed class WithExitCodes(CommandLineAction standard, TextWriter stdout) : SynchronousCommandLineAction
    {
        // As the parser's own help: shown even when the command's required options are missing.
        public override bool ClearsParseErrors => true;

        public override int Invoke(ParseResult parse)
        {
            var exit = standard is SynchronousCommandLineAction s ? s.Invoke(parse) : 0;
            if (parse.CommandResult.Command is not RootCommand) return exit;
            stdout.WriteLine("Exit codes:");
            foreach (var (code, meaning) in ExitCodes.Meanings) stdout.WriteLine($"  {code}  {meaning}");
            stdout.WriteLine();
            return exit;
        }
    }
}
