using System;
using System.Collections.Generic;
using System.Diagnostics;
using System.IO;
using System.Linq;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;

namespace GateTasks.MSBuild;

/// <summary>
/// Runs the GateTasks engine in its own process, once per contract, and turns its coded output lines into MSBuild
/// errors and warnings. Holds no statistics and no third-party code, so nothing it loads can clash with other tasks.
/// </summary>
public sealed class GateRun : Task, ICancelableTask
{
    private readonly object _gate = new();
    private Process? _process;
    private bool _cancelled;

    /// <summary>Path of the engine's <c>gatetasks.dll</c>.</summary>
    [Required]
    public string Engine { get; set; } = "";

    /// <summary>The dotnet host running this build (<c>DOTNET_HOST_PATH</c>); <c>dotnet</c> from PATH when empty.</summary>
    public string? DotnetHost { get; set; }

    /// <summary><c>check</c> to judge the samples, <c>inputs</c> to list the files a check reads.</summary>
    [Required]
    public string Command { get; set; } = "check";

    /// <summary>The precision contracts.</summary>
    [Required]
    public ITaskItem[] Contracts { get; set; } = [];

    /// <summary>A sample to check instead of each contract's own (optional).</summary>
    public string? Sample { get; set; }

    /// <summary>Folder the engine runs in, so a relative <see cref="Sample"/> is relative to the project.</summary>
    public string? WorkingDirectory { get; set; }

    /// <summary>The project being built: where an error without a place of its own (a wrong GateSample) is shown.</summary>
    public string? ProjectFile { get; set; }

    /// <summary>Folder for the reports (check only).</summary>
    public string? ReportDirectory { get; set; }

    /// <summary>
    /// Git revision whose acceptance ledger each contract's ledger must extend (check only); empty: the engine's default
    /// (a CI system's pull-request base, else none).
    /// </summary>
    public string? BaseRevision { get; set; }

    /// <summary>Report failed checks as warnings instead of errors.</summary>
    public bool FailuresAsWarnings { get; set; }

    /// <summary>
    /// Folder where the inputs command keeps each contract's list of inputs (see InputsCache); empty: ask the engine
    /// every time.
    /// </summary>
    public string? CacheDirectory { get; set; }

    /// <summary>True when every check of every contract passed.</summary>
    [Output]
    public bool Passed { get; private set; }

    /// <summary>
    /// Inputs only: true when the engine listed every contract's inputs. When it could not (a wrong sample, a broken
    /// contract, no engine), nothing is logged as an error here: the check then runs anyway and reports the problem at
    /// its place, replacing the reports with ones that say the check did not finish.
    /// </summary>
    [Output]
    public bool Listed { get; private set; }

    /// <summary>The files the checks read (inputs only).</summary>
    [Output]
    public ITaskItem[] Inputs { get; private set; } = [];

    /// <summary>
    /// Inputs only: every report file the check will write (see ReportNames), whether or not it exists yet. Each has
    /// <c>Kind</c> and <c>Contract</c> metadata.
    /// </summary>
    [Output]
    public ITaskItem[] Reports { get; private set; } = [];

    /// <inheritdoc />
    public void Cancel()
    {
        lock (_gate)
        {
            _cancelled = true;
            try { _process?.Kill(); } catch (InvalidOperationException) { } // already gone
        }
    }

    /// <inheritdoc />
    public override bool Execute()
    {
        var contracts = Contracts.Select(c => c.GetMetadata("FullPath")).ToList();
        var reportBases = ReportNames.For(contracts, ReportDirectory, string.IsNullOrEmpty(WorkingDirectory) ? Directory.GetCurrentDirectory() : WorkingDirectory!);
        var listing = Command == "inputs";
        if (listing) Reports = contracts.SelectMany((c, i) => ReportItems(c, reportBases[i])).ToArray();
        if (!File.Exists(Engine))
        {
            if (listing)
            {
                Log.LogMessage(MessageImportance.Low, "GateTasks: no engine at '{0}'; the check will say so.", Engine);
                return true;
            }
            const string missing = "The GateTasks engine is missing at '{0}'; the package is incomplete. Restore it again or reinstall GateTasks.";
            Log.LogError(null, "GATE0011", null, null, 0, 0, 0, 0, missing, Engine);
            for (var i = 0; i < contracts.Count; i++)
                TaskUnfinishedReport.Write(ReportItems(contracts[i], reportBases[i]), contracts[i], "GATE0011", string.Format(missing, Engine));
            return false;
        }
        var inputs = new List<ITaskItem>();
        var allPassed = true;
        for (var i = 0; i < contracts.Count; i++)
        {
            if (_cancelled) return false;
            _driftLogged = _inputErrorLogged = false;
            var ok = listing ? ListInputs(contracts[i], inputs) : Check(contracts[i], reportBases[i]);
            allPassed &= ok;
        }
        Inputs = inputs.ToArray();
        if (listing)
        {
            Listed = allPassed && !_cancelled;
            return true;
        }
        Passed = allPassed && !Log.HasLoggedErrors;
        return !Log.HasLoggedErrors;
    }

