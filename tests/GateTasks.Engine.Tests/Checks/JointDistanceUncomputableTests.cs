using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// A joint distance that cannot be computed is inconclusive with its reason and carries no p-value, never a p-value
/// of 0 (docs/contract.md, "Joint structure").
/// </summary>
public class JointDistanceUncomputableTests
{
    private static readonly DecisionSettings Decision = DecisionSettings.Default;

    private static AccumulatedJointMoments Accumulate(int rows, Func<int, double> weight)
    {
        var rng = new Random(rows);
        double[][] columns = [Enumerable.Range(0, rows).Select(_ => rng.NextDouble()).ToArray(), Enumerable.Range(0, rows).Select(_ => rng.NextDouble()).ToArray()];
        var joint = new JointMoments([0, 1], JointStandardisation.Identity(2), true, true);
        joint.Add(new FeatureView(columns, Enumerable.Range(0, rows).Select(weight).ToArray(), true, Enumerable.Range(0, rows).Select(i => (long)i).ToArray()) { Rows = rows });
        return joint.Finish();
    }

    [Fact]
    public void Blocks_whose_weights_cancel_or_that_hold_one_row_leave_both_checks_undecided()
    {
        var reference = Accumulate(2000, _ => 1);
        // Rows i and i + 16 share a block: weights +1 and −1 on them cancel every block's Σw.
        var cancelling = Accumulate(64, i => i % 32 < 16 ? 1 : -1);
        var frechet = FrechetCheck.Evaluate(reference, cancelling, new ToleranceCheck(CheckKind.FrechetDistance, 0.1, new SourceLocation("c.yaml")), Decision, 64);
        Assert.True(frechet.Uncomputable, frechet.Summary);
        Assert.True(double.IsNaN(frechet.PValue));
        Assert.Contains("no defined Gaussian fit", frechet.Summary);

        // Ten rows: six of the sixteen blocks are empty, so their kernel means are undefined.
        var tiny = Accumulate(10, _ => 1);
        var kernel = KernelDistanceCheck.Evaluate(reference, tiny, new ToleranceCheck(CheckKind.KernelDistance, 0.1, new SourceLocation("c.yaml")), Decision, 10);
        Assert.True(kernel.Uncomputable, kernel.Summary);
        Assert.True(double.IsNaN(kernel.PValue));
        Assert.Contains("kernel means are undefined", kernel.Summary);
    }
}
