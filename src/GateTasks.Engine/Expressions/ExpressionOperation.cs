namespace GateTasks.Engine.Expressions;

/// <summary>
/// One step of a compiled expression. Grouped by the number of operands it takes from the evaluation stack
/// (see <see cref="OperationKernels.Arity"/>): none, one, two, three.
/// </summary>
internal enum ExpressionOperation
{
    Constant,
    Column,

    Negate,
    Not,
    IsNan,
    Sqrt,
    Exp,
    Log,
    Log10,
    Abs,
    Sin,
    Cos,
    Tan,
    Asin,
    Acos,
    Atan,
    Sinh,
    Cosh,
    Tanh,
    Floor,
    Ceiling,
    Round,

    Add,
    Subtract,
    Multiply,
    Divide,
    Remainder,
    Power,
    Less,
    LessOrEqual,
    Greater,
    GreaterOrEqual,
    Equal,
    NotEqual,
    And,
    Or,
    Min,
    Max,
    Atan2,

    /// <summary><c>if(condition, then, else)</c>.</summary>
    Conditional,
}
