using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The decision quantities of one multinomial effect: the largest absolute difference D = max_c |f̂_sample,c − f̂_reference,c|
/// of the categories' fractions (or of a spike's), each difference with its normal standard error σ_c (binomial at
/// Kish 1965 effective counts, the reference's fraction standing in for both samples, as
/// <see cref="EffectIntersection.AddFraction"/>). The categories are judged together, on the effect's own scale:
/// <list type="bullet">
/// <item>Fail side, one p-value for the whole effect: with u = D − tolerance, the probability that some category
/// deviates by more than the tolerance plus u when every true difference is within tolerance, bounded two ways and
/// the smaller taken: the union (Boole–Bonferroni) bound at the least favourable differences (each |δ_c| = tolerance),
/// Σ_c [Q(u/σ_c) + Q((u + 2·tolerance)/σ_c)] (Q the normal upper tail); and Šidák's (1967) bound on the
/// simultaneous band, 1 − Π_c [1 − 2Q(u/σ_c)], valid for any correlation of the differences (a deviation beyond
/// tolerance + u means |Δ_c − δ_c| &gt; u). Every category's deviation is measured on
/// one scale, so a category whose σ_c is small beside u adds next to nothing: a multiplicity with many sparse
/// categories pays for the few that can reach u, not for all of them as a per-category Bonferroni correction of
/// standardised deviations did.</item>
/// <item>The simultaneous lower bound: D − h, h the half-width of the simultaneous band on the difference vector,
/// Π_c [1 − 2Q(h/σ_c)] = confidence, which covers the differences at least at the confidence whatever their correlation
/// (Šidák 1967).</item>
/// <item>Pass side: every category's own upper bound |Δ_c| + z·σ_c below the tolerance, an intersection–union test
/// (Berger 1982) needing no correction, as before.</item>
/// </list>
/// The correlation of the differences (multinomial, −√(f_c f_d/((1−f_c)(1−f_d)))) cannot shrink the fail-side
/// bound much: the least favourable differences inside the tolerance choose their signs, and for those one-sided
/// events the max of the correlated normal vector exceeds a level about as often as the union bound says
/// (docs/contract.md gives the numbers), so the bound is computed in closed form, deterministically.
/// </summary>
internal sealed class FractionBand(double tolerance, DecisionSettings decision, long sampleEvents)
{
    private readonly double _z = Normal.InvCDF(0, 1, decision.Confidence);
    private readonly List<EffectPart> _parts = [];

    /// <summary>Categories (or the one spike) added.</summary>
    public int Parts => _parts.Count;

    /// <summary>The effect's estimate, max_c |Δ_c|.</summary>
    public double Estimate { get; private set; }

    /// <summary>The largest per-category upper bound |Δ_c| + z·σ_c: the pass side's bound.</summary>
    public double Upper { get; private set; } = double.NegativeInfinity;

    /// <summary>
    /// Adds a fraction difference: the weight share of a subset in each sample, errors as
    /// <see cref="EffectIntersection.AddFraction"/>. Returns the two fractions.
    /// </summary>
    public (double Reference, double Sample) AddFraction(
        double referenceW, double referenceTotalW, double referenceTotalW2, double sampleW, double sampleTotalW, double sampleTotalW2)
    {
        var fr = referenceTotalW > 0 ? referenceW / referenceTotalW : 0;
        var fs = sampleTotalW > 0 ? sampleW / sampleTotalW : 0;
        var nr = KishCount.Of(referenceTotalW, referenceTotalW2);
        var ns = KishCount.Of(sampleTotalW, sampleTotalW2);
        var seReference = nr > 0 ? Math.Sqrt(Math.Max(0, fr * (1 - fr)) / nr) : 0;
        var seSample = ns > 0 ? Math.Sqrt(Math.Max(0, fr * (1 - fr)) / ns) : 0;
        Add(Math.Abs(fs - fr), seReference, seSample);
        return (fr, fs);
    }

    /// <summary>Adds one category: its absolute difference and the reference and sample parts of its standard error.</summary>
    public void Add(double deviation, double seReference, double seSample)
    {
        _parts.Add(new EffectPart(deviation, seReference, seSample));
        var se = Math.Sqrt(seReference * seReference + seSample * seSample);
        Estimate = Math.Max(Estimate, deviation);
        Upper = Math.Max(Upper, deviation + _z * se);
    }

    /// <summary>P-value of "every |δ_c| is within tolerance", from the union bound over the categories at the least favourable δ.</summary>
    public double PValue
    {
        get
        {
            var u = Estimate - tolerance;
            if (!(u > 0)) return 1;
            double union = 0, logInside = 0;
            foreach (var part in _parts)
            {
                var se = Sigma(part);
                // A difference known exactly (σ = 0) cannot move: beyond the tolerance it is certain, within it impossible.
                if (se > 0)
                {
                    union += Tail(u / se) + Tail((u + 2 * tolerance) / se);
                    logInside += Log1m(2 * Tail(u / se)); // 2Q < 1 for u > 0
                }
                else if (part.Deviation > tolerance) return 0;
            }
            // 1 − Π(1 − a) = −expm1(Σ log(1 − a)): no cancellation when every a is tiny.
            return Math.Clamp(Math.Min(union, -Expm1(logInside)), 0, 1);
        }
    }

    /// <summary>The lower end of the simultaneous band: max(0, D − h), Π_c [1 − 2Q(h/σ_c)] = confidence (Šidák 1967).</summary>
    public double Lower
    {
        get
        {
            var beta = 1 - decision.Confidence;
            double Coverage(double h) => 1 - _parts.Aggregate(1.0, (product, p) => Sigma(p) > 0 ? product * (1 - 2 * Tail(h / Sigma(p))) : product);
            var largest = _parts.Count == 0 ? 0 : _parts.Max(Sigma);
            if (!(largest > 0)) return Estimate;
            double lo = 0, hi = largest;
            while (Coverage(hi) > beta) hi *= 2;
            for (var i = 0; i < 200 && hi - lo > 1e-15 * hi; i++)
            {
                var mid = 0.5 * (lo + hi);
                if (Coverage(mid) > beta) lo = mid; else hi = mid;
            }
            return Math.Max(0, Estimate - hi);
        }
    }

    public Measurement ToMeasurement(string summary, IReadOnlyList<KeyValuePair<string, string>> details) =>
        new(Estimate, Lower, Upper, PValue, summary, details) { Parts = _parts.ToArray(), PartsEvents = sampleEvents };

    /// <summary>log(1 − a) without cancellation for small a (a short series there).</summary>
    private static double Log1m(double a) => a < 1e-5 ? -a - a * a / 2 - a * a * a / 3 : Math.Log(1 - a);

    /// <summary>eˣ − 1 without cancellation near 0 (a short series there).</summary>
    private static double Expm1(double x) => Math.Abs(x) < 1e-5 ? x + x * x / 2 + x * x * x / 6 : Math.Exp(x) - 1;

    private static double Sigma(EffectPart p) => Math.Sqrt(p.SeReference * p.SeReference + p.SeSample * p.SeSample);

    /// <summary>The standard normal upper tail Q(t) = 1 − Φ(t), accurate far in the tail.</summary>
    private static double Tail(double t) => Normal.CDF(0, 1, -t);
}
