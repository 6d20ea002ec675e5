using System;
using System.Collections.Generic;
using System.IO;
using System.Linq;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;

namespace GateTasks.MSBuild;

/// <summary>
/// What the tasks share that keep the report folder from speaking for a build whose check has not passed (or is not
/// up to date): the reports each contract's check writes, the state folders they are moved aside or kept in, and the
/// GATE0002 error when a report cannot be moved. <see cref="GateWithdrawReports"/> moves them aside early in the
/// build, <see cref="GateKeepPassedReports"/> keeps a copy after a passing check, <see cref="GateRestorePassedReports"/>
/// puts that copy back when the check is up to date. Needs no engine, so a no-op build stays cheap.
/// </summary>
public abstract class PassedReportsTask : Task
{
    /// <summary>The precision contracts (their reports are named after them, see ReportNames).</summary>
    [Required]
    public ITaskItem[] Contracts { get; set; } = [];

    /// <summary>Folder for the reports.</summary>
    public string? ReportDirectory { get; set; }

    /// <summary>The project's folder, which report names of same-named contracts are relative to.</summary>
    [Required]
    public string ProjectDirectory { get; set; } = "";

    /// <summary>The state folder (obj/gate/): the kept copy and the reports moved aside go below it.</summary>
    [Required]
    public string StateDirectory { get; set; } = "";

    /// <summary>Where a passing check's reports are kept, beside its stamp.</summary>
    private protected string KeptDirectory => Path.Combine(StateDirectory, "passed-reports");

    /// <summary>Where the reports are moved aside to early in the build.</summary>
    private protected string WithdrawnDirectory => Path.Combine(StateDirectory, "withdrawn-reports");

    /// <summary>What the task does to the reports, as the GATE0002 message says it ("could not … the reports").</summary>
    private protected abstract string Doing { get; }

    /// <summary>Does the task's one job on every report the checks write (<c>Kind</c> as in ReportNames).</summary>
    private protected abstract void Run(IReadOnlyList<(string Path, string Kind)> reports);

    /// <inheritdoc />
    public sealed override bool Execute()
    {
        var contracts = Contracts.Select(c => c.GetMetadata("FullPath")).ToList();
        // Every report of one build lies in one folder under a name unique there (ReportNames), so its file name
        // names it in the state folder too.
        var reports = ReportNames.For(contracts, ReportDirectory, ProjectDirectory)
            .SelectMany(b => ReportNames.Kinds.Select(k => (Path: b + k.Ending, k.Kind)))
            .Where(r => !contracts.Contains(Path.GetFullPath(r.Path), StringComparer.Ordinal)) // never a contract
            .ToList();
        try
        {
            Run(reports);
            return true;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // A report that cannot be moved aside may still say PASSED: the build must not pass over it.
            Log.LogError(null, "GATE0002", null, ErrorCodeHelpLink.For("GATE0002"), null, 0, 0, 0, 0,
                "GateTasks could not {0} the reports in '{1}' ({2}); make the folder writable, or delete its reports, and build again.",
                Doing, ReportDirectory ?? ProjectDirectory, e.Message);
            return false;
        }
    }

    /// <summary>Moves a file over another (replacing it), creating the target's folder.</summary>
    private protected static void MoveOver(string from, string to)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(to)!);
        if (File.Exists(to)) File.Delete(to);
        File.Move(from, to);
    }

    /// <summary>True when the path is a link: the engine writes through it, so it must stay.</summary>
    private protected static bool IsLink(string path) => (File.GetAttributes(path) & FileAttributes.ReparsePoint) != 0;
}
