using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>Three distances, D(a₀, b₀), D(a₁, b₁) and D(a₂, b₂), computed together.</summary>
internal delegate (double First, double Second, double Third) ThreeDistances(double[] a0, double[] b0, double[] a1, double[] b1, double[] a2, double[] b2);

/// <summary>Four distances, D(a₀, b₀) … D(a₃, b₃), computed together.</summary>
internal delegate (double First, double Second, double Third, double Fourth) FourDistances(double[] a0, double[] b0, double[] a1, double[] b1,
    double[] a2, double[] b2, double[] a3, double[] b3);

/// <summary>Contents of one histogram's cells: Σw and Σw².</summary>
internal readonly record struct CellContents(double[] SumW, double[] SumW2);

/// <summary>
/// Standard error of a histogram distance by a parametric bootstrap (Efron 1979): each cell's Σw is redrawn from a
/// normal of variance Σw² (the large-count limit of Poisson fluctuations, weights included), with a fixed seed so
/// every run gives the same numbers (<see cref="SeededSampler"/>: a fast generator, since a fine grid's thousands of
/// cells are redrawn hundreds of times per check). The reference and surrogate parts of the error are estimated
/// separately, which tells how the error shrinks with more surrogate events.
/// </summary>
internal static class HistogramBootstrap
{
    public const int Replicas = 200;

    public readonly record struct Errors(double Total, double Reference, double Surrogate);

    /// <summary>The standard errors and the bias of a distance, from one set of replicas.</summary>
    public readonly record struct Noise(Errors Errors, double Bias);

    /// <summary>
    /// The distance's standard errors (the reference's part, the surrogate's part, and both in quadrature: the two
    /// samples are independent) and its bias, the mean of replicas with both samples redrawn less the estimate (Efron &amp;
    /// Tibshirani 1993, An Introduction to the Bootstrap, ch. 10; a distance is positive even between two samples of one
    /// law, and the bias-corrected estimate, the estimate less the bias, removes most of that floor), from <see cref="Replicas"/> pairs of redrawn cells:
    /// in each replica the reference's redrawn cells a* and the surrogate's b* give D(a*, b) for the reference's part,
    /// D(a, b*) for the surrogate's and D(a*, b*) for the bias. Each of the three is a sample of its own law, as if
    /// drawn alone; sharing the draws only correlates the three estimates, and halves the draws.
    /// <c>three</c>, when given, computes a replica's three distances D(a*, b), D(a, b*) and D(a*, b*) at once (its
    /// arguments in that order of pairs), each bit for bit what <c>distance</c> gives, only faster.
    /// </summary>
    public static Noise StandardErrorsAndBias(CellContents reference, CellContents surrogate, Func<double[], double[], double> distance,
        double estimate, int seed, ThreeDistances? three = null)
    {
        var rng = new SeededSampler(seed);
        var referenceSd = StandardDeviations(reference);
        var surrogateSd = StandardDeviations(surrogate);
        var scratch = BootstrapScratch.Current;
        var a = scratch.Doubles(BootstrapScratch.ReferenceDraws, reference.SumW.Length);
        var b = scratch.Doubles(BootstrapScratch.SampleDraws, surrogate.SumW.Length);
        MomentSums refOnly = default, surOnly = default, both = default;
        for (var r = 0; r < Replicas; r++)
        {
            Draw(reference.SumW, referenceSd, a, ref rng);
            Draw(surrogate.SumW, surrogateSd, b, ref rng);
            if (three is not null)
            {
                var (refRedrawn, surRedrawn, bothRedrawn) = three(a, surrogate.SumW, reference.SumW, b, a, b);
                refOnly.Add(refRedrawn);
                surOnly.Add(surRedrawn);
                both.Add(bothRedrawn);
                continue;
            }
            refOnly.Add(distance(a, surrogate.SumW));
            surOnly.Add(distance(reference.SumW, b));
            both.Add(distance(a, b));
        }
        var (refSd, surSd) = (refOnly.StandardDeviation, surOnly.StandardDeviation);
        return new Noise(new Errors(Math.Sqrt(refSd * refSd + surSd * surSd), refSd, surSd), both.Mean - estimate);
    }

