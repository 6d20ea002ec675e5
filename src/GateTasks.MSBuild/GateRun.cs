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

    /// <summary>The files the checks read (inputs only).</summary>
    [Output]
    public ITaskItem[] Inputs { get; private set; } = [];

    /// <summary>The reports written (check only).</summary>
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
        if (!File.Exists(Engine))
        {
            Log.LogError(null, "GATE0011", null, null, 0, 0, 0, 0,
                "The GateTasks engine is missing at '{0}'; the package is incomplete. Restore it again or reinstall GateTasks.", Engine);
            return false;
        }
        var inputs = new List<ITaskItem>();
        var reports = new List<ITaskItem>();
        var allPassed = true;
        foreach (var contract in Contracts)
        {
            if (_cancelled) return false;
            var path = contract.GetMetadata("FullPath");
            _driftLogged = _inputErrorLogged = false;
            var ok = Command == "inputs" ? ListInputs(path, inputs) : Check(path, reports);
            allPassed &= ok;
        }
        Inputs = inputs.ToArray();
        Reports = reports.ToArray();
        Passed = allPassed && !Log.HasLoggedErrors;
        return !Log.HasLoggedErrors;
    }

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
        var exit = RunEngine(args, line =>
        {
            // An error line can start with a rooted path too; only uncoded lines are inputs.
            if (EngineLine.TryParse(line) is not null) LogLine(line, MessageImportance.Low);
            else if (line.StartsWith("depends ", StringComparison.Ordinal) && Path.IsPathRooted(line.Substring(8))) dependencies.Add(line.Substring(8));
            else if (Path.IsPathRooted(line)) files.Add(line);
            else LogLine(line, MessageImportance.Low);
        });
        var ok = Finish(exit, contract);
        inputs.AddRange(files.Select(path => (ITaskItem)new TaskItem(path)));
        if (ok && cache is not null) InputsCache.Write(cache, key, files, dependencies);
        return ok;
    }

    private bool Check(string contract, List<ITaskItem> reports)
    {
        var folder = string.IsNullOrEmpty(ReportDirectory) ? Path.GetDirectoryName(contract)! : ReportDirectory!;
        var name = Path.GetFileNameWithoutExtension(contract);
        var junit = Path.Combine(folder, name + ".junit.xml");
        var text = Path.Combine(folder, name + ".txt");
        var html = Path.Combine(folder, name + ".html");
        var markdown = Path.Combine(folder, name + ".md");
        var args = new List<string> { "check", "--contract", contract, "--junit", junit, "--text", text, "--html", html, "--markdown", markdown };
        AddSample(args);
        if (!string.IsNullOrWhiteSpace(BaseRevision)) args.AddRange(new[] { "--base-revision", BaseRevision!.Trim() });
        var exit = RunEngine(args, line => LogLine(line, MessageImportance.Low));
        foreach (var (file, kind) in new[] { (junit, "junit"), (text, "text"), (html, "html"), (markdown, "markdown") })
        {
            if (!File.Exists(file)) continue;
            var item = new TaskItem(file);
            item.SetMetadata("Kind", kind);
            item.SetMetadata("Contract", contract);
            reports.Add(item);
        }
        return Finish(exit, contract);
    }

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
                return false;
            default:
                Log.LogError(null, "GATE0012", null, contract, 0, 0, 0, 0,
                    "The GateTasks engine stopped with exit code {0} without saying why; run 'dotnet \"{1}\" check --contract \"{2}\"' to see its output.",
                    exit, Engine, contract);
                return false;
        }
    }

    private bool _driftLogged;
    private bool _inputErrorLogged;

    private void LogLine(string text, MessageImportance otherImportance)
    {
        var coded = EngineLine.TryParse(text);
        if (coded is null)
        {
            // The one-line verdict is shown at normal verbosity; the table and the rest at detailed.
            var summary = text.StartsWith("PASSED:", StringComparison.Ordinal) || text.StartsWith("FAILED:", StringComparison.Ordinal);
            // Progress of a long read shows at normal verbosity, like the build's own progress.
            var progress = text.StartsWith("progress:", StringComparison.Ordinal)
                // Whether the ledger was held to its base revision is shown too: "not checked" must not go unseen.
                || text.StartsWith("ledger history:", StringComparison.Ordinal);
            Log.LogMessage(summary ? MessageImportance.High : progress ? MessageImportance.Normal : otherImportance, "{0}", text);
            return;
        }
        if (coded.IsDrift) _driftLogged = true;
        else if (coded.IsError) _inputErrorLogged = true;

        var asWarning = !coded.IsError || (coded.IsDrift && FailuresAsWarnings);
        if (asWarning)
            Log.LogWarning(null, coded.Code, null, coded.File, coded.Line, coded.Column, 0, 0, "{0}", coded.Message);
        else
            Log.LogError(null, coded.Code, null, coded.File, coded.Line, coded.Column, 0, 0, "{0}", coded.Message);
    }

    /// <summary>Runs the engine and feeds every output line to <paramref name="onLine"/>; -1 when it could not start or was cancelled.</summary>
    private int RunEngine(IReadOnlyList<string> args, Action<string> onLine)
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
            foreach (var (_, text) in lines.OrderBy(l => l.Order)) onLine(text);
            return _cancelled ? -1 : _process.ExitCode;
        }
        catch (Exception e) when (e is System.ComponentModel.Win32Exception or InvalidOperationException or IOException)
        {
            Log.LogError(null, "GATE0013", null, null, 0, 0, 0, 0,
                "Cannot start the GateTasks engine with '{0}': {1}. Set DOTNET_HOST_PATH or put dotnet on PATH.", host, e.Message);
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
