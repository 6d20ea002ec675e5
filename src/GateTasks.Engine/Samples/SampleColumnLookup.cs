using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Maps requested column names to positions in a file's column list, with the errors every reader
/// reports the same way: a missing name (with the nearest valid one) and a type that is not numeric.
/// </summary>
internal static class SampleColumnLookup
{
    /// <summary>
    /// The index in <paramref name="available"/> of each name in <paramref name="requested"/>.
    /// Names match exactly (ordinal): Parquet and CSV headers are case-sensitive.
    /// </summary>
    /// <param name="path">The file, named in messages and used as the error location.</param>
    /// <param name="available">The file's columns.</param>
    /// <param name="requested">The names asked for; a name may appear more than once.</param>
    /// <param name="missingNote">Appended to the "not present" message, e.g. which other files have the column.</param>
    public static int[] IndicesOf(
        string path, IReadOnlyList<SampleColumn> available, IReadOnlyList<string> requested, string missingNote = "")
    {
        var byName = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var i = 0; i < available.Count; i++)
            byName.TryAdd(available[i].Name, i);

        var indices = new int[requested.Count];
        for (var k = 0; k < requested.Count; k++)
        {
            var name = requested[k];
            if (!byName.TryGetValue(name, out var index))
            {
                throw new GateInputException(
                    ErrorCodes.SampleColumnMissing,
                    $"column '{name}' is not in sample file '{path}'"
                    + NearestName.Hint(name, available.Select(c => c.Name)) + missingNote,
                    new SourceLocation(path));
            }
            if (available[index].Refusal is { } refusal)
                throw new GateInputException(refusal.Code,
                    $"column '{name}' in sample file '{path}' cannot be read: {refusal.Reason}", new SourceLocation(path));
            if (available[index].Type == SampleValueType.Unsupported)
            {
                throw new GateInputException(
                    ErrorCodes.SampleColumnType,
                    $"column '{name}' in sample file '{path}' is not a flat numeric column "
                    + "(readable: float, double, signed and unsigned integers of 8 to 64 bits, boolean)",
                    new SourceLocation(path));
            }
            indices[k] = index;
        }
        return indices;
    }
}
