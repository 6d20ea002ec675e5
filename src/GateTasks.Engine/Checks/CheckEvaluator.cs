using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Checks;

/// <summary>Measures the check a <see cref="CheckSpec"/> names on one feature comparison.</summary>
internal static class CheckEvaluator
{
    /// <summary>
    /// Measures, turning a kernel's refusal (e.g. negative cell contents a probability-based check cannot use, a cell
    /// with content but no variance) into an uncomputable measurement that says why — undecided, never a fail — rather
    /// than a crash.
    /// </summary>
    public static Measurement Measure(FeatureComparison comparison, CheckSpec spec, DecisionSettings decision)
    {
        try
        {
            return MeasureUnguarded(comparison, spec, decision);
        }
        catch (ArgumentException e)
        {
            return Measurement.Impossible($"{spec.Key} on these histograms: {e.Message} " +
                                          "(negative event weights can leave cells a probability-based check cannot use; ratio-max, ks-max, ks-test and mean-shift-max accept them)", []);
        }
    }

    private static Measurement MeasureUnguarded(FeatureComparison comparison, CheckSpec spec, DecisionSettings decision) => spec switch
    {
        GoodnessOfFitTest { Kind: CheckKind.ChiSquareTest } => ChiSquareCheck.Evaluate(comparison),
        GoodnessOfFitTest { Kind: CheckKind.KolmogorovSmirnovTest } => KolmogorovSmirnovTestCheck.Evaluate(comparison),
        GoodnessOfFitTest { Kind: CheckKind.AndersonDarlingTest } => AndersonDarlingTestCheck.Evaluate(comparison),
        GoodnessOfFitTest { Kind: CheckKind.CramerVonMisesTest } => CramerVonMisesTestCheck.Evaluate(comparison),
        RegionToleranceCheck { Kind: CheckKind.BinRatio } regional => BinRatioCheck.Evaluate(comparison, regional, decision),
        ToleranceCheck { Kind: CheckKind.KolmogorovSmirnov } t => KolmogorovSmirnovCheck.Evaluate(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.Wasserstein } t => WassersteinCheck.Evaluate(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.JensenShannon } t => JensenShannonCheck.Evaluate(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.MeanShift } t => MomentShiftCheck.Mean(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.WidthRatio } t => MomentShiftCheck.Width(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.QuantileShift } t => QuantileShiftCheck.Evaluate(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.InterquartileWidthRatio } t => InterquartileWidthCheck.Evaluate(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.Fraction } t => FractionCheck.Evaluate(comparison, t, decision),
        ToleranceCheck { Kind: CheckKind.FarTail } t => FarTailCheck.Evaluate(comparison, t, decision),
        _ => throw new ArgumentOutOfRangeException(nameof(spec), spec.Kind, "Unknown check."),
    };

    /// <summary>The code of an inconclusive check: the sample is too small to decide.</summary>
    public const string InconclusiveCode = Diagnostics.ErrorCodes.Inconclusive;

    /// <summary>The drift error code of a check (GATE3xxx), stable across releases.</summary>
    public static string DriftCode(CheckSpec spec) => spec.Kind switch
    {
        CheckKind.KolmogorovSmirnov => Diagnostics.ErrorCodes.DriftKolmogorovSmirnov,
        CheckKind.Wasserstein => Diagnostics.ErrorCodes.DriftWasserstein,
        CheckKind.ChiSquareTest => Diagnostics.ErrorCodes.DriftChiSquare,
        CheckKind.KolmogorovSmirnovTest => Diagnostics.ErrorCodes.DriftKolmogorovSmirnovTest,
        CheckKind.AndersonDarlingTest => Diagnostics.ErrorCodes.DriftAndersonDarlingTest,
        CheckKind.CramerVonMisesTest => Diagnostics.ErrorCodes.DriftCramerVonMisesTest,
        CheckKind.BinRatio when spec is RegionToleranceCheck { Region.Kind: Region.Tails } => Diagnostics.ErrorCodes.DriftRatioTails,
        CheckKind.BinRatio when spec is RegionToleranceCheck { Region.Kind: Region.Core } => Diagnostics.ErrorCodes.DriftRatioCore,
        CheckKind.BinRatio when spec is RegionToleranceCheck { Region.Kind: Region.Named } => Diagnostics.ErrorCodes.DriftRatioNamed,
        CheckKind.BinRatio => Diagnostics.ErrorCodes.DriftRatioAll,
        CheckKind.MeanShift => Diagnostics.ErrorCodes.DriftMeanShift,
        CheckKind.WidthRatio => Diagnostics.ErrorCodes.DriftWidthRatio,
        CheckKind.QuantileShift => Diagnostics.ErrorCodes.DriftQuantileShift,
        CheckKind.InterquartileWidthRatio => Diagnostics.ErrorCodes.DriftInterquartileWidth,
        CheckKind.Fraction => Diagnostics.ErrorCodes.DriftFraction,
        CheckKind.FarTail => Diagnostics.ErrorCodes.DriftFarTail,
        CheckKind.PearsonDifference or CheckKind.SpearmanDifference => Diagnostics.ErrorCodes.DriftCorrelation,
        CheckKind.FrechetDistance => Diagnostics.ErrorCodes.DriftFrechet,
        CheckKind.KernelDistance => Diagnostics.ErrorCodes.DriftKernelDistance,
        CheckKind.SlicedKolmogorovSmirnov => Diagnostics.ErrorCodes.DriftSlicedKolmogorovSmirnov,
        CheckKind.SlicedWasserstein => Diagnostics.ErrorCodes.DriftSlicedWasserstein,
        CheckKind.ChiSquare2DTest => Diagnostics.ErrorCodes.DriftChiSquare2D,
        _ => Diagnostics.ErrorCodes.DriftJensenShannon,
    };
}
