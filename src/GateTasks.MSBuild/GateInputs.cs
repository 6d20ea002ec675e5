using System.Collections.Generic;
using System.IO;
using System.Linq;
using GateTasks.Engine.Diagnostics;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;

namespace GateTasks.MSBuild;

/// <summary>
/// Lists the files each contract's check reads (<c>gatetasks inputs --dependencies</c>), so the build knows when the
/// check is up to date, and names every report the check will write. Logs no error: when the engine cannot list a
/// contract's inputs (a wrong sample, a broken contract, no engine), the check runs anyway and reports the problem at
/// its place, replacing the reports with ones that say the check did not finish.
/// </summary>
public sealed class GateInputs : EngineTask
{
    /// <summary>
    /// Folder where each contract's list of inputs is kept (see InputsCache); empty: ask the engine every time.
    /// </summary>
    public string? CacheDirectory { get; set; }

    /// <summary>True when the engine listed every contract's inputs.</summary>
    [Output]
    public bool Listed { get; private set; }

    /// <summary>The files the checks read.</summary>
    [Output]
    public ITaskItem[] Inputs { get; private set; } = [];

    /// <summary>Every report file the check will write (see ReportNames), whether or not it exists yet, with <c>Kind</c> and <c>Contract</c> metadata.</summary>
    [Output]
    public ITaskItem[] Reports { get; private set; } = [];

    /// <inheritdoc />
    public override bool Execute()
    {
        var contracts = ContractPaths();
        var bases = ReportBases(contracts);
        Reports = contracts.SelectMany((c, i) => ReportItems(c, bases[i])).ToArray();
        if (!File.Exists(Engine))
        {
            Log.LogMessage(MessageImportance.Low, "GateTasks: no engine at '{0}'; the check will say so.", Engine);
            return true;
        }
        var inputs = new List<ITaskItem>();
        var all = true;
        foreach (var contract in contracts)
        {
            if (Cancelled) return true;
            all &= List(contract, inputs);
        }
        Inputs = inputs.ToArray();
        Listed = all && !Cancelled;
        return true;
    }

    private bool List(string contract, List<ITaskItem> inputs)
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
        var run = RunEngine(args, out var error);
        if (run is null)
        {
            Log.LogMessage(MessageImportance.Low, "{0}", error);
            return false;
        }
        var files = new List<string>();
        var dependencies = new List<string>();
        foreach (var record in run.Records)
        {
            switch (record.Type)
            {
                case RunRecord.InputType when record.Path is { } path && Path.IsPathRooted(path):
                    files.Add(path);
                    break;
                case RunRecord.DependencyType when record.Path is { } path && Path.IsPathRooted(path):
                    dependencies.Add(path);
                    break;
                case RunRecord.DiagnosticType:
                    // The check's to report (it runs when the list is incomplete): here only a message.
                    Log.LogMessage(MessageImportance.Low, "{0}", DiagnosticLine.Format(record.File, record.Line, record.Column, record.Severity ?? "error", record.Code ?? "", record.Text ?? ""));
                    break;
                case RunRecord.TextType:
                    Log.LogMessage(MessageImportance.Low, "{0}", record.Text);
                    break;
            }
        }
        if (run.Records.Count == 0)
            foreach (var line in run.Console) Log.LogMessage(MessageImportance.Low, "{0}", line);
        var ok = run.Exit == 0;
        if (!ok) Log.LogMessage(MessageImportance.Low, "GateTasks: the engine could not list the inputs of {0} (exit {1}); the check runs and says why.", contract, run.Exit);
        inputs.AddRange(files.Select(path => (ITaskItem)new TaskItem(path)));
        if (ok && cache is not null) InputsCache.Write(cache, key, files, dependencies);
        return ok;
    }
}
