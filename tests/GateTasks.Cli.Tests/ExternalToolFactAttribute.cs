using System.Diagnostics;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A fact that needs Debian's /usr/bin/python3 with the named modules (installed by .ci/run through apt).
/// Skipped where they are absent, unless GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs and fails loudly.
/// </summary>
public sealed class PythonModulesFactAttribute : FactAttribute
{
    public PythonModulesFactAttribute(params string[] modules)
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!ExternalPython.Has(modules))
            Skip = $"needs /usr/bin/python3 with {string.Join(", ", modules)} (apt-get install python3-{string.Join(" python3-", modules)})";
    }
}

/// <summary>A theory that needs Debian's /usr/bin/python3 with the named modules; skips as <see cref="PythonModulesFactAttribute"/> does.</summary>
public sealed class PythonModulesTheoryAttribute : TheoryAttribute
{
    public PythonModulesTheoryAttribute(params string[] modules)
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!ExternalPython.Has(modules))
            Skip = $"needs /usr/bin/python3 with {string.Join(", ", modules)} (apt-get install python3-{string.Join(" python3-", modules)})";
    }
}

/// <summary>Runs Debian's system Python (not a version manager's shim) on a script.</summary>
public static class ExternalPython
{
    public const string Interpreter = "/usr/bin/python3";

    public static bool Has(IEnumerable<string> modules) =>
        File.Exists(Interpreter) && Run("import " + string.Join(", ", modules), []).ExitCode == 0;

    public static (int ExitCode, string Stdout, string Stderr) Run(string script, IEnumerable<string> args)
    {
        var psi = new ProcessStartInfo(Interpreter) { RedirectStandardOutput = true, RedirectStandardError = true };
        psi.ArgumentList.Add("-c");
        psi.ArgumentList.Add(script);
        foreach (var a in args) psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        p.WaitForExit();
        return (p.ExitCode, stdout.Result, stderr.Result);
    }
}

/// <summary>
/// A fact that needs Debian's chromium (installed by .ci/run through apt) to render pages headless.
/// Skipped where it is absent, unless GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs and fails loudly.
/// </summary>
public sealed class ChromiumFactAttribute : FactAttribute
{
    public ChromiumFactAttribute()
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        if (!HeadlessChromium.Available) Skip = $"needs {HeadlessChromium.Program} (apt-get install chromium)";
    }
}

/// <summary>Runs Debian's chromium headless on a local file, with a profile of its own that is deleted afterwards.</summary>
public static class HeadlessChromium
{
    public const string Program = "/usr/bin/chromium";

    public static bool Available => File.Exists(Program);

    /// <summary>Runs chromium with <paramref name="args"/> then the page's file URL; the page's console goes to stderr.</summary>
    public static (int ExitCode, string Stdout, string Stderr) Run(string page, params string[] args)
    {
        var profile = Directory.CreateTempSubdirectory("gatetasks-chromium-").FullName;
        try
        {
            var psi = new ProcessStartInfo(Program) { RedirectStandardOutput = true, RedirectStandardError = true };
            // As root (CI) chromium needs --no-sandbox; --enable-logging=stderr reports the page's console, script errors included.
            foreach (var a in new[] { "--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--enable-logging=stderr", "--v=0", $"--user-data-dir={profile}" })
                psi.ArgumentList.Add(a);
            foreach (var a in args) psi.ArgumentList.Add(a);
            psi.ArgumentList.Add(new Uri(Path.GetFullPath(page)).AbsoluteUri);
            using var p = Process.Start(psi)!;
            var stdout = p.StandardOutput.ReadToEndAsync();
            var stderr = p.StandardError.ReadToEndAsync();
            p.WaitForExit();
            return (p.ExitCode, stdout.Result, stderr.Result);
        }
        finally
        {
            try { Directory.Delete(profile, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
        }
    }

    /// <summary>The page's console lines that report an error ("Uncaught …").</summary>
    public static IReadOnlyList<string> ScriptErrors(string stderr) =>
        stderr.Split('\n').Where(l => l.Contains(":CONSOLE", StringComparison.Ordinal) && l.Contains("Uncaught", StringComparison.Ordinal)).ToList();
}
