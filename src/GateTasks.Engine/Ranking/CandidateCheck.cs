using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Ranking;

/// <summary>One check of a ranked candidate: what it was, its verdict and its margin (<see cref="Checks.Margin"/>).</summary>
internal sealed record CandidateCheck(string Feature, string Check, Verdict Verdict, Margin Margin)
{
    /// <summary>"feature check", e.g. <c>m_gg width-ratio-max</c>.</summary>
    public string Label => $"{Feature} {Check}";
}
