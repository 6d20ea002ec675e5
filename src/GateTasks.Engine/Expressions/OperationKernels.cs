namespace GateTasks.Engine.Expressions;

/// <summary>
/// The arithmetic of each <see cref="ExpressionOperation"/>, applied element-wise over a batch. Used both to
/// evaluate and to fold constants, so a folded expression means exactly what the evaluated one does.
/// </summary>
/// <remarks>
/// Truth: a value is true when it is non-zero and not NaN; results are 1.0 or 0.0. Every comparison involving
/// NaN is false (so <c>!=</c> is false for NaN too, unlike IEEE's unordered "not equal"), and the logical
/// operators treat NaN as false; <c>if</c> with a NaN condition gives NaN. min and max propagate NaN.
/// round is <see cref="Math.Round(double)"/>: ties to even (IEEE 754 roundTiesToEven). <c>%</c> is the C#
/// remainder: truncated division, sign of the dividend (like C's fmod).
/// </remarks>
internal static class OperationKernels
{
    /// <summary>How many values the operation takes from the evaluation stack.</summary>
    public static int Arity(ExpressionOperation operation) => operation switch
    {
        ExpressionOperation.Constant or ExpressionOperation.Column => 0,
        ExpressionOperation.Conditional => 3,
        >= ExpressionOperation.Add and <= ExpressionOperation.Atan2 => 2,
        _ => 1,
    };

    /// <summary>Whether the result is a truth value (1.0 or 0.0): a comparison, logic, not, isnan.</summary>
    public static bool IsBoolean(ExpressionOperation operation) => operation is
        ExpressionOperation.Less or ExpressionOperation.LessOrEqual or ExpressionOperation.Greater
        or ExpressionOperation.GreaterOrEqual or ExpressionOperation.Equal or ExpressionOperation.NotEqual
        or ExpressionOperation.And or ExpressionOperation.Or or ExpressionOperation.Not or ExpressionOperation.IsNan;

