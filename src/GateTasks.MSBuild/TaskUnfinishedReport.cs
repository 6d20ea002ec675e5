using System;
using System.Collections.Generic;
using System.IO;
using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Reports;
using Microsoft.Build.Framework;

namespace GateTasks.MSBuild;

/// <summary>
/// What the task leaves at a contract's report paths when the engine could not say anything itself (it is missing,
/// could not be started, was stopped, or died without a word): a JUnit report in the engine's "did not finish" form
/// (<see cref="UnfinishedJUnit"/>, the same code the engine writes it with), and no other report, so none of an
/// earlier run can still say PASSED.
/// </summary>
internal static class TaskUnfinishedReport
{
    /// <summary>Writes the JUnit report and removes the others among <paramref name="reports"/>.</summary>
    public static void Write(IEnumerable<ITaskItem> reports, string contract, string code, string message)
    {
        foreach (var report in reports)
        {
            var path = report.ItemSpec;
            // Never over an input: a report path that is the contract is the engine's to refuse.
            if (string.Equals(Path.GetFullPath(path), contract, StringComparison.Ordinal)) continue;
            try
            {
                if (report.GetMetadata("Kind") == "junit")
                {
                    Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                    var temporary = path + "." + Guid.NewGuid().ToString("N") + ".tmp";
                    File.WriteAllText(temporary, UnfinishedJUnit.Render(contract, DateTimeOffset.UtcNow, code, message, DiagnosticLine.Format(null, 0, 0, "error", code, message)), new UTF8Encoding(false));
                    if (File.Exists(path)) File.Replace(temporary, path, null);
                    else File.Move(temporary, path);
                }
                else if (File.Exists(path)) File.Delete(path);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                // The report folder itself is unusable: the build's error already says the check did not run.
            }
        }
    }
}
