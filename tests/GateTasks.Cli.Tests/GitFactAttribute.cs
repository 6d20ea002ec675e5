using System.Diagnostics;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A fact that needs the git program (on this machine and in CI). Skipped where git is absent, unless
/// GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs and fails loudly.
/// </summary>
public sealed class GitFactAttribute : FactAttribute
{
    public GitFactAttribute()
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!Available) Skip = "needs the git program on PATH (apt-get install git)";
    }

    public static bool Available
    {
        get
        {
            try
            {
                using var p = Process.Start(new ProcessStartInfo("git", "--version") { RedirectStandardOutput = true, RedirectStandardError = true })!;
                p.WaitForExit();
                return p.ExitCode == 0;
            }
            catch (System.ComponentModel.Win32Exception)
            {
                return false;
            }
        }
    }
}
