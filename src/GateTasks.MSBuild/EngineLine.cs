using System;
using System.Globalization;
using System.Text.RegularExpressions;

namespace GateTasks.MSBuild;

/// <summary>
/// One coded line the engine prints, <c>file(line,col): error GATE1234: message</c> (file and position optional),
/// parsed so the task can log it as a real MSBuild error or warning at that place.
/// </summary>
internal sealed class EngineLine
{
    private static readonly Regex Coded = new(
        @"^(?:(?<file>.*?)(?:\((?<line>\d+),(?<col>\d+)\))?: )?(?<severity>error|warning) (?<code>GATE\d{4}): (?<message>.*)$",
        RegexOptions.CultureInvariant);

    private EngineLine(string? file, int line, int column, bool isError, string code, string message)
    {
        File = file;
        Line = line;
        Column = column;
        IsError = isError;
        Code = code;
        Message = message;
    }

    public string? File { get; }
    public int Line { get; }
    public int Column { get; }
    public bool IsError { get; }
    public string Code { get; }
    public string Message { get; }

    /// <summary>
    /// Drift codes (GATE3xxx) and the ratchet's GATE4010 are fidelity failures; all others — ledger errors included,
    /// which warning mode must never hide — are set-up or input problems.
    /// </summary>
    public bool IsDrift => Code.StartsWith("GATE3", StringComparison.Ordinal) || Code == "GATE4010";

    /// <summary>The parsed line, or null when <paramref name="text"/> is not a coded line.</summary>
    public static EngineLine? TryParse(string text)
    {
        var m = Coded.Match(text);
        if (!m.Success) return null;
        var file = m.Groups["file"].Success && m.Groups["file"].Length > 0 ? m.Groups["file"].Value : null;
        return new EngineLine(
            file,
            m.Groups["line"].Success ? int.Parse(m.Groups["line"].Value, CultureInfo.InvariantCulture) : 0,
            m.Groups["col"].Success ? int.Parse(m.Groups["col"].Value, CultureInfo.InvariantCulture) : 0,
            m.Groups["severity"].Value == "error",
            m.Groups["code"].Value,
            m.Groups["message"].Value);
    }
}