    /// <summary>
    /// Writes <paramref name="result"/>[i] = operation(a[i], b[i], c[i]) for every i of <paramref name="result"/>.
    /// Operands beyond the arity are ignored; <paramref name="result"/> may be the same memory as <paramref name="a"/>.
    /// </summary>
    public static void Apply(ExpressionOperation operation, ReadOnlySpan<double> a, ReadOnlySpan<double> b,
        ReadOnlySpan<double> c, Span<double> result)
    {
        var n = result.Length;
        switch (operation)
        {
            case ExpressionOperation.Negate: for (var i = 0; i < n; i++) result[i] = -a[i]; break;
            case ExpressionOperation.Not: for (var i = 0; i < n; i++) result[i] = IsTrue(a[i]) ? 0.0 : 1.0; break;
            case ExpressionOperation.IsNan: for (var i = 0; i < n; i++) result[i] = double.IsNaN(a[i]) ? 1.0 : 0.0; break;
            case ExpressionOperation.Sqrt: for (var i = 0; i < n; i++) result[i] = Math.Sqrt(a[i]); break;
            case ExpressionOperation.Exp: for (var i = 0; i < n; i++) result[i] = Math.Exp(a[i]); break;
            case ExpressionOperation.Log: for (var i = 0; i < n; i++) result[i] = Math.Log(a[i]); break;
            case ExpressionOperation.Log10: for (var i = 0; i < n; i++) result[i] = Math.Log10(a[i]); break;
            case ExpressionOperation.Abs: for (var i = 0; i < n; i++) result[i] = Math.Abs(a[i]); break;
            case ExpressionOperation.Sin: for (var i = 0; i < n; i++) result[i] = Math.Sin(a[i]); break;
            case ExpressionOperation.Cos: for (var i = 0; i < n; i++) result[i] = Math.Cos(a[i]); break;
            case ExpressionOperation.Tan: for (var i = 0; i < n; i++) result[i] = Math.Tan(a[i]); break;
            case ExpressionOperation.Asin: for (var i = 0; i < n; i++) result[i] = Math.Asin(a[i]); break;
            case ExpressionOperation.Acos: for (var i = 0; i < n; i++) result[i] = Math.Acos(a[i]); break;
            case ExpressionOperation.Atan: for (var i = 0; i < n; i++) result[i] = Math.Atan(a[i]); break;
            case ExpressionOperation.Sinh: for (var i = 0; i < n; i++) result[i] = Math.Sinh(a[i]); break;
            case ExpressionOperation.Cosh: for (var i = 0; i < n; i++) result[i] = Math.Cosh(a[i]); break;
            case ExpressionOperation.Tanh: for (var i = 0; i < n; i++) result[i] = Math.Tanh(a[i]); break;
            case ExpressionOperation.Floor: for (var i = 0; i < n; i++) result[i] = Math.Floor(a[i]); break;
            case ExpressionOperation.Ceiling: for (var i = 0; i < n; i++) result[i] = Math.Ceiling(a[i]); break;
            case ExpressionOperation.Round: for (var i = 0; i < n; i++) result[i] = Math.Round(a[i]); break;

            case ExpressionOperation.Add: for (var i = 0; i < n; i++) result[i] = a[i] + b[i]; break;
            case ExpressionOperation.Subtract: for (var i = 0; i < n; i++) result[i] = a[i] - b[i]; break;
            case ExpressionOperation.Multiply: for (var i = 0; i < n; i++) result[i] = a[i] * b[i]; break;
            case ExpressionOperation.Divide: for (var i = 0; i < n; i++) result[i] = a[i] / b[i]; break;
            case ExpressionOperation.Remainder: for (var i = 0; i < n; i++) result[i] = a[i] % b[i]; break;
            case ExpressionOperation.Power: for (var i = 0; i < n; i++) result[i] = Math.Pow(a[i], b[i]); break;
            // C#'s < <= > >= == are already false when either side is NaN.
            case ExpressionOperation.Less: for (var i = 0; i < n; i++) result[i] = a[i] < b[i] ? 1.0 : 0.0; break;
            case ExpressionOperation.LessOrEqual: for (var i = 0; i < n; i++) result[i] = a[i] <= b[i] ? 1.0 : 0.0; break;
            case ExpressionOperation.Greater: for (var i = 0; i < n; i++) result[i] = a[i] > b[i] ? 1.0 : 0.0; break;
            case ExpressionOperation.GreaterOrEqual: for (var i = 0; i < n; i++) result[i] = a[i] >= b[i] ? 1.0 : 0.0; break;
            case ExpressionOperation.Equal: for (var i = 0; i < n; i++) result[i] = a[i] == b[i] ? 1.0 : 0.0; break;
            // C#'s != is true for NaN; "ordered and different" keeps every comparison with NaN false.
            case ExpressionOperation.NotEqual: for (var i = 0; i < n; i++) result[i] = a[i] < b[i] || a[i] > b[i] ? 1.0 : 0.0; break;
            case ExpressionOperation.And: for (var i = 0; i < n; i++) result[i] = IsTrue(a[i]) && IsTrue(b[i]) ? 1.0 : 0.0; break;
            case ExpressionOperation.Or: for (var i = 0; i < n; i++) result[i] = IsTrue(a[i]) || IsTrue(b[i]) ? 1.0 : 0.0; break;
            // .NET Core 3.0+ Math.Min/Max follow IEEE 754-2019 minimum/maximum: NaN in, NaN out.
            case ExpressionOperation.Min: for (var i = 0; i < n; i++) result[i] = Math.Min(a[i], b[i]); break;
            case ExpressionOperation.Max: for (var i = 0; i < n; i++) result[i] = Math.Max(a[i], b[i]); break;
            case ExpressionOperation.Atan2: for (var i = 0; i < n; i++) result[i] = Math.Atan2(a[i], b[i]); break;

            case ExpressionOperation.Conditional:
                for (var i = 0; i < n; i++)
                    result[i] = double.IsNaN(a[i]) ? double.NaN : IsTrue(a[i]) ? b[i] : c[i];
                break;

            default:
                throw new ArgumentOutOfRangeException(nameof(operation), operation, "not an element-wise operation");
        }
    }

    // Written as two ordered comparisons so NaN is false without a separate test.
    private static bool IsTrue(double x) => x < 0 || x > 0;
}
