using System;
using System.Globalization;

namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// The one human form of a coded message, <c>file(line,col): error GATE1234: text</c> (the shape compilers and MSBuild
/// use; the place is left out when unknown). Dependency-free: the build step's task compiles this file too, for the
/// reports it writes when the engine cannot.
/// </summary>
internal static class DiagnosticLine
{
    /// <summary>The line for a message; <paramref name="file"/> null: no place; <paramref name="line"/> 0: the file alone.</summary>
    public static string Format(string? file, int line, int column, string severity, string code, string text) =>
        file is null ? $"{severity} {code}: {text}" : $"{Place(file, line, column)}: {severity} {code}: {text}";

    /// <summary><c>file(line,col)</c>, or the file alone when the line is not known (0); a missing column counts as 1.</summary>
    public static string Place(string file, int line, int column) =>
        line > 0 ? string.Format(CultureInfo.InvariantCulture, "{0}({1},{2})", file, line, Math.Max(column, 1)) : file;
}
