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
    /// The distance in <see cref="Replicas"/> replicas drawn from a pair of laws exactly at the tolerance: the
    /// reference's cells, and the mixture (1 − λ)·reference + λ·sample (each normalised) with λ chosen so that the two
    /// are <paramref name="tolerance"/> apart — the point of "within tolerance" nearest to what was observed, along the
    /// observed difference. Drawing from a law that obeys the null is the bootstrap test of Efron &amp; Tibshirani
    /// (1993, ch. 16) and the first guideline of Hall &amp; Wilson (1991, Biometrics 47:757); the p-value of "within
    /// tolerance" is then P(D* ≥ observed) (<see cref="TailProbability"/>). Each cell is a scaled Poisson count,
    /// κ·Poisson(μ/κ), with κ = Σw²/Σw of that cell (mixed like the means on the sample's side): exact for unit weights,
    /// the compound-Poisson scaling of Kish (1965)'s effective count otherwise, so sparse cells keep their skew and
    /// never go negative. Cells with a mean or variance that is not positive are held at their mean. Null when the
    /// observed distance is within the tolerance.
    /// </summary>
    public static double[]? BoundaryReplicas(CellContents reference, CellContents sample, Func<double[], double[], double> distance,
        double estimate, double tolerance, int seed)
    {
        if (!(estimate > tolerance)) return null;
        double ta = 0, ta2 = 0, tb = 0, tb2 = 0;
        for (var i = 0; i < reference.SumW.Length; i++)
        {
            ta += reference.SumW[i];
            ta2 += reference.SumW2[i];
            tb += sample.SumW[i];
            tb2 += sample.SumW2[i];
        }
        if (!(ta > 0) || !(tb > 0)) return null;
        var n = reference.SumW.Length;
        var mixed = new double[n];
        void Mix(double lambda)
        {
            for (var i = 0; i < n; i++) mixed[i] = tb * ((1 - lambda) * reference.SumW[i] / ta + lambda * sample.SumW[i] / tb);
        }
        // The distance along the line from the reference to the sample grows from 0 to the estimate (W₁ linearly, JSD
        // convexly), so bisection finds the λ at the tolerance.
        double lo = 0, hi = 1;
        for (var k = 0; k < 50; k++)
        {
            var mid = (lo + hi) / 2;
            Mix(mid);
            if (distance(reference.SumW, mixed) > tolerance) hi = mid;
            else lo = mid;
        }
        var lambdaAtTolerance = (lo + hi) / 2;
        Mix(lambdaAtTolerance);
        // The boundary sample's Σw² per cell: the reference's shape at the sample's mean weight, and the sample's own.
        var sampleKappa = tb2 > 0 ? tb2 / tb : 1;
        var referenceKappa = ta2 > 0 ? ta2 / ta : 1;
        var mixedW2 = new double[n];
        for (var i = 0; i < n; i++)
            mixedW2[i] = (1 - lambdaAtTolerance) * reference.SumW2[i] * (tb / ta) * (sampleKappa / referenceKappa) + lambdaAtTolerance * sample.SumW2[i];
        var rng = new Xoshiro256StarStar(seed + 3, threadSafe: false);
        var a = new double[n];
        var b = new double[n];
        var result = new double[Replicas];
        for (var r = 0; r < Replicas; r++)
        {
            for (var i = 0; i < n; i++)
            {
                a[i] = ScaledPoisson(reference.SumW[i], reference.SumW2[i], rng);
                b[i] = ScaledPoisson(mixed[i], mixedW2[i], rng);
            }
            result[r] = distance(a, b);
        }
        return result;
    }

    private static double ScaledPoisson(double mean, double sumW2, Random rng) =>
        mean > 0 && sumW2 > 0 ? sumW2 / mean * MathNet.Numerics.Distributions.Poisson.Sample(rng, mean * mean / sumW2) : mean;

    /// <summary>
    /// P(D ≥ <paramref name="value"/>) for the law of <paramref name="replicas"/>, from the gamma law of the same mean
    /// and variance (the two-moment scaled-χ² approximation of Satterthwaite 1946, the shape of a divergence, a weighted
    /// sum of noncentral χ²₁ terms), which reaches the small p-values a multiplicity correction asks for where 200
    /// replicas cannot.
    /// </summary>
    public static double TailProbability(IReadOnlyList<double> replicas, double value)
    {
        var (mean, variance) = Moments(replicas);
        if (!(mean > 0) || !(variance > 0)) return value > mean ? 0 : 1;
        return 1 - MathNet.Numerics.Distributions.Gamma.CDF(mean * mean / variance, mean / variance, value);
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
