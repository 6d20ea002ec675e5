using System.Runtime.Intrinsics;
using GateTasks.Engine.Accumulation;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Uncertainty of sliced distances by resampling the groups of rows each side keeps (<see cref="SlicedHistogramCounter"/>):
/// a replicate draws G of the side's G groups with replacement and moves the histogram from H toward the resampled
/// sum H* by the factor √(G/(G − 1)), H + √(G/(G − 1))·(H* − H) — the rescaled bootstrap of Rao &amp; Wu (1988,
/// "Resampling inference with complex survey data", JASA 83:231), which makes the replicate variance of any cell an
/// unbiased estimate of its variance. The groups are random (a hash of the row) and hold whole rows, so one draw
/// moves all K projections of the same events together: the correlation between projections, which decides the
/// error of the mean and of the worst over K, is kept, as are event weights of either sign. A cell-by-cell draw
/// (<see cref="HistogramBootstrap"/>) would treat the K projections as independent and understate the mean's error.
/// <list type="bullet">
/// <item>Standard errors: the spread of the summary over <see cref="Replicas"/> replicates of one side with the other
/// held, the two parts added in quadrature (the samples are independent).</item>
/// <item>Bias: the mean over replicates of both sides less the estimate (Efron &amp; Tibshirani 1993, ch. 10), as
/// <see cref="DistanceDecision"/> takes it for the other distances.</item>
/// <item>Floor: the summary between the reference and the reference rescaled to the sample's total, each moved by its
/// own side's replicate fluctuation — two samples of one law at these sizes — whose mean is what the distance reads at
/// zero truth.</item>
/// <item>Boundary replicas (<see cref="BoundaryReplicas"/>): the same with the sample's side at the mixture
/// (1 − λ)·reference + λ·sample that lies exactly at the tolerance; every per-projection KS and W1 is linear in λ
/// along that line, so λ = tolerance/estimate.</item>
/// </list>
/// Replicates are drawn from a fixed seed, so every run gives the same numbers. Measured over independent pairs of
/// samples (SlicedDistanceTests): the error matches the spread of W1 at a clear difference, and overstates that of KS
/// (a maximum over edges) and of any distance at its floor by up to about 1.8×, resampling adding its noise to the
/// sample's own where the distance is not smooth — the cautious side.
/// </summary>
internal sealed class SlicedBootstrap
{
    /// <summary>Replicates per experiment.</summary>
    public const int Replicas = 200;

    private readonly SlicedHistograms _reference;
    private readonly SlicedHistograms _sample;
    private readonly int _seed;

    public SlicedBootstrap(SlicedHistograms reference, SlicedHistograms sample, int seed)
    {
        SlicedDistance.Require(reference, sample);
        if (reference.Groups < 2 || sample.Groups < 2)
            throw new ArgumentException("Each side needs at least two groups of rows for its uncertainty.");
        _reference = reference;
        _sample = sample;
        _seed = seed;
    }

    /// <summary>The four readings (KS and W1, worst and mean), from one set of replicates.</summary>
    public IReadOnlyList<SlicedReading> Read()
    {
        var combos = new (SlicedMeasure M, SlicedSummary S)[]
        {
            (SlicedMeasure.KolmogorovSmirnov, SlicedSummary.Worst), (SlicedMeasure.KolmogorovSmirnov, SlicedSummary.Mean),
            (SlicedMeasure.Wasserstein, SlicedSummary.Worst), (SlicedMeasure.Wasserstein, SlicedSummary.Mean),
        };
        var perProjection = new Dictionary<SlicedMeasure, double[]>
        {
            [SlicedMeasure.KolmogorovSmirnov] = SlicedDistance.PerProjection(SlicedMeasure.KolmogorovSmirnov, _reference, _sample),
            [SlicedMeasure.Wasserstein] = SlicedDistance.PerProjection(SlicedMeasure.Wasserstein, _reference, _sample),
        };
        // Four experiments, each from its own seed and its own buffers: run side by side, the same numbers.
        var experiments = new double[4][][];
        var floorCentre = Mixture(0);
        Parallel.For(0, experiments.Length, i => experiments[i] = i switch
        {
            0 => Experiment(_seed, perturbReference: true, perturbSample: false, _sample.Cells),
            1 => Experiment(_seed + 1, perturbReference: false, perturbSample: true, _sample.Cells),
            2 => Experiment(_seed + 2, perturbReference: true, perturbSample: true, _sample.Cells),
            _ => Experiment(_seed + 3, perturbReference: true, perturbSample: true, floorCentre),
        });
        var (referenceOnly, sampleOnly, both, floor) = (experiments[0], experiments[1], experiments[2], experiments[3]);
        var result = new List<SlicedReading>();
        for (var i = 0; i < combos.Length; i++)
        {
            var (m, s) = combos[i];
            var values = perProjection[m];
            var estimate = SlicedDistance.Summarise(values, s);
            var (refSd, _) = Moments(referenceOnly, i);
            var (samSd, _) = Moments(sampleOnly, i);
            var (_, bothMean) = Moments(both, i);
            var (floorSd, floorMean) = Moments(floor, i);
            var errors = new HistogramBootstrap.Errors(Math.Sqrt(refSd * refSd + samSd * samSd), refSd, samSd);
            result.Add(new SlicedReading(m, s, estimate, bothMean - estimate, errors, floorMean, floorSd, values,
                Array.IndexOf(values, values.Max())));
        }
        return result;
    }

