using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Where one cell of a batch was read from, for messages: its location (file, and line and column where the format
/// has them), that place in words (<c>line 12, column 7</c>; <c>row 3 of row group 2</c>), and the cell as written
/// (<c>an empty cell</c>, <c>'inf'</c>, <c>a null</c>).
/// </summary>
internal readonly record struct CellOrigin(SourceLocation Location, string Place, string Written);

/// <summary>Finds where the cell of a batch at <paramref name="row"/> of requested column <paramref name="column"/> was read from.</summary>
internal delegate CellOrigin CellLocator(int row, int column);
