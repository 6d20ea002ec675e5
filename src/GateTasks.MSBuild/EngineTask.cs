using System;
using System.Collections.Generic;
using System.IO;
using System.Linq;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;

namespace GateTasks.MSBuild;

/// <summary>
/// What the tasks that start the GateTasks engine share: where the engine is, the contracts and sample, the report
/// names, starting the engine and stopping it when the build is cancelled. Holds no statistics and no third-party code,
/// so nothing it loads can clash with other tasks.
/// </summary>
public abstract class EngineTask : Task, ICancelableTask
{
    private readonly EngineProcess _engine = new();

    /// <summary>Path of the engine's <c>gatetasks.dll</c>.</summary>
    [Required]
    public string Engine { get; set; } = "";

    /// <summary>The dotnet host running this build (<c>DOTNET_HOST_PATH</c>); <c>dotnet</c> from PATH when empty.</summary>
    public string? DotnetHost { get; set; }

    /// <summary>The precision contracts.</summary>
    [Required]
    public ITaskItem[] Contracts { get; set; } = [];

    /// <summary>A sample to check instead of each contract's own (optional).</summary>
    public string? Sample { get; set; }

    /// <summary>Folder the engine runs in, so a relative <see cref="Sample"/> is relative to the project.</summary>
    public string? WorkingDirectory { get; set; }

    /// <summary>Folder for the reports.</summary>
    public string? ReportDirectory { get; set; }

    /// <summary>True once the build was cancelled.</summary>
    protected bool Cancelled => _engine.Cancelled;

    /// <summary>The dotnet host the engine is started with.</summary>
    protected string Host => string.IsNullOrEmpty(DotnetHost) ? "dotnet" : DotnetHost!;

    /// <summary>The folder the engine runs in.</summary>
    protected string EngineDirectory => string.IsNullOrEmpty(WorkingDirectory) ? Directory.GetCurrentDirectory() : WorkingDirectory!;

    /// <inheritdoc />
    public void Cancel() => _engine.Cancel();

    /// <summary>The full paths of the contracts, in order.</summary>
    protected IReadOnlyList<string> ContractPaths() => Contracts.Select(c => c.GetMetadata("FullPath")).ToList();

    /// <summary>Every report a contract's check writes (see ReportNames), with <c>Kind</c> and <c>Contract</c> metadata.</summary>
    protected static IEnumerable<ITaskItem> ReportItems(string contract, string reportBase) =>
        ReportNames.Kinds.Select(k =>
        {
            var item = new TaskItem(reportBase + k.Ending);
            item.SetMetadata("Kind", k.Kind);
            item.SetMetadata("Contract", contract);
            return (ITaskItem)item;
        });

    /// <summary>Each contract's report base name (ReportNames).</summary>
    protected IReadOnlyList<string> ReportBases(IReadOnlyList<string> contracts) => ReportNames.For(contracts, ReportDirectory, EngineDirectory);

    /// <summary>Appends <c>--sample</c> when a sample is set.</summary>
    protected void AddSample(List<string> args)
    {
        if (string.IsNullOrWhiteSpace(Sample)) return;
        args.Add("--sample");
        args.Add(Sample!);
    }

    /// <summary>
    /// Runs the engine: the native executable beside <c>gatetasks.dll</c> where this machine can run it
    /// (<see cref="GateTasks.Cli.NativeExecutable"/>), else <c>gatetasks.dll</c> with the dotnet host; null, with
    /// <paramref name="error"/> saying why, when neither could start.
    /// </summary>
    private protected EngineProcess.Result? RunEngine(IReadOnlyList<string> args, out string? error)
    {
        error = null;
        if (GateTasks.Cli.NativeExecutable.UsableIn(Path.GetDirectoryName(Path.GetFullPath(Engine))!) is { } native)
        {
            try
            {
                return _engine.Run(native, args, EngineDirectory);
            }
            catch (Exception e) when (e is System.ComponentModel.Win32Exception or InvalidOperationException or IOException)
            {
                // It did not start at all: the portable engine runs as it would without it.
            }
        }
        try
        {
            return _engine.Run(Host, [Engine, .. args], EngineDirectory);
        }
        catch (Exception e) when (e is System.ComponentModel.Win32Exception or InvalidOperationException or IOException)
        {
            error = $"Cannot start the GateTasks engine with '{Host}': {e.Message}. Set DOTNET_HOST_PATH or put dotnet on PATH.";
            return null;
        }
    }
}
