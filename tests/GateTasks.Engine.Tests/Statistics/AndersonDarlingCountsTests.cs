using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class AndersonDarlingCountsTests
{
    private static double[] Counts(int[] values, int max)
    {
        var c = new double[max + 1];
        foreach (var v in values) c[v]++;
        return c;
    }

    [Fact]
    public void Binned_counts_reproduce_the_published_tie_adjusted_statistic()
    {
        // Scholz's k-sample Anderson–Darling documentation, 3-sample case [pub, via reference-values.md]:
        // x1 = [1, 3, 2, 5, 7], x2 = [2, 8, 1, 6, 9, 4], x3 = [12, 5, 7, 9, 11]; tie-adjusted T = 1.62856, p = 0.07084.
        // As counts per distinct value (bins 0..12), the data are exactly the tied data the form was made for.
        var (_, sigma, t, p) = AndersonDarling.TieAdjustedFromCounts([
            Counts([1, 3, 2, 5, 7], 12), Counts([2, 8, 1, 6, 9, 4], 12), Counts([12, 5, 7, 9, 11], 12)]);
        Assert.Equal(0.92837, sigma, 5);
        Assert.Equal(1.62856, t, 4);
        Assert.Equal(0.07084, p, 4);
    }

    [Fact]
    public void Counts_agree_with_the_sample_form_on_tied_data()
    {
        // The same statistic from raw tied samples (the sample form, checked against the paper elsewhere).
        int[] a = [1, 1, 2, 3, 3, 3, 4, 6, 6, 7], b = [2, 2, 3, 4, 4, 5, 5, 6, 8, 8, 8];
        var fromSamples = AndersonDarling.KSample([a.Select(x => (double)x).ToArray(), b.Select(x => (double)x).ToArray()]);
        var fromCounts = AndersonDarling.TieAdjustedFromCounts([Counts(a, 8), Counts(b, 8)]);
        Assert.Equal(fromSamples.A2akN, fromCounts.A2akN, 12);
        Assert.Equal(fromSamples.TakN, fromCounts.T, 12);
    }
}
