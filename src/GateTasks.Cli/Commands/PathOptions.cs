using System.CommandLine;
using System.CommandLine.Parsing;

namespace GateTasks.Cli.Commands;

/// <summary>
/// Path options and arguments refuse an empty value (what an unset CI variable gives) as a usage error naming the
/// option (GATE0001, exit 2), before the command touches any file.
/// </summary>
internal static class PathOptions
{
    /// <summary>Adds the check to <paramref name="option"/>.</summary>
    public static Option<T> NotEmpty<T>(this Option<T> option)
    {
        option.Validators.Add(result => Check(result.Tokens, option.Name, result.AddError));
        return option;
    }

    /// <summary>Adds the check to <paramref name="argument"/>.</summary>
    public static Argument<T> NotEmpty<T>(this Argument<T> argument)
    {
        argument.Validators.Add(result => Check(result.Tokens, $"the {argument.Name} argument", result.AddError));
        return argument;
    }

    private static void Check(IReadOnlyList<Token> tokens, string name, Action<string> error)
    {
        if (tokens.Any(t => string.IsNullOrWhiteSpace(t.Value)))
            error($"{name}: the path is empty (an unset variable?); give a path, or leave the option out to use its default.");
    }
}
