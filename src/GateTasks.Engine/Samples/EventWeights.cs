using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>Rejects event weights that would poison every sum: NaN or infinite.</summary>
internal static class EventWeights
{
    /// <summary>Throws GATE2007 at the first non-finite weight; <paramref name="rowOffset"/> is the batch's first row in the sample.</summary>
    public static void Validate(ReadOnlySpan<double> weights, string? column, Sample sample, long rowOffset)
    {
        for (var i = 0; i < weights.Length; i++)
        {
            if (!double.IsFinite(weights[i]))
                throw new GateInputException(ErrorCodes.SampleBadWeight,
                    $"Weight column '{column}' holds {weights[i]} at event {rowOffset + i} of the sample; weights must be finite.",
                    new SourceLocation(sample.CurrentFile ?? ""));
        }
    }
}
