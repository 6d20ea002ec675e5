using MathNet.Numerics.Random;

namespace GateTasks.Engine.Checks;

/// <summary>Contents of one histogram's cells: Σw and Σw².</summary>
internal readonly record struct CellContents(double[] SumW, double[] SumW2);

/// <summary>
/// Standard error of a histogram distance by a parametric bootstrap (Efron 1979): each cell's Σw is redrawn from a
/// normal of variance Σw² (the large-count limit of Poisson fluctuations, weights included), with a fixed seed so
/// every run gives the same numbers. The reference and surrogate parts of the error are estimated separately,
/// which tells how the error shrinks with more surrogate events.
/// </summary>
internal static class HistogramBootstrap
{
    public const int Replicas = 200;

    public readonly record struct Errors(double Total, double Reference, double Surrogate);

    public static Errors StandardErrors(CellContents reference, CellContents surrogate, Func<double[], double[], double> distance, int seed)
    {
        var refOnly = Spread(reference, surrogate, distance, seed, perturbReference: true, perturbSurrogate: false).Sd;
        var surOnly = Spread(reference, surrogate, distance, seed + 1, perturbReference: false, perturbSurrogate: true).Sd;
        // The two samples are independent, so their parts add in quadrature.
        return new Errors(Math.Sqrt(refOnly * refOnly + surOnly * surOnly), refOnly, surOnly);
    }

    /// <summary>A seed that depends only on the names, so results do not depend on check order or thread count.</summary>
    public static int Seed(string feature, string check)
    {
        // FNV-1a (Fowler, Noll, Vo): stable across runs and platforms, unlike string.GetHashCode.
        var h = 2166136261u;
        foreach (var ch in feature + "\u0000" + check)
        {
            h ^= ch;
            h *= 16777619u;
        }
        return (int)(h & 0x7fffffff);
    }

    /// <summary>
    /// The bootstrap estimate of a distance's bias, the mean of replicas with both samples redrawn less the estimate
    /// (Efron &amp; Tibshirani 1993, An Introduction to the Bootstrap, ch. 10); the bias-corrected estimate is the
    /// estimate less this. A distance is positive even between two samples of one law, and the correction removes
    /// most of that floor.
    /// </summary>
    public static double Bias(CellContents reference, CellContents surrogate, Func<double[], double[], double> distance, double estimate, int seed) =>
        Spread(reference, surrogate, distance, seed + 2, perturbReference: true, perturbSurrogate: true).Mean - estimate;

    /// <summary>
    /// The distance between two samples drawn from one law — the reference's cells, each sample at its own size and
    /// weights — in <see cref="Replicas"/> replicas: its law at zero true distance, against which the fail side is
    /// judged (<see cref="TailProbability"/>). Each cell of a sample is a scaled Poisson count, κ·Poisson(μ/κ), with μ
    /// the reference's share of that sample's Σw and κ = Σw²/Σw its mean weight (exact for unit weights; the
    /// compound-Poisson scaling of Kish 1965's effective count otherwise), so sparse cells keep their skew and never
    /// go negative. Cells where the reference is not positive are held at their expectation.
    /// </summary>
    public static double[] NullReplicas(CellContents reference, double sampleSumW, double sampleSumW2, Func<double[], double[], double> distance, int seed)
    {
        double refW = 0, refW2 = 0;
        for (var i = 0; i < reference.SumW.Length; i++)
        {
            refW += reference.SumW[i];
            refW2 += reference.SumW2[i];
        }
        var rng = new Xoshiro256StarStar(seed + 3, threadSafe: false);
        var a = new double[reference.SumW.Length];
        var b = new double[reference.SumW.Length];
        var result = new double[Replicas];
        if (!(refW > 0) || !(sampleSumW > 0)) return result;
        var kappaRef = refW2 > 0 ? refW2 / refW : 1;
        var kappaSample = sampleSumW2 > 0 ? sampleSumW2 / sampleSumW : 1;
        for (var r = 0; r < Replicas; r++)
        {
            for (var i = 0; i < a.Length; i++)
            {
                var share = reference.SumW[i] / refW;
                a[i] = ScaledPoisson(share * refW, kappaRef, rng);
                b[i] = ScaledPoisson(share * sampleSumW, kappaSample, rng);
            }
            result[r] = a.Sum() > 0 && b.Sum() > 0 ? distance(a, b) : 0;
        }
        return result;
    }

