using System;
using System.Collections.Generic;
using System.Diagnostics;
using System.IO;
using System.Linq;
using System.Text;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.MSBuild;

/// <summary>
/// One run of the engine in its own process (the native executable, or <c>gatetasks.dll</c> with the dotnet host): it
/// asks for the
/// engine's record stream (<see cref="RunRecord"/>, a temporary file named in <see cref="RunRecord.EnvironmentVariable"/>)
/// and keeps the console's lines only for a run that wrote no record (a host that could not start the engine at all).
/// Cancellable from another thread.
/// </summary>
internal sealed class EngineProcess
{
    private readonly object _gate = new();
    private Process? _process;
    private bool _cancelled;

    /// <summary>True once <see cref="Cancel"/> was called.</summary>
    public bool Cancelled
    {
        get { lock (_gate) return _cancelled; }
    }

    /// <summary>Stops the running engine, and any later run before it starts.</summary>
    public void Cancel()
    {
        lock (_gate)
        {
            _cancelled = true;
            try { _process?.Kill(); } catch (InvalidOperationException) { } // already gone
        }
    }

    /// <summary>What one run left.</summary>
    public sealed class Result(int exit, IReadOnlyList<RunRecord> records, IReadOnlyList<string> console)
    {
        /// <summary>The exit code; -1 when it was cancelled.</summary>
        public int Exit => exit;

        /// <summary>Every record the engine wrote, in order (a torn last line of a killed run left out).</summary>
        public IReadOnlyList<RunRecord> Records => records;

        /// <summary>The console's lines (stdout and stderr as they came), for a run that wrote no record.</summary>
        public IReadOnlyList<string> Console => console;
    }

    /// <summary>
    /// Runs <c>program args</c> in <paramref name="workingDirectory"/>; throws what <see cref="Process.Start()"/>
    /// throws when the program cannot start.
    /// </summary>
    public Result Run(string program, IReadOnlyList<string> args, string workingDirectory)
    {
        var stream = Path.Combine(Path.GetTempPath(), "gatetasks-" + Guid.NewGuid().ToString("N") + ".jsonl");
        var psi = new ProcessStartInfo(program, string.Join(" ", args.Select(Quote)))
        {
            UseShellExecute = false,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            CreateNoWindow = true,
            WorkingDirectory = workingDirectory,
        };
        psi.EnvironmentVariables[RunRecord.EnvironmentVariable] = stream;
        var lines = new List<string>();
        void Collect(object _, DataReceivedEventArgs e)
        {
            if (e.Data is null) return;
            lock (lines) lines.Add(e.Data);
        }
        try
        {
            lock (_gate)
            {
                if (_cancelled) return new Result(-1, [], []);
                _process = Process.Start(psi)!;
            }
            _process.OutputDataReceived += Collect;
            _process.ErrorDataReceived += Collect;
            _process.BeginOutputReadLine();
            _process.BeginErrorReadLine();
            _process.WaitForExit();
            var exit = Cancelled ? -1 : _process.ExitCode;
            return new Result(exit, ReadRecords(stream), lines);
        }
        finally
        {
            lock (_gate)
            {
                _process?.Dispose();
                _process = null;
            }
            try { File.Delete(stream); }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException) { } // a temporary file: the system cleans it
        }
    }

    private static IReadOnlyList<RunRecord> ReadRecords(string path)
    {
        if (!File.Exists(path)) return [];
        var records = new List<RunRecord>();
        foreach (var line in File.ReadAllLines(path, new UTF8Encoding(false)))
            if (RunRecord.Parse(line) is { V: RunRecord.Version } record) records.Add(record);
        return records;
    }

    // Windows-style quoting, which Process splits back into the same arguments on Unix too.
    private static string Quote(string arg) =>
        arg.Length > 0 && arg.IndexOfAny([' ', '\t', '"']) < 0 ? arg : "\"" + arg.Replace("\"", "\\\"") + "\"";
}
