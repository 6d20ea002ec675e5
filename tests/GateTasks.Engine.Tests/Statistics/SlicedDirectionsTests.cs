using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>The seeded directions and the projection (the program against itself, and arithmetic by hand).</summary>
public sealed class SlicedDirectionsTests
{
    private static readonly string[] Names = ["pt", "eta", "mass", "ntrk"];

    [Fact]
    public void Directions_are_unit_reproducible_and_a_longer_list_extends_a_shorter_one()
    {
        var a = SlicedDirections.Draw(Names, 64);
        var b = SlicedDirections.Draw(Names, 128);
        Assert.Equal(a, b[..a.Length]);
        Assert.Equal(a, SlicedDirections.Draw(Names, 64));
        for (var k = 0; k < 64; k++)
        {
            var norm = Math.Sqrt(Enumerable.Range(0, 4).Sum(j => a[k * 4 + j] * a[k * 4 + j]));
            Assert.InRange(norm, 1 - 1e-6, 1 + 1e-6); // single-precision components of a unit vector
            Assert.All(a.AsSpan(k * 4, 4).ToArray(), v => Assert.Equal(v, (double)(float)v));
        }
        Assert.NotEqual(a, SlicedDirections.Draw(["eta", "pt", "mass", "ntrk"], 64));
    }

    [Fact]
    public void A_row_is_standardised_by_the_given_means_and_deviations_before_projecting()
    {
        // By hand: u = (0.6, 0.8), means (1, 2), deviations (2, 4); x = (3, 10): z = (1, 2), p = 0.6 + 1.6 = 2.2.
        var projection = new SlicedProjection([0.6, 0.8], [1, 2], [2, 4]);
        Assert.Equal(2.2, projection.ProjectRow([3, 10], 0), 12);
        var output = new double[1];
        projection.ProjectRows([[3.0], [10.0]], 0, 1, output, 1);
        Assert.Equal(projection.ProjectRow([3, 10], 0), output[0]);
        Assert.Throws<ArgumentException>(() => new SlicedProjection([1, 0], [0, 0], [1, 0]));
    }
}
