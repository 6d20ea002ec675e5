using System;
using System.IO;
using System.Linq;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;

namespace GateTasks.MSBuild;

/// <summary>
/// The reports in the report folder stand for the current build only once its check has passed (or is up to date).
/// <c>withdraw</c>, early in the build, moves every contract's reports aside into the state folder, so a build that
/// stops before the check (a compile error) leaves none of an earlier run to say PASSED. <c>keep</c>, after a passing
/// check, copies its reports into the state folder beside the passed stamp. <c>restore</c>, when the check is up to
/// date, puts that copy back; it reports whether the copy was complete, and the check runs when it was not.
/// Needs no engine, so a no-op build stays cheap.
/// </summary>
public sealed class GatePassedReports : Task
{
    /// <summary><c>withdraw</c>, <c>keep</c> or <c>restore</c>.</summary>
    [Required]
    public string Action { get; set; } = "";

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

    /// <summary>Restore only: true when the kept copy held every contract's JUnit report and was put back.</summary>
    [Output]
    public bool Restored { get; private set; }

    private string KeptDirectory => Path.Combine(StateDirectory, "passed-reports");
    private string WithdrawnDirectory => Path.Combine(StateDirectory, "withdrawn-reports");

    /// <inheritdoc />
    public override bool Execute()
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
            switch (Action)
            {
                case "withdraw":
                    foreach (var (path, _) in reports.Where(r => File.Exists(r.Path)))
                    {
                        var aside = Path.Combine(WithdrawnDirectory, Path.GetFileName(path));
                        if (IsLink(path))
                        {
                            // The engine writes through a link to a report (the link stays): keep the link, empty its target.
                            Directory.CreateDirectory(WithdrawnDirectory);
                            File.Copy(path, aside, overwrite: true);
                            File.WriteAllBytes(path, []);
                        }
                        else MoveOver(path, aside);
                    }
                    return true;
                case "keep":
                    if (Directory.Exists(KeptDirectory)) Directory.Delete(KeptDirectory, recursive: true);
                    Directory.CreateDirectory(KeptDirectory);
                    foreach (var (path, _) in reports.Where(r => File.Exists(r.Path)))
                        File.Copy(path, Path.Combine(KeptDirectory, Path.GetFileName(path)), overwrite: true);
                    return true;
                case "restore":
                    var kept = reports.Select(r => (r.Path, r.Kind, Kept: Path.Combine(KeptDirectory, Path.GetFileName(r.Path)))).ToList();
                    if (kept.Any(r => r.Kind == "junit" && !File.Exists(r.Kept)))
                    {
                        Log.LogMessage(MessageImportance.Low, "GateTasks: the last passing check's reports are not all kept in {0}; the check runs again.", KeptDirectory);
                        return true;
                    }
                    foreach (var (path, _, keptPath) in kept.Where(r => File.Exists(r.Kept)))
                    {
                        if (File.Exists(path) && SameContent(path, keptPath)) continue;
                        if (File.Exists(path) && IsLink(path))
                        {
                            File.Copy(keptPath, path, overwrite: true); // through the link
                            continue;
                        }
                        Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                        var temporary = path + "." + Guid.NewGuid().ToString("N") + ".tmp";
                        File.Copy(keptPath, temporary);
                        MoveOver(temporary, path);
                    }
                    Restored = true;
                    return true;
                default:
                    Log.LogError("GatePassedReports: unknown action '{0}'.", Action);
                    return false;
            }
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // A report that cannot be moved aside may still say PASSED: the build must not pass over it.
            Log.LogError(null, "GATE0002", null, null, 0, 0, 0, 0,
                "GateTasks could not {0} the reports in '{1}' ({2}); make the folder writable, or delete its reports, and build again.",
                Action == "keep" ? "keep a copy of" : Action, ReportDirectory ?? ProjectDirectory, e.Message);
            return false;
        }
    }

    private static void MoveOver(string from, string to)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(to)!);
        if (File.Exists(to)) File.Delete(to);
        File.Move(from, to);
    }

    private static bool IsLink(string path) => (File.GetAttributes(path) & FileAttributes.ReparsePoint) != 0;

    private static bool SameContent(string a, string b)
    {
        var infoA = new FileInfo(a);
        var infoB = new FileInfo(b);
        if (infoA.Length != infoB.Length) return false;
        return File.ReadAllBytes(a).AsSpan().SequenceEqual(File.ReadAllBytes(b));
    }
}
