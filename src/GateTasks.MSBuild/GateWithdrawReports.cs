using System.Collections.Generic;
using System.IO;
using System.Linq;

namespace GateTasks.MSBuild;

/// <summary>
/// Early in the build, moves every contract's reports aside into the state folder (<c>withdrawn-reports</c>), so a
/// build that stops before the check (a compile error) leaves none of an earlier run to say PASSED.
/// </summary>
public sealed class GateWithdrawReports : PassedReportsTask
{
    private protected override string Doing => "withdraw";

    private protected override void Run(IReadOnlyList<(string Path, string Kind)> reports)
    {
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
    }
}
