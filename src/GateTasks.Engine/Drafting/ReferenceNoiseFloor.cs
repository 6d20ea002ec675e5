using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// The smallest tolerance of each drafted check that a perfect surrogate of unlimited size passes against a
/// reference built from the trusted sample itself. With the surrogate's own error gone, a check's upper bound is its
/// estimate plus the reference's part of the band, and the estimate is then the reference's own deviation from the
/// truth. The floor is set so that a perfect surrogate passes every check of the draft together with probability at
/// least the contract's confidence: each of the draft's <c>m</c> checks may miss with β = (1 − confidence)/m
/// (Bonferroni 1936), and a check of <c>k</c> parts (bins, categories) gives each part β/k.
/// <list type="bullet">
/// <item>Checks with a normal error (the pass rule of <c>Checks/EffectIntersection</c>: estimate + z·σ below the
/// tolerance): the estimate is |N(0, σ_ref)|, so the floor is (z_confidence + z_{1−β/(2k)})·σ_ref, with σ_ref as the
/// check computes it: ratio-max 1/√(n·p) per bin of share p (<c>Checks/BinRatio</c>), mean-shift-max 1/√n in units
/// of σ and width-ratio-max √((κ−1)/(4n)) (<c>Checks/MomentShiftCheck</c>), fraction-max √(p(1−p)/n) per fraction
/// (<c>Checks/EffectIntersection.AddFraction</c>), n the reference's Kish (1965) effective count.</item>
/// <item>ks-max (<c>Checks/KolmogorovSmirnovCheck</c>): the upper bound is D + ε(n, α/2) with α = 1 − confidence,
/// ε(n, a) = √(ln(2/a)/(2n)), and the reference's empirical CDF is within ε(n, β) of the truth with probability
/// 1 − β (Dvoretzky, Kiefer &amp; Wolfowitz 1956 with Massart's 1990 constant), so the floor is ε(n, α/2) + ε(n, β).</item>
/// </list>
/// Bins are taken as equal-probability (share 1/B of the histogram's events, a spike's events apart); weighted
/// references use Kish effective counts throughout, as the checks do. The floors restate the checks' reference
/// errors: when a check's uncertainty changes, its floor here changes with it.
/// </summary>
internal sealed class ReferenceNoiseFloor(double confidence, int checks)
{
    private readonly double _z = Normal.InvCDF(0, 1, confidence);

    /// <summary>The share of the contract's miss probability one check may take.</summary>
    public double CheckMiss { get; } = (1 - confidence) / Math.Max(1, checks);

    /// <summary>A floor and how it follows from the reference's noise, for the drafted YAML's comment.</summary>
    internal readonly record struct Floor(double Value, string Derivation);

    /// <summary>The floor of one drafted check on the column <paramref name="p"/>.</summary>
    public Floor Of(CheckKind check, string? region, ColumnProfile p, FeatureDraft f, DraftOptions o)
    {
        var n = p.Summary.EffectiveCount;
        // The histogram holds the events off the spike; the spike's own events are counted apart.
        var spikeShare = f.Spike is null ? 0 : p.TopShare;
        var nHistogram = n * (1 - spikeShare);
        switch (check)
        {
            case CheckKind.KolmogorovSmirnov:
            {
                var band = DkwBound.Epsilon(nHistogram, (1 - confidence) / 2);
                var noise = DkwBound.Epsilon(nHistogram, CheckMiss);
                return new(band + noise,
                    $"D ≤ ε(n_ref, β) = {Short(noise)} (DKW) plus the band's reference part ε(n_ref, α/2) = {Short(band)}, n_ref = {Count(nHistogram)}");
            }
            case CheckKind.BinRatio:
            {
                var coreBins = Math.Clamp((int)Math.Round(o.Core * o.Bins), 1, o.Bins);
                var k = region == ContractKeys.Tails ? Math.Max(1, o.Bins - coreBins) : coreBins;
                return NormalFloor(Math.Sqrt(o.Bins / nHistogram), k, $"σ_ref = √({o.Bins} bins / n_ref {Count(nHistogram)}) per bin, {k} bins");
            }
            case CheckKind.MeanShift:
                return NormalFloor(1 / Math.Sqrt(nHistogram), 1, $"σ_ref = 1/√(n_ref {Count(nHistogram)}) in units of σ");
            case CheckKind.WidthRatio:
                return NormalFloor(Math.Sqrt((p.Summary.Kurtosis - 1) / (4 * nHistogram)), 1,
                    $"σ_ref = √((κ − 1)/(4 n_ref)), κ = {Short(p.Summary.Kurtosis)}, n_ref = {Count(nHistogram)}");
            case CheckKind.Fraction when f.Kind == FeatureKind.Discrete && p.DistinctWeights is { } categories:
            {
                var largest = categories.Values.Select(w => w / p.FiniteSumW).Max(s => Math.Sqrt(s * (1 - s)));
                return NormalFloor(largest / Math.Sqrt(n), categories.Count,
                    $"σ_ref = √(p(1 − p)/n_ref) of the largest category, n_ref = {Count(n)}, {categories.Count} categories");
            }
            case CheckKind.Fraction:
                return NormalFloor(Math.Sqrt(spikeShare * (1 - spikeShare) / n), 1,
                    $"σ_ref = √(p(1 − p)/n_ref), p = {Short(spikeShare)}, n_ref = {Count(n)}");
            default:
                throw new ArgumentOutOfRangeException(nameof(check), check, "The draft writes no such check.");
        }
    }

