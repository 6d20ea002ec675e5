using System.Text.RegularExpressions;
using System.Xml.Linq;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Cli.Tests.Corpus;

/// <summary>
/// Runs every case of tests/corpus through the gatetasks program, in a process of its own as a build runs it, and
/// asserts its documented error (docs/error-codes.md): exit code, code, file, line and column, a phrase of the
/// message; no stack trace; and, for a check, a JUnit report that names the error and claims no pass.
/// </summary>
public sealed class BadInputCorpusTests
{
    public static TheoryData<string> Cases() => new(CorpusCase.All.Select(c => c.Name));

    [Fact]
    public void The_corpus_holds_every_kind_of_bad_input_the_gate_must_refuse()
    {
        // A guard against cases going missing: the list the corpus was written for.
        var expected = new[]
        {
            "alias-bomb",
            "altered-reference",
            "base-revision-without-repository",
            "binning-outside-reference",
            "bit-flipped-page",
            "bit-flipped-page-header",
            "category-check-not-inherited",
            "category-not-listed",
            "category-repeated",
            "corrupted-ledger",
            "csv-cell-not-a-number",
            "csv-header-not-utf8",
            "csv-semicolon-separated",
            "deep-yaml",
            "definition-changed",
            "duplicate-feature",
            "duplicate-reference-shard",
            "duplicate-shard-content",
            "edited-partial",
            "empty-sample",
            "expression-backquoted-name",
            "expression-non-finite",
            "expression-read-as-mapping",
            "extreme-magnitudes",
            "html-in-csv-cell",
            "ledger-is-directory",
            "long-expression",
            "malformed-yaml",
            "non-finite-allowed",
            "non-finite-values",
            "not-parquet",
            "only-nan-sample",
            "other-binning",
            "page-grown-no-checksum",
            "page-sizes-disagree",
            "parquet-duplicate-column",
            "path-outside-repository",
            "path-outside-through-link",
            "reference-column-missing",
            "reference-flipped-cell",
            "region-without-reference",
            "schema-column-missing",
            "schema-type-changed",
            "selection-keeps-no-sample-event",
            "selection-logic-word",
            "selection-selects-nothing",
            "share-scaling-bound",
            "share-scaling-unknown-rule",
            "symlink-loop",
            "truncated-page-no-checksum",
            "truncated-parquet",
            "unknown-column",
            "unknown-key",
            "weight-missing",
            "weight-not-finite",
            "weights-all-negative",
            "weights-all-zero",
            "weights-some-negative",
            "weights-subnormal",
            "wrong-type",
            "yaml-tab-indentation",
            "yaml-undefined-alias",
            "zero-variance",
        };
        Assert.Equal(expected, CorpusCase.All.Select(c => c.Name).Order(StringComparer.Ordinal));
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Each_case_gives_its_documented_error(string name)
    {
        var c = CorpusCase.All.Single(x => x.Name == name);
        var folder = Directory.CreateTempSubdirectory("gatetasks-corpus-").FullName;
        try
        {
            Prepare(c, folder);
            var args = c.Run.ToList();
            if (!args.Contains("--contract")) args.AddRange(["--contract", "contract.yaml"]);
            var isCheck = args[0] == "check";
            if (isCheck) args.AddRange(["--junit", "report.xml"]);

            var (exit, stdout, stderr) = Gatetasks(folder, args);
            var all = stdout + stderr;
            // GATETASKS_CORPUS_LOG=FILE collects what every case printed, for reading the messages side by side.
            if (Environment.GetEnvironmentVariable("GATETASKS_CORPUS_LOG") is { Length: > 0 } log)
                File.AppendAllText(log, $"== {c.Name}: exit {exit}\n{stderr.Replace(folder + Path.DirectorySeparatorChar, "", StringComparison.Ordinal)}");
            Assert.False(Regex.IsMatch(all, @"^\s+at \S+\(.*\)", RegexOptions.Multiline), $"{c.Name}: a stack trace was printed:\n{all}");
            Assert.DoesNotContain("Unhandled exception", all);
            Assert.True(exit == c.Expect.Exit, $"{c.Name} ({c.About}): exit {exit}, expected {c.Expect.Exit}\n{all}");

            if (c.Expect.Code is { } code) AssertErrorLine(c, folder, code, stderr);
            else Assert.Contains(c.Expect.Says, stdout);
            if (isCheck) AssertReport(c, Path.Combine(folder, "report.xml"));
        }
        finally
        {
            try { Directory.Delete(folder, recursive: true); } catch (IOException) { }
        }
    }

    private static void Prepare(CorpusCase c, string folder)
    {
        Directory.CreateDirectory(Path.Combine(folder, ".git")); // the scratch folder is the repository
        CorpusData.Write(folder);
        foreach (var source in new[] { CorpusCase.BaseFolder, c.Folder })
            foreach (var file in Directory.GetFiles(source, "*", SearchOption.AllDirectories))
            {
                var relative = Path.GetRelativePath(source, file);
                if (relative == "case.yaml") continue;
                var target = Path.Combine(folder, relative);
                Directory.CreateDirectory(Path.GetDirectoryName(target)!);
                File.Copy(file, target, overwrite: true);
            }
        foreach (var step in c.Prepare)
        {
            var (key, args) = step.Children.Single();
            var kind = CorpusCase.Text(key);
            if (kind == "gatetasks")
            {
                var command = ((YamlSequenceNode)args).Children.Select(CorpusCase.Text).ToList();
                if (!command.Contains("--contract")) command.AddRange(["--contract", "contract.yaml"]);
                var (exit, stdout, stderr) = Gatetasks(folder, command);
                Assert.True(exit == 0, $"{c.Name}: prepare step 'gatetasks {string.Join(' ', command)}' exited {exit}\n{stdout}{stderr}");
            }
            else CorpusStep.Apply(kind, (YamlMappingNode)args, folder);
        }
    }

    private static void AssertErrorLine(CorpusCase c, string folder, string code, string stderr)
    {
        var line = stderr.Split('\n').FirstOrDefault(l => l.Contains($"error {code}:", StringComparison.Ordinal));
        Assert.True(line is not null, $"{c.Name}: no 'error {code}' line in\n{stderr}");
        var m = Regex.Match(line!, $@"^(?:(?<file>.*?)(\((?<line>\d+),(?<column>\d+)\))?: )?error {code}: (?<message>.*)$");
        Assert.True(m.Success, $"{c.Name}: not a 'file(line,col): error CODE: message' line: {line}");
        if (c.Expect.File is { } file)
        {
            Assert.True(m.Groups["file"].Success, $"{c.Name}: no file in {line}");
            Assert.Equal(Path.GetFullPath(file, folder), Path.GetFullPath(m.Groups["file"].Value, folder));
        }
        if (c.Expect.Line is { } expectedLine)
        {
            Assert.True(m.Groups["line"].Success, $"{c.Name}: no position in {line}");
            Assert.Equal((expectedLine, c.Expect.Column), (int.Parse(m.Groups["line"].Value), (int?)int.Parse(m.Groups["column"].Value)));
        }
        Assert.True(m.Groups["message"].Value.Contains(c.Expect.Says, StringComparison.Ordinal), $"{c.Name}: '{c.Expect.Says}' not in: {line}");
    }

    private static void AssertReport(CorpusCase c, string path)
    {
        Assert.True(File.Exists(path), $"{c.Name}: the check left no report");
        var root = XDocument.Load(path).Root!;
        var problems = int.Parse(root.Attribute("failures")!.Value) + int.Parse(root.Attribute("errors")!.Value);
        if (c.Expect.Exit == 0)
        {
            Assert.Equal(0, problems);
            return;
        }
        Assert.True(problems > 0, $"{c.Name}: the report claims a pass:\n{File.ReadAllText(path)}");
        Assert.Contains(c.Expect.Code!, root.ToString());
    }

    private static (int Exit, string Stdout, string Stderr) Gatetasks(string folder, IEnumerable<string> args) =>
        GatetasksProcess.Run(args, folder, timeoutSeconds: 120);
}
