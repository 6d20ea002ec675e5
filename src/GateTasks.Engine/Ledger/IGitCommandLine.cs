namespace GateTasks.Engine.Ledger;

/// <summary>
/// Runs the <c>git</c> program with arguments in a folder. Behind an interface so the ledger's history check can be
/// tested without a repository; <see cref="GitProcess"/> is the real one.
/// </summary>
internal interface IGitCommandLine
{
    /// <summary>Runs git; null when the program cannot be started (not installed, not on PATH).</summary>
    GitResult? Run(string workingDirectory, IReadOnlyList<string> arguments);
}

/// <summary>What one git run gave: its exit code, its standard output as bytes (file content is not text to git) and its standard error.</summary>
internal sealed record GitResult(int ExitCode, byte[] Output, string Error)
{
    /// <summary>The standard output as one trimmed line of text.</summary>
    public string Text => System.Text.Encoding.UTF8.GetString(Output).Trim();
}
