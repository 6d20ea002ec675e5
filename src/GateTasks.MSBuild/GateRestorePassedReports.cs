using System;
using System.Collections.Generic;
using System.IO;
using System.Linq;
using Microsoft.Build.Framework;

namespace GateTasks.MSBuild;

/// <summary>
/// When the check is up to date, puts the copy <see cref="GateKeepPassedReports"/> kept back into the report folder
/// (only files that differ are written) and says whether the copy was complete; the check runs when it was not.
/// </summary>
public sealed class GateRestorePassedReports : PassedReportsTask
{
    /// <summary>True when the kept copy held every contract's JUnit report and was put back.</summary>
    [Output]
    public bool Restored { get; private set; }

    private protected override string Doing => "restore";

    private protected override void Run(IReadOnlyList<(string Path, string Kind)> reports)
    {
        var kept = reports.Select(r => (r.Path, r.Kind, Kept: Path.Combine(KeptDirectory, Path.GetFileName(r.Path)))).ToList();
        if (kept.Any(r => r.Kind == "junit" && !File.Exists(r.Kept)))
        {
            Log.LogMessage(MessageImportance.Low, "GateTasks: the last passing check's reports are not all kept in {0}; the check runs again.", KeptDirectory);
            return;
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
    }

    private static bool SameContent(string a, string b)
    {
        var infoA = new FileInfo(a);
        var infoB = new FileInfo(b);
        if (infoA.Length != infoB.Length) return false;
        return File.ReadAllBytes(a).AsSpan().SequenceEqual(File.ReadAllBytes(b));
    }
}
