using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The decision quantities of an effect made of one or more parts (bins of a region, quantiles, a single moment),
/// each an estimate with a normal standard error split into its reference and sample parts. The effect is within
/// tolerance when every part's upper bound is (an intersection–union test, Berger 1982: no multiplicity correction
/// needed); the p-value of "outside tolerance" is the smallest part's, Bonferroni-corrected over the parts. The parts are kept
/// for <see cref="NeededEvents"/>, which sizes an undecided effect after the contract-wide decision.
/// </summary>
internal sealed class EffectIntersection(double tolerance, DecisionSettings decision, long sampleEvents)
{
    private readonly double _z = Normal.InvCDF(0, 1, decision.Confidence);
    private double _smallestP = 1;
    private readonly List<EffectPart> _parts = [];

    public int Parts { get; private set; }
    public double Upper { get; private set; } = double.NegativeInfinity;
    public double Lower { get; private set; }

    /// <summary>Adds one part: its non-negative deviation and the reference and sample parts of its standard error.</summary>
    public void Add(double deviation, double seReference, double seSample)
    {
        var se = Math.Sqrt(seReference * seReference + seSample * seSample);
        Parts++;
        _parts.Add(new EffectPart(deviation, seReference, seSample));
        Upper = Math.Max(Upper, deviation + _z * se);
        Lower = Math.Max(Lower, deviation - _z * se);
        _smallestP = Math.Min(_smallestP, se > 0 ? 1 - Normal.CDF(0, 1, (deviation - tolerance) / se) : deviation > tolerance ? 0 : 1);
    }

    /// <summary>
    /// Adds one part judged by its own bounds and p-value (from an exact or score interval rather than estimate ± z·σ):
    /// the lower and upper confidence bounds of its deviation, the p-value of "within tolerance", and the reference
    /// and sample parts of its standard error, from which the events needed are estimated.
    /// </summary>
    public void AddBounded(double deviation, double lowerDeviation, double upperDeviation, double pValue, double seReference, double seSample)
    {
        Parts++;
        // Sized in the normal approximation, as every part: the events needed are an estimate in any case.
        _parts.Add(new EffectPart(deviation, seReference, seSample));
        Upper = Math.Max(Upper, upperDeviation);
        Lower = Math.Max(Lower, lowerDeviation);
        _smallestP = Math.Min(_smallestP, pValue);
    }

    /// <summary>
    /// Adds a fraction difference as a part: the weight share of a subset in each sample, with the binomial error
    /// √(f(1−f)/n) at Kish (1965) effective counts — the reference's fraction, the better-measured one under the null,
    /// standing in for both. Returns the two fractions and the sample's effective count.
    /// </summary>
    public (double Reference, double Sample, double SampleEffective) AddFraction(
        double referenceW, double referenceTotalW, double referenceTotalW2, double sampleW, double sampleTotalW, double sampleTotalW2)
    {
        var fr = referenceTotalW > 0 ? referenceW / referenceTotalW : 0;
        var fs = sampleTotalW > 0 ? sampleW / sampleTotalW : 0;
        var nr = KishCount.Of(referenceTotalW, referenceTotalW2);
        var ns = KishCount.Of(sampleTotalW, sampleTotalW2);
        Add(Math.Abs(fs - fr), nr > 0 ? Math.Sqrt(fr * (1 - fr) / nr) : 0, ns > 0 ? Math.Sqrt(fr * (1 - fr) / ns) : 0);
        return (fr, fs, ns);
    }

    /// <summary>P-value of "the effect is within tolerance".</summary>
    public double PValue => Math.Min(1, Parts * _smallestP);

    public Measurement ToMeasurement(double estimate, string summary, IReadOnlyList<KeyValuePair<string, string>> details) =>
        new(estimate, Math.Max(0, Lower), Upper, PValue, summary, details) { Parts = _parts.ToArray(), PartsEvents = sampleEvents };
}