    private struct MomentSums
    {
        private double _sum, _sumSq;

        public void Add(double v)
        {
            _sum += v;
            _sumSq += v * v;
        }

        public readonly double Mean => _sum / Replicas;

        public readonly double StandardDeviation => Math.Sqrt(Math.Max(0, _sumSq / Replicas - Mean * Mean) * Replicas / (Replicas - 1));
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
    /// The distance in <see cref="Replicas"/> replicas drawn from a pair of laws exactly at the tolerance: the
    /// reference's cells, and the mixture (1 − λ)·reference + λ·sample (each normalised) with λ chosen so that the two
    /// are <paramref name="tolerance"/> apart — the point of "within tolerance" nearest to what was observed, along the
    /// observed difference. Drawing from a law that obeys the null is the bootstrap test of Efron &amp; Tibshirani
    /// (1993, ch. 16) and the first guideline of Hall &amp; Wilson (1991, Biometrics 47:757); the p-value of "within
    /// tolerance" is then P(D* ≥ observed) (<see cref="TailProbability"/>). Each cell is a scaled Poisson count,
    /// κ·Poisson(μ/κ), with κ = Σw²/Σw of that cell (mixed like the means on the sample's side): exact for unit weights,
    /// the compound-Poisson scaling of Kish (1965)'s effective count otherwise, so sparse cells keep their skew and
    /// never go negative. Cells with a mean or variance that is not positive are held at their mean. Null when the
    /// observed distance is within the tolerance. <c>four</c>, when given, computes four replicas' distances at once
    /// (each bit for bit what <c>distance</c> gives, only faster); the draws are the same either way.
    /// </summary>
    public static double[]? BoundaryReplicas(CellContents reference, CellContents sample, Func<double[], double[], double> distance,
        double estimate, double tolerance, int seed, FourDistances? four = null)
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
        var scratch = BootstrapScratch.Current;
        var mixed = scratch.Doubles(BootstrapScratch.Mixed, n);
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
        var mixedW2 = scratch.Doubles(BootstrapScratch.MixedSquares, n);
        for (var i = 0; i < n; i++)
            mixedW2[i] = (1 - lambdaAtTolerance) * reference.SumW2[i] * (tb / ta) * (sampleKappa / referenceKappa) + lambdaAtTolerance * sample.SumW2[i];
        var rng = new SeededSampler(seed + 3);
        var referenceLaws = new ScaledPoissonCells(reference.SumW, reference.SumW2, scratch, 0);
        var mixedLaws = new ScaledPoissonCells(mixed, mixedW2, scratch, 1);
        var result = new double[Replicas];
        // Replicas are drawn one after the other as always; with `four`, four of them are kept and measured together.
        var lanes = four is null ? 1 : 4;
        var a = new double[lanes][];
        var b = new double[lanes][];
        for (var l = 0; l < lanes; l++)
        {
            a[l] = scratch.Doubles(BootstrapScratch.FirstLane + 2 * l, n);
            b[l] = scratch.Doubles(BootstrapScratch.FirstLane + 2 * l + 1, n);
        }
        for (var r = 0; r < Replicas; r++)
        {
            var lane = r % lanes;
            DrawPair(referenceLaws, mixedLaws, a[lane], b[lane], ref rng);
            if (four is null)
            {
                result[r] = distance(a[0], b[0]);
                continue;
            }
            if (lane < 3 && r < Replicas - 1) continue;
            // The last group may be short (Replicas not a multiple of four): its unused lanes repeat its first.
            for (var l = lane + 1; l < 4; l++)
                (a[l], b[l]) = (a[0], b[0]);
            var (d0, d1, d2, d3) = four(a[0], b[0], a[1], b[1], a[2], b[2], a[3], b[3]);
            var first = r - lane;
            result[first] = d0;
            if (lane >= 1) result[first + 1] = d1;
            if (lane >= 2) result[first + 2] = d2;
            if (lane >= 3) result[first + 3] = d3;
        }
        return result;
    }