    private static double ScaledPoisson(double mean, double kappa, Random rng) =>
        mean > 0 ? kappa * MathNet.Numerics.Distributions.Poisson.Sample(rng, mean / kappa) : mean;

    /// <summary>
    /// P(D ≥ <paramref name="excess"/>) for the law of <paramref name="replicas"/>, from the gamma law of the same mean
    /// and variance (the two-moment scaled-χ² approximation of Satterthwaite 1946 / Welch 1938, exact in shape for a
    /// divergence of two samples of one law, a weighted sum of χ²₁ terms), which reaches the small p-values a
    /// multiplicity correction asks for where 200 replicas cannot. 1 for a non-positive excess.
    /// </summary>
    public static double TailProbability(IReadOnlyList<double> replicas, double excess)
    {
        if (!(excess > 0)) return 1;
        var (mean, variance) = Moments(replicas);
        if (!(mean > 0) || !(variance > 0)) return excess > mean ? 0 : 1;
        return 1 - MathNet.Numerics.Distributions.Gamma.CDF(mean * mean / variance, mean / variance, excess);
    }

    /// <summary>The <paramref name="probability"/> quantile of the same gamma law (0 when the replicas do not vary).</summary>
    public static double Quantile(IReadOnlyList<double> replicas, double probability)
    {
        var (mean, variance) = Moments(replicas);
        if (!(mean > 0) || !(variance > 0)) return Math.Max(0, mean);
        return MathNet.Numerics.Distributions.Gamma.InvCDF(mean * mean / variance, mean / variance, probability);
    }

    private static (double Mean, double Variance) Moments(IReadOnlyList<double> values)
    {
        double sum = 0, sumSq = 0;
        foreach (var v in values) sum += v;
        var mean = sum / values.Count;
        foreach (var v in values) sumSq += (v - mean) * (v - mean);
        return (mean, values.Count > 1 ? sumSq / (values.Count - 1) : 0);
    }

    private static (double Sd, double Mean) Spread(CellContents reference, CellContents surrogate, Func<double[], double[], double> distance, int seed,
        bool perturbReference, bool perturbSurrogate)
    {
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        var a = new double[reference.SumW.Length];
        var b = new double[surrogate.SumW.Length];
        double sum = 0, sumSq = 0;
        for (var r = 0; r < Replicas; r++)
        {
            Draw(reference, a, rng, perturbReference);
            Draw(surrogate, b, rng, perturbSurrogate);
            var v = distance(a, b);
            sum += v;
            sumSq += v * v;
        }
        var mean = sum / Replicas;
        return (Math.Sqrt(Math.Max(0, sumSq / Replicas - mean * mean) * Replicas / (Replicas - 1)), mean);
    }

    private static void Draw(CellContents cells, double[] into, Random rng, bool perturb)
    {
        for (var i = 0; i < into.Length; i++)
        {
            if (!perturb || cells.SumW2[i] <= 0)
            {
                into[i] = cells.SumW[i];
                continue;
            }
            // A cell of signed weights (possible on a fine grid) may stay negative; a non-negative one may not turn negative.
            var drawn = cells.SumW[i] + Math.Sqrt(cells.SumW2[i]) * MathNet.Numerics.Distributions.Normal.Sample(rng, 0, 1);
            into[i] = cells.SumW[i] < 0 ? drawn : Math.Max(0, drawn);
        }
    }
}
