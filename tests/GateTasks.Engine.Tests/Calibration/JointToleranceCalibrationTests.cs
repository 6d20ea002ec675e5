using GateTasks.Engine.Contracts;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Tests.Calibration;

/// <summary>
/// `calibrate` does not simulate the joint block's streamed tolerance checks: its table says so instead of counting
/// them among the checks whose rates it reports (docs/cli.md).
/// </summary>
public class JointToleranceCalibrationTests
{
    [Fact]
    public void The_streamed_joint_checks_are_listed_as_not_calibrated()
    {
        var contract = ContractLoader.Parse("""
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
              frechet-max: 0.02
              kernel-distance-max: 0.01
            """, "c.yaml");
        var table = CalibrationTable.Format(contract, []);
        Assert.Contains("2 checks replicated (2 per feature, 0 on pairs)", table);
        Assert.Contains("Not calibrated (a reference keeps no rows to draw the joint law from; the rates below leave them out): frechet-max of joint(x,y), kernel-distance-max of joint(x,y).", table);
    }

    [Fact]
    public void The_sliced_checks_are_listed_as_not_calibrated_each_summary_apart()
    {
        var contract = ContractLoader.Parse("""
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
              sliced-ks-max: { worst: 0.03 }
              sliced-wasserstein-max: { worst: 0.05, mean: 0.02 }
            """, "c.yaml");
        var table = CalibrationTable.Format(contract, []);
        Assert.Contains("2 checks replicated (2 per feature, 0 on pairs)", table);
        Assert.Contains("Not calibrated (a reference keeps no rows to draw the joint law from; the rates below leave them out): " +
            "sliced-ks-max[worst] of joint(x,y), sliced-wasserstein-max[worst] of joint(x,y), sliced-wasserstein-max[mean] of joint(x,y).", table);
    }
}