    /// <summary>One replica's cells: each cell's reference draw, then its boundary-sample draw, cell after cell.</summary>
    private static void DrawPair(ScaledPoissonCells referenceLaws, ScaledPoissonCells mixedLaws, double[] a, double[] b, ref SeededSampler rng)
    {
        var local = rng; // drawn from a local copy (kept in registers), then written back
        for (var i = 0; i < a.Length; i++)
        {
            a[i] = referenceLaws.Draw(i, ref local);
            b[i] = mixedLaws.Draw(i, ref local);
        }
        rng = local;
    }

    /// <summary>
    /// Each cell's κ·Poisson(μ/κ) with κ = Σw²/μ, its constants computed once for all replicas; a cell whose mean or
    /// Σw² is not positive is held at its mean (κ = 0).
    /// </summary>
    private sealed class ScaledPoissonCells
    {
        private readonly double[] _mean, _kappa;
        private readonly PoissonLaw[] _laws;

        /// <summary>The laws of cells with these means and Σw², in <paramref name="scratch"/>'s arrays of slot 0 or 1.</summary>
        public ScaledPoissonCells(double[] mean, double[] sumW2, BootstrapScratch scratch, int slot)
        {
            _mean = mean;
            _kappa = scratch.Doubles(slot == 0 ? BootstrapScratch.ReferenceKappa : BootstrapScratch.MixedKappa, mean.Length);
            _laws = scratch.Laws(slot, mean.Length);
            for (var i = 0; i < mean.Length; i++)
            {
                _kappa[i] = 0; // held at its mean unless its law is set below; the array may hold an earlier check's values
                if (!(mean[i] > 0 && sumW2[i] > 0)) continue;
                _kappa[i] = sumW2[i] / mean[i];
                _laws[i] = new PoissonLaw(mean[i] * mean[i] / sumW2[i]);
            }
        }

        [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
        public double Draw(int i, ref SeededSampler rng) => _kappa[i] > 0 ? _kappa[i] * rng.Poisson(in _laws[i]) : _mean[i];
    }

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

    /// <summary>
    /// The cells that are redrawn — those with Σw² positive, in increasing order — and each one's √Σw²; every other
    /// cell is held at its content. Listed once per bootstrap so the replicas' loops skip held cells without a branch
    /// per cell (many cells of a fine grid are empty in a small sample).
    /// </summary>
    private readonly record struct RedrawnCells(int[] Index, double[] Sd);

    private static RedrawnCells StandardDeviations(CellContents cells)
    {
        var index = new List<int>(cells.SumW2.Length);
        for (var i = 0; i < cells.SumW2.Length; i++)
            if (cells.SumW2[i] > 0) index.Add(i);
        var sd = new double[index.Count];
        for (var k = 0; k < sd.Length; k++) sd[k] = Math.Sqrt(cells.SumW2[index[k]]);
        return new RedrawnCells([.. index], sd);
    }

    /// <summary>One replica: the held cells copied, then each redrawn cell in increasing order, one normal number each.</summary>
    private static void Draw(double[] sumW, RedrawnCells redrawn, double[] into, ref SeededSampler rng)
    {
        Array.Copy(sumW, into, into.Length);
        var local = rng; // drawn from a local copy (kept in registers), then written back
        var (index, sd) = (redrawn.Index, redrawn.Sd);
        for (var k = 0; k < index.Length; k++)
        {
            var i = index[k];
            // A cell of signed weights (possible on a fine grid) may stay negative; a non-negative one may not turn negative.
            var drawn = sumW[i] + sd[k] * local.Normal();
            into[i] = sumW[i] < 0 ? drawn : Math.Max(0, drawn);
        }
        rng = local;
    }
}
