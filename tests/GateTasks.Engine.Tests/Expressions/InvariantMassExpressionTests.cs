using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

public class InvariantMassExpressionTests
{
    private const string MassFormula = "sqrt(2*pt1*pt2*(cosh(eta1-eta2) - cos(phi1-phi2)))";

    // Massless two-body invariant mass, m² = 2 pT1 pT2 (cosh Δη − cos Δφ): standard collider kinematics
    // (from memory), cross-checked below against (E1+E2)² − |p1+p2|² from four-vectors.
    private static double FromFourVectors(double pt1, double eta1, double phi1, double pt2, double eta2, double phi2)
    {
        var px = pt1 * Math.Cos(phi1) + pt2 * Math.Cos(phi2);
        var py = pt1 * Math.Sin(phi1) + pt2 * Math.Sin(phi2);
        var pz = pt1 * Math.Sinh(eta1) + pt2 * Math.Sinh(eta2);
        var e = pt1 * Math.Cosh(eta1) + pt2 * Math.Cosh(eta2);
        return Math.Sqrt(e * e - px * px - py * py - pz * pz);
    }

    [Fact]
    public void Worked_example_matches_the_hand_computation_and_the_four_vector_sum()
    {
        // [exact, hand-computed] pT1 = 50, η1 = 0.5, φ1 = 0.1; pT2 = 40, η2 = −0.3, φ2 = 2.9.
        //   Δη = 0.8, Δφ = −2.8.
        //   e^0.8 = Σ 0.8^k/k! = 1 + 0.8 + 0.32 + 0.0853333 + 0.0170667 + 0.00273067 + 0.000364089 + … = 2.225540928492
        //   e^−0.8 = 1/2.225540928492 = 0.449328964117;  cosh 0.8 = (2.225540928492 + 0.449328964117)/2 = 1.337434946305
        //   cos(−2.8) = −cos(π − 2.8) = −cos(0.341592653590); x² = 0.116685540987,
        //   cos x = 1 − x²/2 + x⁴/24 − x⁶/720 + x⁸/40320 = 1 − 0.058342770493 + 0.000567313145 − 0.000002206575 + 0.000000004598
        //         = 0.942222340675 (next term −6e−12) → 0.942222340669;  so cos Δφ = −0.942222340669
        //   cosh Δη − cos Δφ = 1.337434946305 + 0.942222340669 = 2.279657286974
        //   m² = 2·50·40·2.279657286974 = 9118.629147895;  m = √9118.629147895 = 95.491513486 (95.4915² = 9118.62657, +0.00258/(2·95.4915))
        const double handMass = 95.4915134862;
        var fourVector = FromFourVectors(50, 0.5, 0.1, 40, -0.3, 2.9);
        Assert.Equal(handMass, fourVector, 1e-8); // [exact, hand-computed] vs plain C# four-vectors

        // A batch of several rows: the worked example, two exact cases and two more checked against four-vectors.
        double[] pt1 = [50, 30, 25, 120.5, 7.25];
        double[] eta1 = [0.5, 0.0, 1.2, -2.1, 0.33];
        double[] phi1 = [0.1, 0.0, -0.4, 3.0, -1.9];
        double[] pt2 = [40, 30, 25, 15.0, 60.0];
        double[] eta2 = [-0.3, 0.0, 1.2, 0.7, -1.6];
        double[] phi2 = [2.9, Math.PI, -0.4, -2.5, 0.8];
        var m = ExpressionRun.Evaluate(MassFormula,
            ("pt1", pt1), ("eta1", eta1), ("phi1", phi1), ("pt2", pt2), ("eta2", eta2), ("phi2", phi2));

        Assert.Equal(handMass, m[0], 1e-8); // [exact, hand-computed]
        // [exact] back to back at η = 0: cosh 0 − cos π = 2, m² = 4 pT², m = 2 pT = 60.
        Assert.Equal(60.0, m[1], 1e-12);
        // [exact] identical directions: cosh 0 − cos 0 = 0, m = 0.
        Assert.Equal(0.0, m[2]);
        foreach (var i in new[] { 0, 1, 3, 4 })
        {
            // Row 2 (m = 0) is left out: E² − |p|² cancels catastrophically there and leaves ~1e-6 of rounding.
            // Plain C# four-vector sum, computed here (E = pT cosh η, pz = pT sinh η, px,py = pT cos φ, pT sin φ).
            Assert.Equal(FromFourVectors(pt1[i], eta1[i], phi1[i], pt2[i], eta2[i], phi2[i]), m[i], 1e-9 * Math.Max(1, m[i]));
        }
    }

    [Fact]
    public void Mass_expression_reads_its_six_columns_in_first_use_order_and_is_numeric()
    {
        var compiled = ExpressionCompiler.Compile(MassFormula, ["phi2", "phi1", "eta2", "eta1", "pt2", "pt1", "unused"], ExpressionRun.Start);
        Assert.Equal(["pt1", "pt2", "eta1", "eta2", "phi1", "phi2"], compiled.Columns);
        Assert.False(compiled.IsBoolean);
        Assert.Equal(MassFormula, compiled.Text);
    }
}
