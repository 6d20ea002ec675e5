using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;

namespace GateTasks.Cli;

/// <summary>
/// Where a command speaks: the console's text (stdout, and stderr for coded messages), unchanged whoever reads it, and,
/// when the build step asked for it (<see cref="RunRecord.EnvironmentVariable"/>), the same as records on a stream of
/// their own, so the build step never parses the text.
/// </summary>
internal sealed class CommandOutput(TextWriter stdout, TextWriter stderr, RecordFile? records = null)
{
    /// <summary>The console's standard output.</summary>
    public TextWriter Out => stdout;

    /// <summary>The console's standard error.</summary>
    public TextWriter Error => stderr;

    /// <summary>A coded message: its line on stderr, from the one formatter.</summary>
    public void Diagnostic(Diagnostic d)
    {
        stderr.WriteLine(d.Line);
        records?.Write(d.ToRecord());
    }

    /// <summary>A line of stdout the build log shows only at detailed verbosity (the table, the files compared).</summary>
    public void Detail(string line) => Text(stdout, line, RunRecord.DetailLevel);

    /// <summary>Several lines of stdout at once (a table ending in a line break), each a detail.</summary>
    public void DetailBlock(string block)
    {
        stdout.Write(block);
        if (records is null) return;
        foreach (var line in block.Split('\n')) if (line.Length > 0) records.Write(TextRecord(line.TrimEnd('\r'), RunRecord.DetailLevel));
    }

    /// <summary>A line of stdout the build log shows at normal verbosity (progress, the ledger history).</summary>
    public void Note(string line) => Text(stdout, line, RunRecord.NoteLevel);

    /// <summary>A line of stdout the build log always shows: the run's verdict.</summary>
    public void Summary(string line) => Text(stdout, line, RunRecord.SummaryLevel);

    /// <summary>A line of stderr that is not a coded message (a hint, an internal error).</summary>
    public void ErrorDetail(string line) => Text(stderr, line, RunRecord.DetailLevel);

    /// <summary>How the run ended: a record only; the console says it with the summary line.</summary>
    public void Outcome(RunOutcome outcome) => records?.Write(new RunRecord(RunRecord.OutcomeType) { Outcome = outcome.Token() });

    /// <summary>A report the run wrote: a record only.</summary>
    public void Report(string kind, string path) => records?.Write(new RunRecord(RunRecord.ReportType) { Kind = kind, Path = Path.GetFullPath(path) });

    /// <summary>A file a check reads: its path on a line of its own, and a record.</summary>
    public void Input(string path)
    {
        stdout.WriteLine(path);
        records?.Write(new RunRecord(RunRecord.InputType) { Path = path });
    }

    /// <summary>A path whose state decides the inputs: <c>depends PATH</c>, and a record.</summary>
    public void Dependency(string path)
    {
        stdout.WriteLine("depends " + path);
        records?.Write(new RunRecord(RunRecord.DependencyType) { Path = path });
    }

    private void Text(TextWriter writer, string line, string level)
    {
        writer.WriteLine(line);
        records?.Write(TextRecord(line, level));
    }

    private static RunRecord TextRecord(string line, string level) => new(RunRecord.TextType) { Level = level, Text = line };
}
