using System.CommandLine;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Cli;

/// <summary>
/// The message for a word the parser did not recognise: an unknown option or command, with the nearest valid name
/// when one is close (the engine's <see cref="NearestName"/>, as for contract keys).
/// </summary>
internal static class UnknownToken
{
    /// <summary>The message for <paramref name="token"/>, given to <paramref name="command"/>.</summary>
    public static string Message(string token, Command command)
    {
        if (token.StartsWith("--", StringComparison.Ordinal))
        {
            // "--name=value" names the option before the sign.
            var name = token.Split('=', ':')[0];
            var names = OptionsOf(command).SelectMany(o => o.Aliases.Prepend(o.Name)).Where(n => n.StartsWith("--", StringComparison.Ordinal));
            return $"{UnknownOption} '{name}'{Suggestion(name, names)}";
        }
        if (token.StartsWith('-')) return $"{UnknownOption} '{token}'";
        if (command.Subcommands.Count > 0 && command.Arguments.Count == 0)
            return $"unknown command '{token}'{Suggestion(token, command.Subcommands.Where(c => !c.Hidden).Select(c => c.Name))}";
        return $"{UnexpectedArgument} '{token}'";
    }

    /// <summary>Whether <paramref name="message"/> reports an unknown option.</summary>
    public static bool IsUnknownOption(string message) => message.StartsWith(UnknownOption, StringComparison.Ordinal);

    /// <summary>Whether <paramref name="message"/> reports a stray word that is neither option nor command.</summary>
    public static bool IsUnexpectedArgument(string message) => message.StartsWith(UnexpectedArgument, StringComparison.Ordinal);

    private const string UnknownOption = "unknown option";
    private const string UnexpectedArgument = "unexpected argument";

    private static string Suggestion(string name, IEnumerable<string> candidates) =>
        NearestName.Find(name, candidates) is { } s ? $"; did you mean '{s}'?" : "";

    // The command's own options and those its ancestors give every subcommand (--help).
    private static IEnumerable<Option> OptionsOf(Command command)
    {
        foreach (var o in command.Options.Where(o => !o.Hidden)) yield return o;
        for (var parent = command.Parents.OfType<Command>().FirstOrDefault(); parent is not null; parent = parent.Parents.OfType<Command>().FirstOrDefault())
            foreach (var o in parent.Options.Where(o => o.Recursive && !o.Hidden))
                yield return o;
    }
}
