using GateTasks.Engine.Contracts;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>Which way a larger sample is expected to decide an inconclusive check.</summary>
internal enum DecidingSide
{
    /// <summary>Every part's upper bound falls below the tolerance: the check passes.</summary>
    Pass,

    /// <summary>A part's deviation lies beyond the tolerance by more than the strictest level of the family allows: the check fails.</summary>
    Fail,
}

/// <summary>
/// How many surrogate events would decide an inconclusive check, solved after the contract-wide decision from the
/// effect's parts (<see cref="Measurement.Parts"/>). The sample part of each standard error shrinks as 1/√n′, the
/// reference part stays; the true deviations are taken to be today's estimates, each estimate normal about them.
/// <list type="bullet">
/// <item>Pass side: every part's one-sided upper bound (at the contract's confidence) below the tolerance, with
/// probability <see cref="Power"/> (the product over the parts, taken as independent).</item>
/// <item>Fail side: some part's p-value of "within tolerance", Bonferroni-corrected over the effect's k parts, at most
/// α/m — the strictest per-check level of Holm (1979), Bonferroni and Benjamini–Hochberg (1995) over the m checks
/// of the family, which fails the check under any of them whatever the other checks do — with probability
/// <see cref="Power"/>.</item>
/// </list>
/// The smaller size of the two is given. When neither side can reach <see cref="Power"/> at any size (the reference's
/// own uncertainty leaves too little room), the size at which the estimate itself clears the threshold (an even
/// chance) is given instead, flagged; when not even that is reachable, only more reference events can decide.
/// </summary>
/// <param name="Events">Surrogate events of the whole sample needed (NaN: no figure can be given).</param>
/// <param name="CategoryEvents">For a feature with a condition of its own (a category): the events in it needed; else NaN.</param>
/// <param name="Share">The category's share of the sample's events the whole-sample figure assumes (1 for other features).</param>
/// <param name="Side">Which way the check is expected to be decided.</param>
/// <param name="Chance">The probability of deciding at that size, if the effect is as estimated: <see cref="Power"/>, or 0.5 when the reference caps it.</param>
/// <param name="ReferenceLimits">True when no surrogate size can decide: the reference's own uncertainty alone exceeds the room left.</param>
internal sealed record NeededEvents(double Events, double CategoryEvents, double Share, DecidingSide Side, double Chance, bool ReferenceLimits)
{
    /// <summary>The chance of deciding the stated size is solved for: 90%, a common choice of power in planning.</summary>
    public const double Power = 0.9;

    /// <summary>Nothing can be said (no parts, no events).</summary>
    public static NeededEvents Unknown { get; } = new(double.NaN, double.NaN, 1, DecidingSide.Pass, double.NaN, false);

    /// <summary>No surrogate size decides: the reference must grow.</summary>
    public static NeededEvents MoreReference { get; } = new(double.PositiveInfinity, double.PositiveInfinity, 1, DecidingSide.Pass, double.NaN, true);

    /// <summary>
    /// The events needed to decide an inconclusive check of a family of <paramref name="familySize"/> checks;
    /// <paramref name="sampleEvents"/> is the whole sample's event count (0: unknown, figures stay in the check's own events).
    /// A check measured neither by parts nor by a band (a goodness-of-fit test) gets no figure.
    /// </summary>
    public static NeededEvents For(CheckSubject subject, CheckSpec check, Measurement m, DecisionSettings decision, int familySize, long sampleEvents)
    {
        if (check is ToleranceCheck { Tolerance: var bandTolerance } && m.Band is { } band && m.PartsEvents > 0)
            return ForBand(subject, band, bandTolerance, decision, familySize, m.PartsEvents, sampleEvents);
        if (check is not ToleranceCheck { Tolerance: var tolerance } || m.Parts.Count == 0 || m.PartsEvents <= 0)
            return Unknown;

        var zPass = Normal.InvCDF(0, 1, decision.Confidence);
        var zFail = Normal.InvCDF(0, 1, 1 - decision.FalseAlarm / (Math.Max(1, familySize) * (double)m.Parts.Count));
        double? own = null;
        var side = DecidingSide.Pass;
        var chance = Power;
        foreach (var target in new[] { Power, 0.5 })
        {
            var pass = Solve(m.PartsEvents, x => PassChance(m.Parts, x, tolerance, zPass), target);
            var fail = Solve(m.PartsEvents, x => FailChance(m.Parts, x, tolerance, zFail), target);
            if (double.IsPositiveInfinity(pass) && double.IsPositiveInfinity(fail)) continue;
            (own, side, chance) = fail < pass ? (fail, DecidingSide.Fail, target) : (pass, DecidingSide.Pass, target);
            break;
        }
        if (own is not { } inOwn) return MoreReference;
        return InSample(subject, inOwn, m.PartsEvents, sampleEvents, side, chance);
    }

