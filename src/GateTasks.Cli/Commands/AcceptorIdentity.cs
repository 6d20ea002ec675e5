using System.Diagnostics;

namespace GateTasks.Cli.Commands;

/// <summary>
/// Who is accepting, when --by is not given: the CI system's user (GitHub Actions, GitLab CI, Azure Pipelines), else
/// git's user.name and user.email in the contract's folder; null when none is known.
/// </summary>
internal static class AcceptorIdentity
{
    public static string? Find(string folder)
    {
        var env = Environment.GetEnvironmentVariables();
        string? Env(string name) => env[name] is string v && v.Trim().Length > 0 ? v.Trim() : null;
        if (Env("GITHUB_ACTOR") is { } actor) return $"{actor} (GitHub Actions, run {Env("GITHUB_RUN_ID") ?? "?"})";
        if (Env("GITLAB_USER_NAME") is { } gl) return Env("GITLAB_USER_EMAIL") is { } mail ? $"{gl} <{mail}> (GitLab CI)" : $"{gl} (GitLab CI)";
        if (Env("BUILD_REQUESTEDFOR") is { } az) return $"{az} (Azure Pipelines)";
        var name = Git(folder, "user.name");
        var email = Git(folder, "user.email");
        return name is null ? email : email is null ? name : $"{name} <{email}>";
    }

    private static string? Git(string folder, string key)
    {
        try
        {
            var start = new ProcessStartInfo("git", ["config", "--get", key])
            {
                WorkingDirectory = folder,
                RedirectStandardOutput = true,
                RedirectStandardError = true,
                UseShellExecute = false,
            };
            using var p = Process.Start(start);
            if (p is null) return null;
            var output = p.StandardOutput.ReadToEnd().Trim();
            p.WaitForExit(5000);
            return p.ExitCode == 0 && output.Length > 0 ? output : null;
        }
        catch (Exception e) when (e is System.ComponentModel.Win32Exception or InvalidOperationException or IOException)
        {
            return null; // no git on this machine
        }
    }
}
