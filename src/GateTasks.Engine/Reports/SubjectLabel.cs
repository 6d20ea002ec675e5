using System.Text.RegularExpressions;
using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Reports;

/// <summary>
/// How reports show a subject to a reader: a category of a category block by its condition,
/// <c>m_gg[min(n_jets, 3) = 2]</c> or <c>pt_gg[n_jets = 2]</c>, rather than the numbered name <c>m_gg[category=2]</c>
/// that identifies it in ledgers, references and machine-read keys (which keep the name). Everything else by its name.
/// </summary>
internal static partial class SubjectLabel
{
    public static string Of(CheckSubject subject)
    {
        if (subject is not FeatureSubject { Feature: { Condition: { } condition } feature }) return subject.Name;
        var open = feature.Name.LastIndexOf('[');
        var match = CategoryCondition().Match(condition.Text);
        if (open <= 0 || !match.Success) return subject.Name;
        return $"{feature.Name[..open]}[{match.Groups["by"].Value} = {match.Groups["value"].Value}]";
    }

    // A category's condition as the category block writes it: "(by) == value".
    [GeneratedRegex(@"^\((?<by>.+)\) == (?<value>[^ ]+)$")]
    private static partial Regex CategoryCondition();
}
