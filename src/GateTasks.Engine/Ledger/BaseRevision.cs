using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// The revision whose ledger the checked ledger must extend (e.g. a pull request's target branch), and where it came
/// from: the command line (or the build's <c>GateBaseRevision</c>), or a CI system's pull-request variables.
/// </summary>
internal sealed record BaseRevision(string Revision, string Origin)
{
    /// <summary>
    /// The base revision in effect: <paramref name="option"/> when given, else what the CI system says a pull or
    /// merge request targets — GitHub Actions (<c>GITHUB_BASE_REF</c>, as <c>origin/…</c>), GitLab
    /// (<c>CI_MERGE_REQUEST_DIFF_BASE_SHA</c>), Azure Pipelines (<c>SYSTEM_PULLREQUEST_TARGETBRANCH</c>, as
    /// <c>origin/…</c>) — else none.
    /// </summary>
    public static BaseRevision? Choose(string? option, Func<string, string?> environment)
    {
        if (option is not null) return Checked(option, "--base-revision");
        if (Variable(environment, "GITHUB_BASE_REF") is { } github) return Checked("origin/" + github, "GITHUB_BASE_REF");
        if (Variable(environment, "CI_MERGE_REQUEST_DIFF_BASE_SHA") is { } gitlab) return Checked(gitlab, "CI_MERGE_REQUEST_DIFF_BASE_SHA");
        if (Variable(environment, "SYSTEM_PULLREQUEST_TARGETBRANCH") is { } azure)
        {
            const string heads = "refs/heads/";
            return Checked("origin/" + (azure.StartsWith(heads, StringComparison.Ordinal) ? azure[heads.Length..] : azure), "SYSTEM_PULLREQUEST_TARGETBRANCH");
        }
        return null;
    }

    private static BaseRevision Checked(string revision, string origin)
    {
        if (string.IsNullOrWhiteSpace(revision))
            throw new GateInputException(ErrorCodes.Usage, "--base-revision needs a revision (a branch, tag or commit), not an empty value.");
        // Each argument reaches git on its own, but one starting with '-' would still be read as an option.
        if (revision.StartsWith('-') || revision.Any(c => char.IsControl(c) || char.IsWhiteSpace(c)))
            throw new GateInputException(ErrorCodes.Usage, $"The base revision '{revision}' (from {origin}) is not a revision name.");
        return new BaseRevision(revision, origin);
    }

    /// <summary>Says the revision and, for a CI default, the variable it came from.</summary>
    public override string ToString() => Origin == "--base-revision" ? Revision : $"{Revision} (from {Origin})";

    // An unset or empty variable is no pull request (CI systems set these only for one).
    private static string? Variable(Func<string, string?> environment, string name) =>
        environment(name) is { } v && !string.IsNullOrWhiteSpace(v) ? v.Trim() : null;
}
