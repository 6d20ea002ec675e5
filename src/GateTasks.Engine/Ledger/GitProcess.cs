using System.ComponentModel;
using System.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// Starts <c>git</c> from PATH as a process with an argument list (no shell, so no argument is ever re-parsed), reads
/// its standard output as bytes and its standard error as text.
/// </summary>
internal sealed class GitProcess : IGitCommandLine
{
    public GitResult? Run(string workingDirectory, IReadOnlyList<string> arguments)
    {
        var psi = new ProcessStartInfo("git")
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            RedirectStandardInput = true,
            UseShellExecute = false,
        };
        foreach (var a in arguments) psi.ArgumentList.Add(a);
        // Never wait for a password or an editor; messages in one language, so they read the same in every log.
        psi.Environment["GIT_TERMINAL_PROMPT"] = "0";
        psi.Environment["LC_ALL"] = "C";
        Process process;
        try
        {
            process = Process.Start(psi)!;
        }
        catch (Exception e) when (e is Win32Exception or InvalidOperationException or FileNotFoundException)
        {
            return null;
        }
        using (process)
        {
            process.StandardInput.Close();
            var error = process.StandardError.ReadToEndAsync();
            using var output = new MemoryStream();
            process.StandardOutput.BaseStream.CopyTo(output);
            process.WaitForExit();
            return new GitResult(process.ExitCode, output.ToArray(), error.Result.Trim());
        }
    }
}