    /// <summary>
    /// The summary in <see cref="Replicas"/> replicates of two samples whose laws are exactly
    /// <paramref name="tolerance"/> apart along the observed difference (see the class notes), for
    /// <see cref="DistanceDecision.Measure"/>'s p-value of "within tolerance"; null when the estimate is within the tolerance.
    /// </summary>
    public double[]? BoundaryReplicas(SlicedMeasure measure, SlicedSummary summary, double estimate, double tolerance)
    {
        if (!(estimate > tolerance) || !(tolerance >= 0)) return null;
        var index = (measure == SlicedMeasure.KolmogorovSmirnov ? 0 : 2) + (summary == SlicedSummary.Worst ? 0 : 1);
        var replicas = Experiment(_seed + 4, perturbReference: true, perturbSample: true, Mixture(tolerance / estimate));
        return replicas.Select(r => r[index]).ToArray();
    }

    /// <summary>The sample side's centre at λ along the line from the reference (rescaled to the sample's total) to the sample.</summary>
    private double[][] Mixture(double lambda)
    {
        var result = new double[_reference.Projections][];
        for (var k = 0; k < result.Length; k++)
        {
            double ta = _reference.TotalSumW(k), tb = _sample.TotalSumW(k);
            var a = _reference.Cells[k];
            var b = _sample.Cells[k];
            result[k] = new double[a.Length];
            for (var i = 0; i < a.Length; i++) result[k][i] = tb * ((1 - lambda) * a[i] / ta + lambda * b[i] / tb);
        }
        return result;
    }

    /// <summary>Per replicate the four summaries (KS worst, KS mean, W1 worst, W1 mean).</summary>
    // Optimised from the first call: a check runs each experiment once, so a tiered start (unoptimised code, then a
    // loop replaced on the stack) cost several times the optimised loop. The draws come first, in the order a
    // replicate-by-replicate loop makes them; then projection by projection every replicate, so one projection's
    // groups (about 70 kB a side) stay in cache while all replicates read them, instead of all projections' groups
    // (several MB) passing through it once a replicate. The numbers are the same.
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private double[][] Experiment(int seed, bool perturbReference, bool perturbSample, double[][] sampleCentre)
    {
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        var k = _reference.Projections;
        var refCounts = new int[Replicas][];
        var samCounts = new int[Replicas][];
        for (var r = 0; r < Replicas; r++)
        {
            refCounts[r] = Draw(_reference.Groups, rng, perturbReference);
            samCounts[r] = Draw(_sample.Groups, rng, perturbSample);
        }
        var ks = new double[Replicas][];
        var w1 = new double[Replicas][];
        for (var r = 0; r < Replicas; r++)
        {
            ks[r] = new double[k];
            w1[r] = new double[k];
        }
        var refTerms = new ScaledTerms(_reference.Groups + 1);
        var samTerms = new ScaledTerms(_sample.Groups + 1);
        for (var p = 0; p < k; p++)
        {
            var a = new double[_reference.Cells[p].Length];
            var b = new double[_sample.Cells[p].Length];
            for (var r = 0; r < Replicas; r++)
            {
                Replicate(_reference, p, _reference.Cells[p], refCounts[r], perturbReference, refTerms, a);
                Replicate(_sample, p, sampleCentre[p], samCounts[r], perturbSample, samTerms, b);
                (ks[r][p], w1[r][p]) = SlicedDistance.Both(_reference.Edges[p], a, b, _reference.StandardDeviation[p]);
            }
        }
        var result = new double[Replicas][];
        for (var r = 0; r < Replicas; r++) result[r] = [ks[r].Max(), ks[r].Average(), w1[r].Max(), w1[r].Average()];
        return result;
    }

