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
    // loop replaced on the stack) cost several times the optimised loop.
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private double[][] Experiment(int seed, bool perturbReference, bool perturbSample, double[][] sampleCentre)
    {
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        var k = _reference.Projections;
        var refCounts = new int[_reference.Groups];
        var samCounts = new int[_sample.Groups];
        var a = new double[k][];
        var b = new double[k][];
        for (var p = 0; p < k; p++)
        {
            a[p] = new double[_reference.Cells[p].Length];
            b[p] = new double[_sample.Cells[p].Length];
        }
        var ks = new double[k];
        var w1 = new double[k];
        var result = new double[Replicas][];
        for (var r = 0; r < Replicas; r++)
        {
            Draw(refCounts, rng, perturbReference);
            Draw(samCounts, rng, perturbSample);
            for (var p = 0; p < k; p++)
            {
                Replicate(_reference, p, _reference.Cells[p], refCounts, perturbReference, a[p]);
                Replicate(_sample, p, sampleCentre[p], samCounts, perturbSample, b[p]);
                (ks[p], w1[p]) = SlicedDistance.Both(_reference.Edges[p], a[p], b[p], _reference.StandardDeviation[p]);
            }
            result[r] = [ks.Max(), ks.Average(), w1.Max(), w1.Average()];
        }
        return result;
    }

    private static void Draw(int[] counts, Random rng, bool perturb)
    {
        Array.Clear(counts);
        if (!perturb) return;
        for (var i = 0; i < counts.Length; i++) counts[rng.Next(counts.Length)]++;
    }

    /// <summary>centre + √(G/(G − 1))·(Σ_g c_g·H_g − H) for projection p (just the centre when not perturbed).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private static void Replicate(SlicedHistograms side, int p, double[] centre, int[] counts, bool perturb, double[] into)
    {
        Array.Copy(centre, into, centre.Length);
        if (!perturb) return;
        var g = counts.Length;
        var scale = Math.Sqrt(g / (g - 1.0));
        AddScaled(into, -scale, side.Cells[p]);
        for (var j = 0; j < g; j++)
            if (counts[j] != 0) AddScaled(into, scale * counts[j], side.GroupCells[p][j]);
    }

    // into[i] += factor·x[i], vectorised; each element rounded as the scalar expression is (multiply, then add).
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private static void AddScaled(double[] into, double factor, double[] x)
    {
        var i = 0;
        if (System.Numerics.Vector.IsHardwareAccelerated)
        {
            var f = new System.Numerics.Vector<double>(factor);
            var width = System.Numerics.Vector<double>.Count;
            for (; i <= into.Length - width; i += width)
                (new System.Numerics.Vector<double>(into, i) + f * new System.Numerics.Vector<double>(x, i)).CopyTo(into, i);
        }
        for (; i < into.Length; i++) into[i] += factor * x[i];
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
