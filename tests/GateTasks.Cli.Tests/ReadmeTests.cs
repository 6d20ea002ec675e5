using System.CommandLine;
using System.Text.RegularExpressions;
using GateTasks.Cli;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The README as a newcomer reads it: the path from a trusted sample to a gate on its first screen, in commands the
/// CLI accepts as written. These tests compare the documents with the program itself.
/// </summary>
public class ReadmeTests
{
    private static string Readme => File.ReadAllText(Path.Combine(RepositoryRoot.Path, "README.md"));

    [Fact]
    public void The_onboarding_commands_are_on_the_first_screen_in_workflow_order_and_parse()
    {
        var lines = Readme.Split('\n');
        // The first screen: 40 lines after the opening paragraph (the first paragraph after the title).
        var afterOpening = Array.FindIndex(lines, 2, l => l.Trim().Length == 0);
        var screen = lines.Skip(afterOpening).Take(40).ToList();
        string[] path = ["draft", "reference build", "plan", "check", "accept"];
        var at = path.Select(c => screen.FindIndex(l => l.StartsWith($"gatetasks {c} ", StringComparison.Ordinal))).ToList();
        Assert.DoesNotContain(-1, at);
        Assert.Equal(at.Order(), at);

        var tree = CliApp.Build(new CommandOutput(TextWriter.Null, TextWriter.Null));
        foreach (var i in at)
        {
            var command = screen[i].Split('#')[0].Trim();
            var words = Regex.Matches(command, "'[^']*'|\"[^\"]*\"|\\S+").Select(m => m.Value.Trim('\'', '"')).Skip(1).ToArray();
            var parse = tree.Parse(words);
            Assert.True(parse.Errors.Count == 0, $"{command}: {string.Join("; ", parse.Errors.Select(e => e.Message))}");
            Assert.Empty(parse.UnmatchedTokens);
        }
    }

    [Fact]
    public void The_performance_section_keeps_the_targets_and_links_the_measurements()
    {
        var readme = Readme;
        var section = readme[readme.IndexOf("## Performance and memory", StringComparison.Ordinal)..readme.IndexOf("## Layout", StringComparison.Ordinal)];
        Assert.Contains("| target | measured | result |", section);
        Assert.Contains("](docs/performance.md)", section);
        Assert.DoesNotContain("| run | events |", section);

        var doc = File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "performance.md"));
        foreach (var moved in new[] { "| run | events |", "| joint block over 20 features |", "## Memory", "52.8 s → 11.8 s" })
            Assert.Contains(moved, doc);
    }
}
