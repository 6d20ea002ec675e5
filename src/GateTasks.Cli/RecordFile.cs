using System.Text;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Cli;

/// <summary>
/// The build step's record stream (<see cref="RunRecord"/>): a file it names in <see cref="RunRecord.EnvironmentVariable"/>,
/// written one JSON line per record and flushed at once, so a run that is stopped leaves every record it made.
/// </summary>
internal sealed class RecordFile(string path) : IDisposable
{
    private readonly StreamWriter _writer = new(new FileStream(path, FileMode.Create, FileAccess.Write, FileShare.Read), new UTF8Encoding(false)) { NewLine = "\n" };

    /// <summary>The stream the environment asks for, or null when it asks for none.</summary>
    public static RecordFile? FromEnvironment() =>
        Environment.GetEnvironmentVariable(RunRecord.EnvironmentVariable) is { Length: > 0 } path ? new RecordFile(path) : null;

    /// <summary>Appends one record.</summary>
    public void Write(RunRecord record)
    {
        lock (_writer)
        {
            _writer.WriteLine(record.ToJson());
            _writer.Flush();
        }
    }

    /// <inheritdoc />
    public void Dispose() => _writer.Dispose();
}
