using System.CommandLine;
using System.Reflection;
using System.Text.RegularExpressions;
using GateTasks.Cli;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The help as docs/cli.md describes it. These tests compare the program with itself: the command tree the CLI
/// builds against the help text it prints, and the exit codes it defines against the help and the README.
/// </summary>
public class HelpTextTests
{
    private static readonly RootCommand Tree = CliApp.Build(new CommandOutput(TextWriter.Null, TextWriter.Null));

    private static IEnumerable<(string[] Path, Command Command)> Commands(Command command, string[] path)
    {
        yield return (path, command);
        foreach (var sub in command.Subcommands)
            foreach (var found in Commands(sub, [.. path, sub.Name]))
                yield return found;
    }

    private static IEnumerable<(string[] Path, Command Command)> AllCommands() => Commands(Tree, []);

    [Fact]
    public void Every_option_that_takes_a_value_shows_a_placeholder_naming_it()
    {
        var checkedOptions = 0;
        foreach (var (path, command) in AllCommands())
        {
            var (code, stdout, stderr) = Cli.Run([.. path, "--help"]);
            Assert.True(code == 0, $"gatetasks {string.Join(' ', path)} --help exited {code}: {stderr}");
            foreach (var option in command.Options.Where(o => !o.Hidden && o.Arity.MaximumNumberOfValues > 0 && o.ValueType != typeof(bool)))
            {
                // docs/cli.md: every option that takes a value shows what it takes (FILE, DIR, N, …), not its own name.
                Assert.False(string.IsNullOrWhiteSpace(option.HelpName), $"{option.Name} of 'gatetasks {string.Join(' ', path)}' has no placeholder");
                Assert.Contains($"{option.Name} <{option.HelpName}>", stdout);
                checkedOptions++;
            }
        }
        Assert.True(checkedOptions > 30, $"only {checkedOptions} options found: the walk of the command tree is broken");
    }

    [Fact]
    public void A_command_group_run_alone_lists_its_subcommands_with_the_usage_exit_code()
    {
        var groups = AllCommands().Where(c => c.Command.Subcommands.Count > 0).ToList();
        Assert.Contains(groups, g => g.Command.Name == "reference");
        foreach (var (path, command) in groups)
        {
            var (code, stdout, stderr) = Cli.Run(path);
            // docs/cli.md: a command group alone lists its commands and exits 2, the usage exit code.
            Assert.Equal(2, code);
            Assert.DoesNotContain("GATE0001", stderr);
            foreach (var sub in command.Subcommands)
                Assert.Matches(new Regex($@"(?m)^  {Regex.Escape(sub.Name)} +{Regex.Escape(HelpLayout.Summary(sub.Description))}$"), stdout);
        }
        Assert.Contains("  build  Build the reference file from a trusted sample.", Cli.Run("reference").Stdout);
    }

    [Theory]
    [InlineData("check --contrat x.yaml", "unknown option '--contrat'; did you mean '--contract'?")]
    [InlineData("reference build --form trusted.parquet", "unknown option '--form'; did you mean '--from'?")]
    [InlineData("rank --jsn out.json a.parquet", "unknown option '--jsn'; did you mean '--json'?")]
    [InlineData("chek", "unknown command 'chek'; did you mean 'check'?")]
    public void A_misspelt_option_or_command_gets_the_nearest_name(string args, string expected)
    {
        var (code, _, stderr) = Cli.Run(args.Split(' '));
        // docs/cli.md: a misspelt option or command is a usage error (GATE0001, exit 2) naming the nearest valid one.
        Assert.Equal(2, code);
        Assert.Contains($"error GATE0001: {expected}", stderr);
        Assert.DoesNotContain("unexpected argument", stderr);
        Assert.DoesNotContain(" at ", stderr);
    }

    [Fact]
    public void An_option_far_from_every_name_gets_no_guess()
    {
        var (code, _, stderr) = Cli.Run("check", "--zzzzzzzzzz");
        Assert.Equal(2, code);
        Assert.Contains("error GATE0001: unknown option '--zzzzzzzzzz'", stderr);
        Assert.DoesNotContain("did you mean", stderr);
    }

    [Fact]
    public void The_root_help_lists_the_commands_in_workflow_order_then_the_plumbing()
    {
        var (code, stdout, _) = Cli.Run("--help");
        Assert.Equal(0, code);
        var listed = Section(stdout, "Commands:").Select(line => line.Split(' ', StringSplitOptions.RemoveEmptyEntries)[0]).ToList();
        // docs/cli.md: draft → reference → plan → check → accept → history → rank, then the plumbing.
        string[] workflow = ["draft", "reference", "plan", "check", "accept", "history", "rank"];
        Assert.Equal(workflow, listed.Take(workflow.Length));
        Assert.Equal(Tree.Subcommands.Select(c => c.Name).Order(), listed.Order());
    }

    [Fact]
    public void The_root_help_lists_every_exit_code_the_cli_defines()
    {
        var defined = typeof(ExitCodes).GetFields(BindingFlags.Public | BindingFlags.Static)
            .Where(f => f.IsLiteral && f.FieldType == typeof(int)).Select(f => (int)f.GetRawConstantValue()!).Order().ToList();
        var (_, stdout, _) = Cli.Run("--help");
        var inHelp = Section(stdout, "Exit codes:").Select(line => int.Parse(line.Trim().Split(' ')[0])).Order().ToList();
        Assert.Equal(defined, inHelp);
        Assert.True(stdout.TrimEnd().EndsWith(Section(stdout, "Exit codes:").Last().TrimEnd(), StringComparison.Ordinal), "the exit codes end the root help");

        foreach (var doc in new[] { "README.md", Path.Combine("docs", "cli.md") })
        {
            var text = File.ReadAllText(Path.Combine(RepositoryRoot.Path, doc));
            var table = text[text.IndexOf("| code | meaning |", StringComparison.Ordinal)..];
            var inDoc = Regex.Matches(table, @"^\| (\d+) \|", RegexOptions.Multiline).Select(m => int.Parse(m.Groups[1].Value)).Order().ToList();
            Assert.Equal(defined, inDoc);
        }
    }

    // The indented lines under a heading of the help, up to the next blank line.
    private static List<string> Section(string help, string heading)
    {
        var lines = help.Split('\n').Select(l => l.TrimEnd('\r')).ToList();
        return lines.SkipWhile(l => l != heading).Skip(1).TakeWhile(l => l.StartsWith("  ", StringComparison.Ordinal)).ToList();
    }
}
