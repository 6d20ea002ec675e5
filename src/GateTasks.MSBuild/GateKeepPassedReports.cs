using System.Collections.Generic;
using System.IO;
using System.Linq;

namespace GateTasks.MSBuild;

/// <summary>
/// After a passing check, copies its reports into the state folder (<c>passed-reports</c>) beside the passed stamp,
/// replacing any earlier copy, so <see cref="GateRestorePassedReports"/> can put them back when the check is up to date.
/// </summary>
public sealed class GateKeepPassedReports : PassedReportsTask
{
    private protected override string Doing => "keep a copy of";

    private protected override void Run(IReadOnlyList<(string Path, string Kind)> reports)
    {
        if (Directory.Exists(KeptDirectory)) Directory.Delete(KeptDirectory, recursive: true);
        Directory.CreateDirectory(KeptDirectory);
        foreach (var (path, _) in reports.Where(r => File.Exists(r.Path)))
            File.Copy(path, Path.Combine(KeptDirectory, Path.GetFileName(path)), overwrite: true);
    }
}
