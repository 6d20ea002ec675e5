using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Checks;

/// <summary>Runs the check a <see cref="CheckSpec"/> names on one feature comparison.</summary>
internal static class CheckEvaluator
{
    public static CheckOutcome Evaluate(FeatureComparison comparison, CheckSpec spec) => spec.Kind switch
    {
        CheckKind.KolmogorovSmirnov => KolmogorovSmirnovCheck.Evaluate(comparison, spec),
        CheckKind.Wasserstein => WassersteinCheck.Evaluate(comparison, spec),
        CheckKind.ChiSquare => ChiSquareCheck.Evaluate(comparison, spec),
        CheckKind.BinRatio => BinRatioCheck.Evaluate(comparison, spec),
        CheckKind.JensenShannon => JensenShannonCheck.Evaluate(comparison, spec),
        _ => throw new ArgumentOutOfRangeException(nameof(spec), spec.Kind, "Unknown check."),
    };

    /// <summary>The drift error code of a check (GATE3xxx), stable across releases.</summary>
    public static string DriftCode(CheckSpec spec) => spec.Kind switch
    {
        CheckKind.KolmogorovSmirnov => Diagnostics.ErrorCodes.DriftKolmogorovSmirnov,
        CheckKind.Wasserstein => Diagnostics.ErrorCodes.DriftWasserstein,
        CheckKind.ChiSquare => Diagnostics.ErrorCodes.DriftChiSquare,
        CheckKind.BinRatio when spec.Region == Region.Tails => Diagnostics.ErrorCodes.DriftRatioTails,
        CheckKind.BinRatio when spec.Region == Region.Core => Diagnostics.ErrorCodes.DriftRatioCore,
        CheckKind.BinRatio => Diagnostics.ErrorCodes.DriftRatioAll,
        _ => Diagnostics.ErrorCodes.DriftJensenShannon,
    };
}