    private static IEnumerable<ITaskItem> ReportItems(string contract, string reportBase) =>
        ReportNames.Kinds.Select(k =>
        {
            var item = new TaskItem(reportBase + k.Ending);
            item.SetMetadata("Kind", k.Kind);
            item.SetMetadata("Contract", contract);
            return (ITaskItem)item;
        });

    private bool ListInputs(string contract, List<ITaskItem> inputs)
    {
        var cache = string.IsNullOrEmpty(CacheDirectory) ? null : InputsCache.FileFor(CacheDirectory!, contract);
        var key = InputsCache.Key(Engine, contract, Sample, WorkingDirectory);
        if (cache is not null && InputsCache.TryRead(cache, key) is { } cached)
        {
            Log.LogMessage(MessageImportance.Low, "GateTasks: the inputs of {0} are as last listed ({1}); the engine was not asked.", contract, cache);
            inputs.AddRange(cached.Select(path => (ITaskItem)new TaskItem(path)));
            return true;
        }

        var args = new List<string> { "inputs", "--contract", contract, "--dependencies" };
        AddSample(args);
        var files = new List<string>();
        var dependencies = new List<string>();
        var exit = RunEngine(args, (line, _) =>
        {
            // An error line can start with a rooted path too; only uncoded lines are inputs. Errors are the check's
            // to report (it runs when the list is incomplete), so here they are only messages.
            if (EngineLine.TryParse(line) is not null) Log.LogMessage(MessageImportance.Low, "{0}", line);
            else if (line.StartsWith("depends ", StringComparison.Ordinal) && Path.IsPathRooted(line.Substring(8))) dependencies.Add(line.Substring(8));
            else if (Path.IsPathRooted(line)) files.Add(line);
            else Log.LogMessage(MessageImportance.Low, "{0}", line);
        });
        var ok = exit == 0;
        if (!ok) Log.LogMessage(MessageImportance.Low, "GateTasks: the engine could not list the inputs of {0} (exit {1}); the check runs and says why.", contract, exit);
        inputs.AddRange(files.Select(path => (ITaskItem)new TaskItem(path)));
        if (ok && cache is not null) InputsCache.Write(cache, key, files, dependencies);
        return ok;
    }

    private bool Check(string contract, string reportBase)
    {
        var planned = ReportItems(contract, reportBase).ToList();
        string PathOf(string kind) => planned.First(r => r.GetMetadata("Kind") == kind).ItemSpec;
        var args = new List<string> { "check", "--contract", contract, "--junit", PathOf("junit"), "--text", PathOf("text"), "--html", PathOf("html"), "--markdown", PathOf("markdown") };
        AddSample(args);
        if (!string.IsNullOrWhiteSpace(BaseRevision)) args.AddRange(new[] { "--base-revision", BaseRevision!.Trim() });
        var exit = RunEngine(args, (line, code) => LogLine(line, MessageImportance.Low, code));
        var ok = Finish(exit, contract);
        if (_unfinished is { } why)
        {
            // The engine did not start, was stopped, or died without a word: it may have written nothing, so no
            // report of an earlier run may stay to say PASSED.
            TaskUnfinishedReport.Write(planned, contract, why.Code, why.Message);
            _unfinished = null;
        }
        return ok;
    }

    // Set when the engine ended in a way that leaves its reports in doubt: the code and message for the reports.
    private (string Code, string Message)? _unfinished;

    private void AddSample(List<string> args)
    {
        if (string.IsNullOrWhiteSpace(Sample)) return;
        args.Add("--sample");
        args.Add(Sample!);
    }

    /// <summary>
    /// Maps the engine's exit code: 0 pass, 1 failed checks (already logged line by line), 2 input error, 4 the
    /// accepted state not respected (ledger errors, logged), else a crash.
    /// </summary>
    private bool Finish(int exit, string contract)
    {
        switch (exit)
        {
            case 0:
                return true;
            case 1 when _driftLogged:
            case 2 when _inputErrorLogged:
            case 4 when _inputErrorLogged || _driftLogged:
                return false;
            case -1:
                _unfinished ??= ("GATE0013", _cancelled ? "the build was cancelled while the check ran" : "the GateTasks engine could not be started");
                return false;
            default:
                var message = string.Format(System.Globalization.CultureInfo.InvariantCulture,
                    "The GateTasks engine stopped with exit code {0} without saying why; run 'dotnet \"{1}\" check --contract \"{2}\"' to see its output.",
                    exit, Engine, contract);
                Log.LogError(null, "GATE0012", null, contract, 0, 0, 0, 0, "{0}", message);
                _unfinished = ("GATE0012", message);
                return false;
        }
    }

