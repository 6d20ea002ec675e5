using GateTasks.Engine.Statistics;
using MathNet.Numerics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>
/// The bootstraps' sampler against the laws it claims, as given by MathNet.Numerics (the version in
/// Directory.Packages.props): Normal.CDF, Poisson.PMF, ChiSquared.InvCDF, SpecialFunctions.FactorialLn. Each test
/// draws a fixed seed's numbers and applies a goodness-of-fit test at level 0.001, so a sampler off its law fails.
/// </summary>
public class SeededSamplerTests
{
    [Fact]
    public void Normal_numbers_follow_the_standard_normal_law()
    {
        const int n = 400_000;
        var rng = new SeededSampler(20_261_203);
        var x = new double[n];
        for (var i = 0; i < n; i++) x[i] = rng.Normal();
        Array.Sort(x);
        // Kolmogorov–Smirnov distance to MathNet's Normal.CDF(0, 1, ·); 1.9495/√n is the Kolmogorov law's 0.999 quantile
        // (Smirnov 1948, Ann. Math. Stat. 19:279, table of the limiting law).
        var d = 0.0;
        for (var i = 0; i < n; i++)
        {
            var f = Normal.CDF(0, 1, x[i]);
            d = Math.Max(d, Math.Max(f - (double)i / n, (i + 1.0) / n - f));
        }
        Assert.True(d < 1.9495 / Math.Sqrt(n), $"KS distance {d}");
        // The tails beyond the ziggurat's base (R = 3.4426, Doornik 2005) are drawn apart: their share is 2·Φ(−R).
        var beyond = x.Count(v => Math.Abs(v) > 3.442619855899);
        var expected = 2 * Normal.CDF(0, 1, -3.442619855899) * n;
        Assert.True(Math.Abs(beyond - expected) < 4 * Math.Sqrt(expected), $"{beyond} beyond R, expected {expected}");
    }

    [Theory]
    [InlineData(0.3)]
    [InlineData(4.0)]
    [InlineData(9.99)] // the last mean of the product method
    [InlineData(10.0)] // the first of the rejection method
    [InlineData(49.0)]
    [InlineData(800.0)]
    public void Poisson_numbers_follow_the_Poisson_law(double mean)
    {
        const int n = 200_000;
        var rng = new SeededSampler(7 + (long)(mean * 100));
        var law = new PoissonLaw(mean);
        var counts = new Dictionary<long, int>();
        for (var i = 0; i < n; i++)
        {
            var k = rng.Poisson(law);
            Assert.True(k >= 0);
            counts[k] = counts.GetValueOrDefault(k) + 1;
        }
        // Pearson's χ² against MathNet's Poisson.PMF, the cells pooled from each end until each expects at least 5.
        var lo = 0L;
        while (Poisson.CDF(mean, lo) * n < 5) lo++;
        var hi = lo;
        while ((1 - Poisson.CDF(mean, hi)) * n >= 5) hi++;
        double chi2 = 0;
        var cells = 0;
        for (var k = lo; k <= hi; k++)
        {
            var p = k == lo ? Poisson.CDF(mean, lo) : k == hi ? 1 - Poisson.CDF(mean, hi - 1) : Poisson.PMF(mean, (int)k);
            var observed = k == lo ? counts.Where(c => c.Key <= lo).Sum(c => c.Value)
                : k == hi ? counts.Where(c => c.Key >= hi).Sum(c => c.Value) : counts.GetValueOrDefault(k);
            chi2 += (observed - n * p) * (observed - n * p) / (n * p);
            cells++;
        }
        var critical = ChiSquared.InvCDF(cells - 1, 0.999);
        Assert.True(chi2 < critical, $"χ² {chi2} on {cells - 1} degrees of freedom, 0.999 quantile {critical}");
    }

    [Fact]
    public void Log_factorials_agree_with_MathNet()
    {
        foreach (var k in new long[] { 0, 1, 2, 10, 100, 255, 256, 257, 1000, 12_345, 1_000_000, 123_456_789 })
        {
            var expected = SpecialFunctions.FactorialLn((int)k);
            Assert.True(Math.Abs(SeededSampler.LogFactorial(k) - expected) <= 1e-14 * Math.Max(1, expected), $"ln {k}!: {SeededSampler.LogFactorial(k)} vs {expected}");
        }
    }

    [Fact]
    public void One_seed_gives_one_stream()
    {
        // The checks' numbers must not change from run to run (a comparison of the program with itself).
        var (a, b) = (new SeededSampler(42), new SeededSampler(42));
        var law = new PoissonLaw(30);
        for (var i = 0; i < 1000; i++)
        {
            Assert.Equal(a.Normal(), b.Normal());
            Assert.Equal(a.Poisson(law), b.Poisson(law));
        }
    }
}
