using GateTasks.Engine.Contracts;

using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The decision quantities of an effect made of one or more parts (bins of a region, quantiles, a single moment),
/// each an estimate with a normal standard error split into its reference and sample parts. The effect is within
/// tolerance when every part's upper bound is (an intersection–union test, Berger 1982: no multiplicity correction
/// needed); the p-value of "outside tolerance" is the smallest part's, Bonferroni-corrected over the parts; the
/// events needed are those that would let every undecided part's interval clear the tolerance.
/// </summary>
internal sealed class EffectIntersection(double tolerance, DecisionSettings decision, long sampleEvents)
{
    private readonly double _z = Normal.InvCDF(0, 1, decision.Confidence);
    private double _smallestP = 1;
    private double _needed;

    public int Parts { get; private set; }
    public double Upper { get; private set; } = double.NegativeInfinity;
    public double Lower { get; private set; }

    /// <summary>Adds one part: its non-negative deviation and the reference and sample parts of its standard error.</summary>
    public void Add(double deviation, double seReference, double seSample)
    {
        var se = Math.Sqrt(seReference * seReference + seSample * seSample);
        Parts++;
        Upper = Math.Max(Upper, deviation + _z * se);
        Lower = Math.Max(Lower, deviation - _z * se);
        _smallestP = Math.Min(_smallestP, se > 0 ? 1 - Normal.CDF(0, 1, (deviation - tolerance) / se) : deviation > tolerance ? 0 : 1);
        if (deviation + _z * se >= tolerance)
            _needed = Math.Max(_needed, Measurement.EventsFor(Math.Abs(tolerance - deviation), _z, seReference, seSample, sampleEvents));
    }

    /// <summary>P-value of "the effect is within tolerance".</summary>
    public double PValue => Math.Min(1, Parts * _smallestP);

    /// <summary>Surrogate events to decide, or NaN when already decided.</summary>
    public double EventsNeeded => Upper < tolerance || PValue <= decision.FalseAlarm ? double.NaN : _needed;

    public Measurement ToMeasurement(double estimate, string summary, IReadOnlyList<KeyValuePair<string, string>> details) =>
        new(estimate, Math.Max(0, Lower), Upper, PValue, EventsNeeded, summary, details);
}