    /// <summary>
    /// The draft with every tolerance below its floor widened to the floor (rounded up to two significant digits, so
    /// rounding never makes it unpassable) and the widening written into its comment; a check whose floor is 1 or
    /// more — no meaningful tolerance for a distance, a fraction or a ratio — is dropped and listed with its reason.
    /// </summary>
    public FeatureDraft Apply(FeatureDraft f, ColumnProfile p, DraftOptions o)
    {
        if (f.SkipReason is not null) return f;
        var kept = new List<(CheckKind, string?, DraftedTolerance)>();
        var dropped = new List<string>();
        foreach (var (check, region, t) in f.Tolerances)
        {
            var floor = Of(check, region, p, f, o);
            var key = ContractKeys.CheckKey(check) + (region is null ? "" : $" ({region})");
            if (t.Value > floor.Value) kept.Add((check, region, t));
            else if (!(floor.Value < 1))
                dropped.Add($"{key}: the reference's own noise allows no tolerance below {Short(floor.Value)} ({floor.Derivation}); a larger reference is needed");
            else
            {
                var widened = RoundUp(floor.Value);
                kept.Add((check, region, new DraftedTolerance(widened,
                    $"widened from {Number(t.Value)} ({t.Derivation}), which no surrogate could pass against this reference: a perfect surrogate of unlimited size passes {Number(widened)} with probability ≥ 1 − {Short(CheckMiss)}, {floor.Derivation}")));
            }
        }
        if (kept.Count == 0)
            return f with { Tolerances = [], SkipReason = "every check is below the reference's own noise: " + string.Join("; ", dropped), Dropped = [] };
        return f with { Tolerances = kept, Dropped = dropped };
    }

    /// <summary>Two significant digits, rounded away from zero.</summary>
    internal static double RoundUp(double value)
    {
        if (!(value > 0) || !double.IsFinite(value)) return value;
        var scale = Math.Pow(10, Math.Floor(Math.Log10(value)) - 1);
        var rounded = Math.Ceiling(value / scale * (1 - 1e-12)) * scale;
        return double.Parse(rounded.ToString("G2", System.Globalization.CultureInfo.InvariantCulture), System.Globalization.CultureInfo.InvariantCulture);
    }

    private static string Number(double x) => x.ToString("R", System.Globalization.CultureInfo.InvariantCulture);

    private Floor NormalFloor(double sigma, int parts, string what)
    {
        var zNoise = Normal.InvCDF(0, 1, 1 - CheckMiss / (2 * parts));
        return new((_z + zNoise) * sigma, $"(z {Short(_z)} + z {Short(zNoise)}) × {Short(sigma)}, {what}");
    }

    private static string Short(double x) => x.ToString("0.####", System.Globalization.CultureInfo.InvariantCulture);

    private static string Count(double n) => InvariantNumber.Count((long)Math.Floor(n));
}
