using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.Checks;

public class InterquartileWidthCheckTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);

    [Fact]
    public void The_unit_variance_of_a_uniform_interquartile_range_matches_the_hand_computed_value()
    {
        // Uniform on [0, 4): density 1/4 at both quartiles. By hand: 0.1875·16 + 0.1875·16 − 2·0.0625·16 = 4.
        Assert.Equal(4, InterquartileWidthCheck.UnitVariance(0.25, 0.75, 0.25, 0.25), 12);
    }

    [Fact]
    public void The_normal_efficiency_of_the_interquartile_width_is_the_published_37_percent()
    {
        // Rousseeuw & Croux (1993, JASA 88, p. 1273): the interquartile range has a Gaussian efficiency of 37%,
        // against Var(s) = σ²/(2n) for the standard deviation. Normal quantiles and density from MathNet.Numerics.
        var q = Normal.InvCDF(0, 1, 0.75);
        var f = Normal.PDF(0, 1, q);
        var iqrVariance = InterquartileWidthCheck.UnitVariance(0.25, 0.75, f, f) / Math.Pow(InterquartileWidthCheck.NormalIqrPerSigma, 2);
        Assert.Equal(0.37, 0.5 / iqrVariance, 2);
        Assert.Equal(InterquartileWidthCheck.NormalIqrPerSigma, 2 * q, 12);
    }

    [Fact]
    public void Outliers_in_the_tails_fail_the_width_ratio_but_not_the_interquartile_width()
    {
        // 1% of the sample's events from a ten times wider normal: σ grows by √(0.99 + 1) ≈ 1.41, while the quartiles
        // move by about 1% (solving 0.99Φ(x) + 0.01Φ(x/10) = 0.75 by hand gives x = 0.6816 against 0.6745).
        var rng = new Xoshiro256StarStar(7);
        var normal = new Normal(0, 1, rng);
        var axis = new VariableAxis(Enumerable.Range(0, 41).Select(i => i == 0 ? -6.0 : i == 40 ? 6.0 : Normal.InvCDF(0, 1, i / 40.0)).ToArray());
        var reference = new Histogram(axis);
        var sample = new Histogram(axis);
        const int n = 200_000;
        var xs = new double[n];
        var ys = new double[n];
        for (var i = 0; i < n; i++)
        {
            reference.Fill(xs[i] = normal.Sample());
            sample.Fill(ys[i] = rng.NextDouble() < 0.01 ? 10 * normal.Sample() : normal.Sample());
        }
        FeatureSummary Summary(double[] v) => new(n, n, n, v.Average(), MathNet.Numerics.Statistics.ArrayStatistics.PopulationStandardDeviation(v), v.Min(), v.Max(), 0);
        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new QuantileBinning(40, At),
            new CoreSpec(0.05, 0.95, At), [], At, At);
        var rf = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:40", reference, Summary(xs), []);
        var c = new FeatureComparison(spec, rf, sample, Summary(ys), Enumerable.Repeat(true, 40).ToList());

        var iqr = InterquartileWidthCheck.Evaluate(c, new ToleranceCheck(CheckKind.InterquartileWidthRatio, 0.03, At), DecisionSettings.Default);
        var se = double.Parse(iqr.Details.Single(d => d.Key == "standard_error").Value, System.Globalization.CultureInfo.InvariantCulture);
        Assert.InRange(se, 0.0030, 0.0045); // 1.1664/√n per sample at n = 2·10⁵, both samples: ≈ 0.0037
        Assert.InRange(iqr.Estimate, 0.0105 - 3 * se, 0.0105 + 3 * se);
        Assert.True(iqr.Upper < 0.03, $"upper bound {iqr.Upper}");
        var width = MomentShiftCheck.Width(c, new ToleranceCheck(CheckKind.WidthRatio, 0.03, At), DecisionSettings.Default);
        Assert.True(width.Estimate > 0.3, $"width ratio deviation {width.Estimate}");
        Assert.True(width.PValue < 1e-6);
    }
}
