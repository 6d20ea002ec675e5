namespace GateTasks.Cli.Tests;

public class CommandLineTests
{
    [Fact]
    public void Unknown_option_is_a_usage_error_with_exit_code_two()
    {
        var (code, _, stderr) = Cli.Run("check", "--no-such-option");
        Assert.Equal(2, code);
        Assert.Contains("GATE0001", stderr);
    }

    [Fact]
    public void Missing_contract_file_exits_two_naming_the_file()
    {
        var (code, _, stderr) = Cli.Run("check", "--contract", "/nonexistent/precision-contract.yaml");
        Assert.Equal(2, code);
        Assert.Contains("error GATE1001", stderr);
        Assert.Contains("/nonexistent/precision-contract.yaml", stderr);
    }

    [Theory]
    [InlineData("0.5")]
    [InlineData("-0.1")]
    public void Calibrate_refuses_a_negative_fraction_outside_its_range(string fraction)
    {
        // docs/cli.md: `--negative-fraction` outside [0, 0.5) is a usage error, exit 2.
        var (code, _, stderr) = Cli.Run("calibrate", "--negative-fraction", fraction, "--contract", "/nonexistent/precision-contract.yaml");
        Assert.Equal(2, code);
        Assert.Contains("GATE0001", stderr);
        Assert.Contains("--negative-fraction", stderr);
    }

    [Fact]
    public void Help_lists_the_commands()
    {
        var (code, stdout, _) = Cli.Run("--help");
        Assert.Equal(0, code);
        foreach (var c in new[] { "check", "reference", "demo", "schema" }) Assert.Contains(c, stdout);
    }

    [Fact]
    public void Schema_command_prints_the_json_schema()
    {
        var (code, stdout, _) = Cli.Run("schema");
        Assert.Equal(0, code);
        Assert.Contains("\"contract-version\"", stdout);
    }
}