    private bool _driftLogged;
    private bool _inputErrorLogged;

    private void LogLine(string text, MessageImportance otherImportance, int exit)
    {
        var coded = EngineLine.TryParse(text);
        if (coded is null)
        {
            // The engine prints its checks' summary before the ledger's verdict: a run that then failed (exit 4: the
            // contract or reference in use is not the accepted one) must not show a PASSED line in the build log.
            if (exit != 0 && text.StartsWith("PASSED:", StringComparison.Ordinal))
                text = (exit == 4 ? "NOT ACCEPTED (checks within tolerance, but the ledger does not hold):" : $"NOT PASSED (the engine exited {exit}):") +
                       text.Substring("PASSED:".Length);
            // The one-line verdict is shown at normal verbosity; the table and the rest at detailed.
            var summary = text.StartsWith("PASSED:", StringComparison.Ordinal) || text.StartsWith("FAILED:", StringComparison.Ordinal) ||
                          text.StartsWith("NOT ", StringComparison.Ordinal);
            // Progress of a long read shows at normal verbosity, like the build's own progress.
            var progress = text.StartsWith("progress:", StringComparison.Ordinal)
                // Whether the ledger was held to its base revision is shown too: "not checked" must not go unseen.
                || text.StartsWith("ledger history:", StringComparison.Ordinal);
            Log.LogMessage(summary ? MessageImportance.High : progress ? MessageImportance.Normal : otherImportance, "{0}", text);
            return;
        }
        if (coded.IsDrift) _driftLogged = true;
        else if (coded.IsError) _inputErrorLogged = true;

        // A line without a place would be shown at this package's targets file; the project is where the settings
        // are (GateSample above all, which the message then names).
        var file = coded.File ?? (string.IsNullOrEmpty(ProjectFile) ? null : ProjectFile);
        var message = coded.File is null && !string.IsNullOrWhiteSpace(Sample) && coded.Code.StartsWith("GATE2", StringComparison.Ordinal)
            ? coded.Message + " (the sample named by the GateSample property)"
            : coded.Message;
        var asWarning = !coded.IsError || (coded.IsDrift && FailuresAsWarnings);
        if (asWarning)
            Log.LogWarning(null, coded.Code, null, file, coded.Line, coded.Column, 0, 0, "{0}", message);
        else
            Log.LogError(null, coded.Code, null, file, coded.Line, coded.Column, 0, 0, "{0}", message);
    }

    /// <summary>
    /// Runs the engine and feeds every output line, with the exit code, to <paramref name="onLine"/>; -1 when it could
    /// not start or was cancelled.
    /// </summary>
    private int RunEngine(IReadOnlyList<string> args, Action<string, int> onLine)
    {
        var host = string.IsNullOrEmpty(DotnetHost) ? "dotnet" : DotnetHost!;
        var psi = new ProcessStartInfo(host, Quote(Engine) + " " + string.Join(" ", args.Select(Quote)))
        {
            UseShellExecute = false,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            CreateNoWindow = true,
            WorkingDirectory = string.IsNullOrEmpty(WorkingDirectory) ? Directory.GetCurrentDirectory() : WorkingDirectory,
        };
        var lines = new List<(int Order, string Text)>();
        var order = 0;
        void Collect(object _, DataReceivedEventArgs e)
        {
            if (e.Data is null) return;
            lock (lines) lines.Add((order++, e.Data));
        }
        try
        {
            lock (_gate)
            {
                if (_cancelled) return -1;
                _process = Process.Start(psi)!;
            }
            _process.OutputDataReceived += Collect;
            _process.ErrorDataReceived += Collect;
            _process.BeginOutputReadLine();
            _process.BeginErrorReadLine();
            _process.WaitForExit();
            // Logged on this thread, in arrival order: MSBuild's logging is not meant for the reader threads.
            var exit = _cancelled ? -1 : _process.ExitCode;
            foreach (var (_, text) in lines.OrderBy(l => l.Order)) onLine(text, exit);
            return exit;
        }
        catch (Exception e) when (e is System.ComponentModel.Win32Exception or InvalidOperationException or IOException)
        {
            var message = $"Cannot start the GateTasks engine with '{host}': {e.Message}. Set DOTNET_HOST_PATH or put dotnet on PATH.";
            if (Command == "inputs") Log.LogMessage(MessageImportance.Low, "{0}", message);
            else Log.LogError(null, "GATE0013", null, null, 0, 0, 0, 0, "{0}", message);
            _unfinished = ("GATE0013", message);
            return -1;
        }
        finally
        {
            lock (_gate)
            {
                _process?.Dispose();
                _process = null;
            }
        }
    }

    // Windows-style quoting, which the dotnet host also parses on Unix.
    private static string Quote(string arg) =>
        arg.Length > 0 && arg.IndexOfAny([' ', '\t', '"']) < 0 ? arg : "\"" + arg.Replace("\"", "\\\"") + "\"";
}
