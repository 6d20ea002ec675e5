namespace GateTasks.Cli.Tests;

/// <summary>
/// A fact that starts a single-node Slurm of its own (Debian's slurm-wlm and munge, installed by .ci/run through
/// apt): it needs slurmctld, slurmd, sbatch, sinfo, squeue, scancel, munged and mungekey on PATH, and root, since its daemons run
/// as root (SlurmUser=root) and munged refuses another user's key. Skipped where one of these is missing, unless
/// GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs and fails loudly, with the daemons' logs.
/// </summary>
public sealed class SlurmFactAttribute : FactAttribute
{
    public SlurmFactAttribute()
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!OperatingSystem.IsLinux())
        {
            Skip = "needs Linux (a single-node Slurm and munge)";
            return;
        }
        var missing = SingleNodeSlurm.Programs.Where(p => SingleNodeSlurm.FindOnPath(p) is null).ToList();
        if (missing.Count > 0)
            Skip = $"needs {string.Join(", ", missing)} on PATH (apt-get install slurm-wlm munge)";
        else if (!Environment.IsPrivilegedProcess)
            Skip = "needs root: the test's Slurm daemons run as root (SlurmUser=root) and munged runs with a key of its own";
    }
}
