using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// One feature of the declared pairs, per batch: each value's storage cell on the reference's axis and its rank under
/// the reference's marginal CDF (<see cref="MarginalCdf.Rank"/>), found once per batch for every pair the feature is
/// in (<see cref="PairAccumulation"/>), so a pair's fill does no search of its own.
/// </summary>
internal sealed class PairColumn(int feature, MarginalCdf cdf)
{
    /// <summary>The cell given to a NaN value.</summary>
    public const int NanCell = -1;

    private int[] _cells = [];
    // Each storage cell's on the map grid's axis (PairGrid.MapCellOf) at the cell's index + 1, NanCell at 0 (so a NaN's
    // cell maps to itself without a branch); null until a pair of the column fills that grid.
    private int[]? _mapOf;
    private int[] _mapCells = [];
    private double[] _ranks = [];
    private int _rows;

    /// <summary>The feature's index in the batch.</summary>
    public int Feature { get; } = feature;

    /// <summary>The axis of <see cref="Cells"/>.</summary>
    public Axis Axis => cdf.Axis;

    /// <summary>Whether the last batch held a NaN of this feature.</summary>
    public bool HasNaN { get; private set; }

    /// <summary>The last batch's storage cells (<see cref="NanCell"/> for NaN).</summary>
    public ReadOnlySpan<int> Cells => _cells.AsSpan(0, _rows);

    /// <summary>
    /// The last batch's storage cells on <see cref="PairGrid.MapAxis"/> of <see cref="Axis"/> (<see cref="NanCell"/> for
    /// NaN), found from <see cref="Cells"/> once for every pair of the column that fills the map grid; empty unless
    /// <see cref="WantMapCells"/> was called.
    /// </summary>
    public ReadOnlySpan<int> MapCells => _mapOf is null ? ReadOnlySpan<int>.Empty : _mapCells.AsSpan(0, _rows);

    /// <summary>The map grid's cell of each storage cell of <see cref="Axis"/>; from now on <see cref="Prepare"/> finds <see cref="MapCells"/>.</summary>
    public void WantMapCells() => _mapOf ??= [NanCell, .. PairGrid.MapCellOf(Axis)];

    /// <summary>The last batch's ranks (NaN for NaN).</summary>
    public ReadOnlySpan<double> Ranks => _ranks.AsSpan(0, _rows);

    /// <summary>Finds the cells and ranks of <paramref name="view"/>'s values of the feature.</summary>
    public void Prepare(Samples.FeatureView view)
    {
        var x = view.Feature(Feature);
        _rows = x.Length;
        if (_cells.Length < x.Length) (_cells, _ranks) = (new int[x.Length], new double[x.Length]);
        var cells = _cells.AsSpan(0, x.Length);
        Axis.Cells(x, cells, NanCell);
        var nan = cdf.Ranks(x, cells, _ranks.AsSpan(0, x.Length), NanCell);
        HasNaN = nan;
        if (_mapOf is { } mapOf)
        {
            if (_mapCells.Length < x.Length) _mapCells = new int[_cells.Length];
            var mapped = _mapCells.AsSpan(0, x.Length);
            ref var map = ref MemoryMarshal.GetArrayDataReference(mapOf);
            // A cell is NanCell or a storage cell of the axis, so its index + 1 lies in the map.
            for (var r = 0; r < cells.Length; r++) mapped[r] = Unsafe.Add(ref map, cells[r] + 1);
        }
    }
}
