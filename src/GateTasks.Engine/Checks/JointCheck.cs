using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Energy-distance two-sample test over the joint feature set (Székely &amp; Rizzo 2004) on the reference's stored
/// subsample and the sample's, each feature standardised by the reference subsample's mean and standard deviation,
/// with a seeded permutation p-value, stopped early once it is clearly not small (Besag &amp; Clifford 1991). Each row
/// carries its event weight (signed allowed): the statistic is the energy distance of the two weighted laws and the
/// permutations move rows with their weights (<see cref="EnergyDistance.PermutationTest"/>), so a weighted sample is
/// compared as the law its weights describe. A goodness-of-fit test: its p-value joins the contract's family.
/// </summary>
internal static class JointCheck
{
    /// <summary>Permutations as extreme as the observed labelling after which relabelling stops (h of Besag &amp; Clifford 1991).</summary>
    public const int StopAfterExceedances = 20;

    public static Measurement Evaluate(double[][] reference, double[] referenceWeights, double[][] sample, double[] sampleWeights, JointSpec spec, int permutations)
    {
        if (reference.Length < 10 || sample.Length < 10)
            return Measurement.Impossible($"the joint subsamples are too small ({reference.Length} reference and {sample.Length} sample rows without NaN)", []);
        var d = reference[0].Length;
        var means = new double[d];
        var sds = new double[d];
        for (var j = 0; j < d; j++)
        {
            means[j] = reference.Average(row => row[j]);
            var m = means[j];
            sds[j] = Math.Sqrt(reference.Sum(row => (row[j] - m) * (row[j] - m)) / (reference.Length - 1));
            if (!(sds[j] > 0))
                return Measurement.Impossible($"feature '{spec.Features[j]}' is constant in the reference subsample; drop it from the joint set", []);
        }
        if (!(referenceWeights.Sum() > 0) || !(sampleWeights.Sum() > 0))
            return Measurement.Impossible("the weights of a joint subsample sum to zero or less", []);
        // Unit weights on both sides: the unweighted statistic, bit for bit.
        var weighted = referenceWeights.Any(w => w != 1) || sampleWeights.Any(w => w != 1);
        var result = EnergyDistance.PermutationTest(
            EnergyDistance.Standardise(reference, means, sds), EnergyDistance.Standardise(sample, means, sds),
            permutations, HistogramBootstrap.Seed(spec.Name, ContractKeys.EnergyTest), StopAfterExceedances,
            weighted ? referenceWeights : null, weighted ? sampleWeights : null);
        return new Measurement(result.TestStatistic, double.NaN, double.NaN, result.PValue,
            $"{(weighted ? "weighted energy statistic T" : "energy statistic T")} {InvariantNumber.Short(result.TestStatistic)} on {reference.Length} + {sample.Length} rows, permutation p-value {InvariantNumber.Short(result.PValue)} ({result.Permutations} permutations)",
            [new("e_statistic", InvariantNumber.Exact(result.EStatistic)), new("reference_rows", reference.Length.ToString(System.Globalization.CultureInfo.InvariantCulture)),
             new("sample_rows", sample.Length.ToString(System.Globalization.CultureInfo.InvariantCulture))]);
    }
}
