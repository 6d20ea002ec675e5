namespace GateTasks.Cli.Tests;

/// <summary>
/// A fact that runs the end-to-end benchmark script, which needs node and npm (DuckDB's @duckdb/node-api comes from
/// the npm registry), Debian's /usr/bin/python3 with numpy and scipy, GNU time and taskset (installed by .ci/run
/// through apt). Skipped where one is absent, unless GATETASKS_REQUIRE_EXTERNAL_TOOLS=1 (as in CI), where it runs
/// and fails loudly.
/// </summary>
public sealed class BenchmarkToolsFactAttribute : FactAttribute
{
    public BenchmarkToolsFactAttribute()
    {
        if (Environment.GetEnvironmentVariable("GATETASKS_REQUIRE_EXTERNAL_TOOLS") == "1") return;
        var missing = new List<string>();
        if (!OnPath("node")) missing.Add("node (apt-get install nodejs)");
        if (!OnPath("npm")) missing.Add("npm (apt-get install npm)");
        if (!OnPath("taskset")) missing.Add("taskset (apt-get install util-linux)");
        if (!File.Exists("/usr/bin/time")) missing.Add("/usr/bin/time (apt-get install time)");
        if (!ExternalPython.Has(["numpy", "scipy"])) missing.Add("/usr/bin/python3 with numpy and scipy (apt-get install python3-numpy python3-scipy)");
        if (missing.Count > 0) Skip = "needs " + string.Join(", ", missing);
    }

    private static bool OnPath(string program) =>
        (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries)
        .Any(dir => File.Exists(Path.Combine(dir, program)));
}
