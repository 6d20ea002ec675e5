using GateTasks.Engine.Checks;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Checks;

public class QuantileShiftCheckTests
{
    [Fact]
    public void Histogram_quantiles_interpolate_within_a_bin()
    {
        // Uniform on [0, 10) in 10 bins of 100 entries: the p-quantile is 10p and the density 0.1 (exact by construction).
        var axis = new RegularAxis(10, 0, 10);
        var cells = new double[12];
        for (var i = 1; i <= 10; i++) cells[i] = 100;
        var h = Histogram.FromCells(axis, cells, cells, 1000, 0, 0, 0);
        foreach (var p in new[] { 0.05, 0.5, 0.95, 0.333 })
        {
            var (q, f) = QuantileShiftCheck.Quantile(h, p);
            Assert.Equal(10 * p, q, 12);
            Assert.Equal(0.1, f, 12);
        }
    }
}
