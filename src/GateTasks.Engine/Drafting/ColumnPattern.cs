using System.Text.RegularExpressions;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// A glob on column names, as <c>draft --exclude</c> takes it: <c>*</c> matches any run of characters (none
/// included), <c>?</c> exactly one; everything else matches itself, case-sensitively, over the whole name.
/// </summary>
internal sealed class ColumnPattern(string glob)
{
    private readonly Regex _regex = new(
        "^" + Regex.Escape(glob).Replace(@"\*", ".*", StringComparison.Ordinal).Replace(@"\?", ".", StringComparison.Ordinal) + "$",
        RegexOptions.CultureInvariant | RegexOptions.Singleline);

    /// <summary>The glob as written.</summary>
    public string Glob { get; } = glob;

    /// <summary>Whether the whole column name matches.</summary>
    public bool Matches(string column) => _regex.IsMatch(column);
}