    /// <summary>
    /// A ks-max check's events needed, from its band (DKW with Massart's 1990 constant, c(α) = √(ln(4/α)/2)): the pass
    /// side needs D̂ + c(1 − confidence)·(1/√n₁ + 1/√n₂′) below the tolerance, the fail side needs D̂ at least
    /// tol + c(α/m)·(1/√n₁ + 1/√n₂′), the strictest level of a family of m checks. D̂ is taken normal about today's
    /// distance D with the variance of the difference of two empirical CDFs at the maximising point,
    /// F(1 − F)·(1/n₁ + 1/n₂′) (Raghavachari 1973, for a distance above zero), at its largest F(1 − F) = 1/4, so
    /// the figure errs on the large side; then solved for <see cref="Power"/> as the parts are.
    /// </summary>
    private static NeededEvents ForBand(CheckSubject subject, KsBand band, double tolerance, DecisionSettings decision, int familySize, long events, long sampleEvents)
    {
        if (!(band.SampleEffective > 0) || !(band.ReferenceEffective > 0)) return Unknown;
        double a = 1 / Math.Sqrt(band.ReferenceEffective), b = 1 / Math.Sqrt(band.SampleEffective);
        var cPass = Math.Sqrt(Math.Log(4 / (1 - decision.Confidence)) / 2);
        var cFail = Math.Sqrt(Math.Log(4 * Math.Max(1, familySize) / decision.FalseAlarm) / 2);
        // x = n/n′ scales the sample's 1/n_eff; the reference's part stays.
        double Width(double x) => a + b * Math.Sqrt(x);
        double Spread(double x) => 0.5 * Math.Sqrt(a * a + b * b * x);
        double PassChance(double x) => Normal.CDF(0, 1, Standardised(tolerance - band.Distance - cPass * Width(x), Spread(x)));
        double FailChance(double x) => Normal.CDF(0, 1, Standardised(band.Distance - tolerance - cFail * Width(x), Spread(x)));
        foreach (var target in new[] { Power, 0.5 })
        {
            var pass = Solve(events, PassChance, target);
            var fail = Solve(events, FailChance, target);
            if (double.IsPositiveInfinity(pass) && double.IsPositiveInfinity(fail)) continue;
            return fail < pass
                ? InSample(subject, fail, events, sampleEvents, DecidingSide.Fail, target)
                : InSample(subject, pass, events, sampleEvents, DecidingSide.Pass, target);
        }
        return MoreReference;
    }

    /// <summary>
    /// Carries a figure in the check's own events over to the whole sample's: the check's errors scale with its own
    /// events (a category's, or a feature's non-NaN entries), and the sample is generated whole, so the figure is
    /// carried over at the share those events had in this sample.
    /// </summary>
    private static NeededEvents InSample(CheckSubject subject, double inOwn, long ownEvents, long sampleEvents, DecidingSide side, double chance)
    {
        var category = subject is FeatureSubject { Feature.Condition: not null };
        var share = sampleEvents > 0 ? Math.Min(1, ownEvents / (double)sampleEvents) : 1;
        return new(Math.Ceiling(inOwn / share), category ? inOwn : double.NaN, share, side, chance, false);
    }

    /// <summary>
    /// The smallest number of events n′ at which <paramref name="chance"/> (a function of x = n/n′, the factor on the
    /// sample parts' variances) reaches <paramref name="target"/>; +∞ when not even an infinite sample (x = 0) reaches it.
    /// </summary>
    private static double Solve(long events, Func<double, double> chance, double target)
    {
        if (!(chance(0) >= target)) return double.PositiveInfinity;
        if (chance(1) >= target) return events;
        // Bisection on log n′ between the sample's size (below target) and a size that reaches it.
        double lo = events, hi = events;
        for (var i = 0; i < 200 && !(chance(events / hi) >= target); i++) hi *= 2;
        if (!(chance(events / hi) >= target)) return double.PositiveInfinity;
        for (var i = 0; i < 100 && hi / lo > 1 + 1e-9; i++)
        {
            var mid = Math.Sqrt(lo * hi);
            if (chance(events / mid) >= target) hi = mid; else lo = mid;
        }
        return Math.Ceiling(hi);
    }

    /// <summary>P(every part's upper bound d̂ + z·σ is below the tolerance) with d̂ ~ N(d, σ²), σ² = σ_ref² + x·σ_sample².</summary>
    private static double PassChance(IReadOnlyList<EffectPart> parts, double x, double tolerance, double z)
    {
        var p = 1.0;
        foreach (var part in parts)
            p *= Normal.CDF(0, 1, Standardised(tolerance - part.Deviation, Sigma(part, x)) - z);
        return p;
    }

    /// <summary>P(some part's deviation d̂ exceeds the tolerance by more than z·σ) with d̂ ~ N(d, σ²), parts independent.</summary>
    private static double FailChance(IReadOnlyList<EffectPart> parts, double x, double tolerance, double z)
    {
        var none = 1.0;
        foreach (var part in parts)
            none *= 1 - Normal.CDF(0, 1, Standardised(part.Deviation - tolerance, Sigma(part, x)) - z);
        return 1 - none;
    }

    private static double Sigma(EffectPart part, double x) => Math.Sqrt(part.SeReference * part.SeReference + x * part.SeSample * part.SeSample);

    /// <summary>gap/σ, with a zero σ giving ±∞ (a part known exactly is decided by the sign of its gap alone).</summary>
    private static double Standardised(double gap, double sigma) =>
        sigma > 0 ? gap / sigma : gap > 0 ? double.PositiveInfinity : double.NegativeInfinity;
}
