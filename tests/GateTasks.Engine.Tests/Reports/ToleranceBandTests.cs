using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Reports;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>Bands and plotted bins agree with what the ratio check decided on.</summary>
public sealed class ToleranceBandTests(ReportCase run) : IClassFixture<ReportCase>
{
    private RunResult Report => _report ??= run.Run(30_000, 2, 0);
    private RunResult? _report;

    [Fact]
    public void Core_and_tails_bands_tile_the_axis_and_a_named_band_covers_the_bins_centred_in_its_range()
    {
        var c = Report.Comparisons.Single(f => f.Spec.Name == "x");
        var bands = ToleranceBand.For(c, Report.Outcomes.Where(o => o.Subject.Name == "x"));
        Assert.Equal(["core", "tails", "upper"], bands.Select(b => b.Region));
        var axis = c.Reference.Histogram.Axis;
        var core = bands.Single(b => b.Kind == Region.Core);
        var tails = bands.Single(b => b.Kind == Region.Tails);
        Assert.Single(core.Spans);
        Assert.Equal(2, tails.Spans.Count);
        Assert.Equal(axis.Lower(0), tails.Spans[0].Lower);
        Assert.Equal(tails.Spans[0].Upper, core.Spans[0].Lower);
        Assert.Equal(core.Spans[0].Upper, tails.Spans[1].Lower);
        Assert.Equal(axis.Upper(axis.Count - 1), tails.Spans[1].Upper);
        var upper = bands.Single(b => b.Kind == Region.Named);
        var centred = Enumerable.Range(0, axis.Count).Where(b => axis.Centre(b) >= 1 && axis.Centre(b) <= 4).ToList();
        Assert.Equal([(axis.Lower(centred[0]), axis.Upper(centred[^1]))], upper.Spans);
        Assert.Equal(0.2, upper.Tolerance);
    }

    [Fact]
    public void Plotted_ratios_give_the_ratio_checks_estimates()
    {
        foreach (var c in Report.Comparisons)
        {
            var bins = ComparedBin.Of(c);
            foreach (var o in Report.Outcomes.Where(o => o.Subject.Name == c.Spec.Name && o.Check.Kind == CheckKind.BinRatio))
            {
                var covered = RegionBins.Covered(c, Assert.IsType<RegionToleranceCheck>(o.Check));
                var worst = bins.Where((b, i) => covered[i] && b.Ratio is not null).Max(b => Math.Abs(b.Ratio!.Value.Ratio - 1));
                Assert.Equal(o.Measured.Estimate, worst, 12);
            }
            // Fractions of each histogram's total: the regular bins hold all of it but the flows' share.
            var h = c.Reference.Histogram;
            var flows = (h.SumW[0] + h.SumW[^1]) / h.TotalSumW;
            Assert.Equal(1 - flows, bins.Sum(b => b.Reference), 12);
        }
    }
}
