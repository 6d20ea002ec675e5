using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples.Numpy;

/// <summary>One column an array gives: its description and the field of each record it is read from.</summary>
internal sealed record NpyColumn(SampleColumn Column, NpyField Field);

/// <summary>
/// The columns one NumPy array gives. A structured array of shape <c>(n,)</c> gives one column per named field; a
/// plain array of shape <c>(n,)</c> gives one column named after its .npz member (a plain .npy file has no name for
/// it). Any other shape is refused (GATE2014): the columns of a 2-D array have no names, and numbering them would let
/// a matrix whose columns were reordered pass against the wrong reference without a word.
/// </summary>
internal static class NpyColumns
{
    /// <summary>The advice given with a refused shape.</summary>
    public const string HowToName =
        "save named columns: a structured array (numpy.save(path, numpy.rec.fromarrays([pt, eta], names='pt,eta'))) "
        + "or one array per column (numpy.savez(path, pt=pt, eta=eta))";

    /// <summary>
    /// The columns of the array <paramref name="header"/> describes; <paramref name="memberName"/> names a plain
    /// array's column (null for a .npy file). Messages name <paramref name="what"/> at <paramref name="path"/>.
    /// </summary>
    public static IReadOnlyList<NpyColumn> Of(NpyHeader header, string? memberName, string path, string what)
    {
        var shape = $"({string.Join(", ", header.Shape)}{(header.Shape.Length == 1 ? "," : "")})";
        if (header.Shape.Length != 1)
        {
            var order = header.Shape.Length >= 2 ? (header.FortranOrder ? ", stored in Fortran (column-major) order" : ", stored in C (row-major) order") : "";
            var problem = header.Shape.Length == 0
                ? $"it is a single value (shape ()), not a column of events"
                : $"it is {header.Shape.Length}-dimensional (shape {shape}{order}), and the columns of a matrix have no names";
            throw new GateInputException(ErrorCodes.SampleArrayShape, $"{what} cannot be read as columns: {problem}; {HowToName}",
                new SourceLocation(path));
        }
        if (!header.Dtype.Structured && memberName is null)
            throw new GateInputException(ErrorCodes.SampleArrayShape,
                $"{what} cannot be read as columns: it is a plain array of {header.Dtype.Fields[0].Kind} (dtype {header.Dtype.Spelling}, shape {shape}) "
                + $"with no field names, so its column has no name; {HowToName}",
                new SourceLocation(path));

        var columns = new List<NpyColumn>(header.Dtype.Fields.Count);
        foreach (var field in header.Dtype.Fields)
        {
            var name = header.Dtype.Structured ? field.Name : memberName!;
            var column = field.Number is { } number
                ? new SampleColumn(name, number.Type, Nullable: false)
                : new SampleColumn(name, SampleValueType.Unsupported, Nullable: false,
                    new ColumnRefusal(ErrorCodes.SampleColumnType,
                        $"{(memberName is null ? "it is stored" : $"member '{memberName}.npy' stores it")} as {field.Kind} (dtype {field.Spelling}); GateTasks reads booleans, signed and unsigned integers of 8 to 64 bits, float32 and float64, in either byte order"));
            columns.Add(new NpyColumn(column, field));
        }
        return columns;
    }
}
