using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;
using GateTasks.Engine.Tests.Accumulation;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// A sliced distance that cannot be measured (a sample with no row, or whose weights cancel along the projections) is
/// inconclusive with its reason and no p-value: never an exception, never a pass (docs/contract.md, "Joint structure").
/// </summary>
public class SlicedUncomputableTests
{
    private static readonly string[] Names = ["x", "y"];

    private static (SlicedGrid Grid, SlicedHistograms Reference) Reference()
    {
        var rng = new Random(5);
        double[][] columns = [Enumerable.Range(0, 4000).Select(_ => rng.NextDouble()).ToArray(), Enumerable.Range(0, 4000).Select(_ => rng.NextDouble()).ToArray()];
        var projection = new SlicedProjection(SlicedDirections.Draw(Names, 8), [0.5, 0.5], [0.29, 0.29]);
        var builder = new GateTasks.Engine.References.SlicedGridBuilder(projection, [0, 0], [1, 1]);
        builder.Add(columns, []);
        var grid = new SlicedGrid(Names, projection.Directions, [0.5, 0.5], [0.29, 0.29], builder.Edges());
        var counter = grid.Counter();
        counter.Add(columns, []);
        return (grid, counter.Finish());
    }

    private static JointSpec Spec() => ContractLoader.Parse("""
        contract-version: 1
        sample: s.parquet
        reference: r.parquet
        features:
          - name: x
            checks: { ks-max: 0.05 }
          - name: y
            checks: { ks-max: 0.05 }
        joint:
          features: [x, y]
          sliced-ks-max: { worst: 0.5, mean: 0.5 }
          sliced-wasserstein-max: { worst: 5, mean: 5 }
        """, "c.yaml").Joint!;

    [Fact]
    public void A_sample_without_rows_or_with_cancelling_weights_leaves_every_sliced_check_undecided()
    {
        var (grid, reference) = Reference();
        var empty = grid.Counter().Finish();
        var measured = SlicedCheck.Evaluate(Spec(), reference, empty, DecisionSettings.Default, 0);
        Assert.Equal(4, measured.Count);
        Assert.All(measured, m =>
        {
            Assert.True(m.Measured.Uncomputable, m.Measured.Summary);
            Assert.True(double.IsNaN(m.Measured.PValue));
            Assert.Contains("cannot be measured", m.Measured.Summary);
        });

        // Two copies of each row, weighted +1 and −1: every projection's total weight is zero.
        var cancelling = grid.Counter();
        double[][] rows = [[0.2, 0.7, 0.4, 0.9], [0.3, 0.1, 0.8, 0.5]];
        cancelling.Add([[.. rows[0], .. rows[0]], [.. rows[1], .. rows[1]]], [1, 1, 1, 1, -1, -1, -1, -1]);
        measured = SlicedCheck.Evaluate(Spec(), reference, cancelling.Finish(), DecisionSettings.Default, 8);
        Assert.All(measured, m => Assert.True(m.Measured.Uncomputable, m.Measured.Summary));

        // Nothing gathered at all (a sample accumulation without the block's histograms).
        Assert.All(SlicedCheck.Evaluate(Spec(), reference, null, DecisionSettings.Default, 0), m => Assert.True(m.Measured.Uncomputable));
    }
}
