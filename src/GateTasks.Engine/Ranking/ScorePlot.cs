using System.Globalization;
using System.Net;
using System.Text;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// The global score of each candidate with its ±1 standard-error bar, as a standalone SVG drawing, candidates along
/// the horizontal axis in the order they were given (checkpoints in training order), the score on a linear vertical
/// axis that always shows zero. Each candidate with a score is one <c>circle</c> of class <c>score</c> carrying
/// <c>data-candidate</c>, <c>data-score</c> and <c>data-standard-error</c>; a candidate without one is a labelled gap
/// (class <c>no-score</c>), never a point at zero.
/// </summary>
internal static class ScorePlot
{
    private const double Width = 640, Height = 320, Left = 70, Right = 20, Top = 20, Bottom = 90;

    public static string Svg(RankingReport report)
    {
        var candidates = report.Candidates.OrderBy(c => c.Given).ToList();
        var scored = candidates.Where(c => c.Result.Score.HasValue).ToList();
        var lows = scored.Select(c => c.Result.Score.Value - c.Result.Score.StandardError).Append(0.0).ToList();
        var highs = scored.Select(c => c.Result.Score.Value + c.Result.Score.StandardError).Append(0.0).ToList();
        var (lo, hi) = (lows.Min(), highs.Max());
        if (!(hi > lo)) hi = lo + 1;
        var pad = (hi - lo) * 0.05;
        (lo, hi) = (lo - (lo < 0 ? pad : 0), hi + pad);
        double X(int i) => Left + (i + 0.5) / Math.Max(candidates.Count, 1) * (Width - Left - Right);
        double Y(double v) => Top + (hi - v) / (hi - lo) * (Height - Top - Bottom);

        var sb = new StringBuilder();
        sb.Append(CultureInfo.InvariantCulture, $"<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"score-plot\" width=\"{N(Width)}\" height=\"{N(Height)}\" viewBox=\"0 0 {N(Width)} {N(Height)}\" role=\"img\">\n");
        sb.Append("<title>Global score (lower is closer to the reference) ± 1 standard error, candidates in the order given</title>\n");
        sb.Append("<style>text{font:11px sans-serif;fill:#333}.axis{stroke:#555;stroke-width:1}.grid{stroke:#ddd;stroke-width:1}")
          .Append(".error-bar{stroke:#1f5fa8;stroke-width:1.5}.score{fill:#1f5fa8}.no-score{fill:#999;font-style:italic}</style>\n");
        // Vertical axis with five ticks, zero drawn as a grid line.
        for (var t = 0; t <= 4; t++)
        {
            var v = lo + (hi - lo) * t / 4;
            sb.Append(CultureInfo.InvariantCulture, $"<line class=\"grid\" x1=\"{N(Left)}\" x2=\"{N(Width - Right)}\" y1=\"{N(Y(v))}\" y2=\"{N(Y(v))}\"/>")
              .Append(CultureInfo.InvariantCulture, $"<text x=\"{N(Left - 6)}\" y=\"{N(Y(v) + 4)}\" text-anchor=\"end\">{E(InvariantNumber.Short(v))}</text>\n");
        }
        sb.Append(CultureInfo.InvariantCulture, $"<line class=\"axis\" x1=\"{N(Left)}\" x2=\"{N(Width - Right)}\" y1=\"{N(Y(0))}\" y2=\"{N(Y(0))}\"/>\n");
        sb.Append(CultureInfo.InvariantCulture, $"<line class=\"axis\" x1=\"{N(Left)}\" x2=\"{N(Left)}\" y1=\"{N(Top)}\" y2=\"{N(Height - Bottom)}\"/>\n");
        sb.Append(CultureInfo.InvariantCulture, $"<text x=\"14\" y=\"{N((Top + Height - Bottom) / 2)}\" transform=\"rotate(-90 14 {N((Top + Height - Bottom) / 2)})\" text-anchor=\"middle\">global score ± SE</text>\n");
        for (var i = 0; i < candidates.Count; i++)
        {
            var c = candidates[i];
            var x = X(i);
            var name = E(c.Result.Candidate);
            var label = E(Path.GetFileName(c.Result.Candidate.TrimEnd('/', '\\')) is { Length: > 0 } file ? file : c.Result.Candidate);
            sb.Append(CultureInfo.InvariantCulture, $"<text x=\"{N(x)}\" y=\"{N(Height - Bottom + 14)}\" transform=\"rotate(30 {N(x)} {N(Height - Bottom + 14)})\">{label}</text>\n");
            if (c.Result.Score is { HasValue: true } s)
            {
                sb.Append(CultureInfo.InvariantCulture, $"<line class=\"error-bar\" x1=\"{N(x)}\" x2=\"{N(x)}\" y1=\"{N(Y(s.Value - s.StandardError))}\" y2=\"{N(Y(s.Value + s.StandardError))}\"/>")
                  .Append(CultureInfo.InvariantCulture, $"<circle class=\"score\" cx=\"{N(x)}\" cy=\"{N(Y(s.Value))}\" r=\"4\" data-candidate=\"{name}\" ")
                  .Append(CultureInfo.InvariantCulture, $"data-score=\"{InvariantNumber.Exact(s.Value)}\" data-standard-error=\"{InvariantNumber.Exact(s.StandardError)}\">")
                  .Append(CultureInfo.InvariantCulture, $"<title>{name}: {E(InvariantNumber.Short(s.Value))} ± {E(InvariantNumber.Short(s.StandardError))}</title></circle>\n");
            }
            else
                sb.Append(CultureInfo.InvariantCulture, $"<text class=\"no-score\" x=\"{N(x)}\" y=\"{N(Y(0) - 6)}\" text-anchor=\"middle\" data-candidate=\"{name}\">no score</text>\n");
        }
        sb.Append("</svg>\n");
        return sb.ToString();
    }

    private static string N(double v) => v.ToString("0.##", CultureInfo.InvariantCulture);

    private static string E(string text) => WebUtility.HtmlEncode(text);
}