    private static int[] Draw(int groups, Random rng, bool perturb)
    {
        var counts = new int[groups];
        if (!perturb) return counts;
        for (var i = 0; i < counts.Length; i++) counts[rng.Next(counts.Length)]++;
        return counts;
    }

    /// <summary>The terms factor·x a replicate adds to its centre, in the order they are added.</summary>
    private sealed class ScaledTerms(int capacity)
    {
        public readonly double[] Factors = new double[capacity];
        public readonly double[][] Values = new double[capacity][];
        public int Count;
    }

    /// <summary>centre + √(G/(G − 1))·(Σ_g c_g·H_g − H) for projection p (just the centre when not perturbed).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private static void Replicate(SlicedHistograms side, int p, double[] centre, int[] counts, bool perturb, ScaledTerms terms, double[] into)
    {
        if (!perturb)
        {
            Array.Copy(centre, into, centre.Length);
            return;
        }
        var g = counts.Length;
        var scale = Math.Sqrt(g / (g - 1.0));
        terms.Count = 0;
        terms.Factors[terms.Count] = -scale;
        terms.Values[terms.Count++] = side.Cells[p];
        for (var j = 0; j < g; j++)
            if (counts[j] != 0)
            {
                terms.Factors[terms.Count] = scale * counts[j];
                terms.Values[terms.Count++] = side.GroupCells[p][j];
            }
        AddScaled(centre, terms, into);
    }

    /// <summary>
    /// into[i] = centre[i] + f₀·x₀[i] + f₁·x₁[i] + …, added left to right and each product and sum rounded (multiply,
    /// then add; no fused multiply-add), as adding the terms to a copy of the centre one array at a time does; but one
    /// vector of cells at a time through all terms, so the partial sums stay in a register.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private static void AddScaled(double[] centre, ScaledTerms terms, double[] into)
    {
        var n = into.Length;
        if (centre.Length != n) throw new ArgumentException("The centre and the replicate differ in length.", nameof(centre));
        var count = terms.Count;
        var factors = terms.Factors;
        var values = terms.Values;
        for (var t = 0; t < count; t++)
            if (values[t].Length != n) throw new ArgumentException("A term differs in length from the replicate.", nameof(terms));
        var i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            const int width = 4;
            for (; i <= n - 2 * width; i += 2 * width)
            {
                var s0 = Vector256.Create(centre, i);
                var s1 = Vector256.Create(centre, i + width);
                for (var t = 0; t < count; t++)
                {
                    var f = Vector256.Create(factors[t]);
                    var x = values[t];
                    s0 += f * Vector256.Create(x, i);
                    s1 += f * Vector256.Create(x, i + width);
                }
                s0.CopyTo(into.AsSpan(i));
                s1.CopyTo(into.AsSpan(i + width));
            }
        }
        for (; i < n; i++)
        {
            var s = centre[i];
            for (var t = 0; t < count; t++) s += factors[t] * values[t][i];
            into[i] = s;
        }
    }

    /// <summary>Standard deviation and mean of summary i over the replicates whose value is defined.</summary>
    private static (double Sd, double Mean) Moments(double[][] replicas, int i)
    {
        var values = replicas.Select(r => r[i]).Where(double.IsFinite).ToArray();
        if (values.Length < 2) return (double.NaN, double.NaN);
        var mean = values.Average();
        var ss = values.Sum(v => (v - mean) * (v - mean));
        return (Math.Sqrt(ss / (values.Length - 1)), mean);
    }
}
