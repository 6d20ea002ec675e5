namespace GateTasks.Engine.Histograms;

/// <summary>
/// Bins of arbitrary widths given by their edges. The bin of a value is found through a uniform guide table over the
/// axis range (a bucket lookup, as in Knuth's TAOCP vol. 3, §6.4 "address calculation"): the table narrows the search
/// to the few bins that meet the value's bucket, and a short binary search over those finishes it — the same answer as
/// a binary search over all edges, in a few steps even for equal-probability bins of very different widths.
/// </summary>
internal sealed class VariableAxis : Axis
{
    /// <summary>Guide buckets per bin: enough that a bucket rarely meets more than two bins.</summary>
    private const int BucketsPerBin = 8;

    private readonly double[] _edges;
    private readonly int[] _firstBin; // per bucket: the bin holding the bucket's lower boundary
    private readonly double _bucketsPerUnit;
    private readonly float[]? _float32Edges; // for counting float values in SIMD registers (EdgeCountSearch)
    private readonly BlockEdgeCountSearch? _blockSearch; // the same for float values on a long axis

    /// <summary>Creates an axis from strictly increasing, finite edges (at least two).</summary>
    public VariableAxis(IReadOnlyList<double> edges)
    {
        if (edges.Count < 2) throw new ArgumentException("An axis needs at least two edges.", nameof(edges));
        _edges = edges.ToArray();
        for (var i = 0; i < _edges.Length; i++)
        {
            if (!double.IsFinite(_edges[i])) throw new ArgumentException($"Edge {i} is not finite ({_edges[i]}).", nameof(edges));
            if (i > 0 && !(_edges[i] > _edges[i - 1]))
                throw new ArgumentException($"Edges must increase strictly; edge {i} ({_edges[i]}) follows {_edges[i - 1]}.", nameof(edges));
        }
        _float32Edges = CountingEdges(_edges);
        if (_float32Edges is null && BlockEdgeCountSearch.IsSupported) _blockSearch = new BlockEdgeCountSearch(_edges);
        var buckets = BucketsPerBin * Count;
        var range = _edges[^1] - _edges[0];
        _bucketsPerUnit = double.IsFinite(range) && range > 0 ? buckets / range : 0;
        _firstBin = new int[buckets + 1];
        // The bin holding each bucket's lower boundary (Search(lower, 0, Count − 1)), in one sweep: the boundaries
        // rise with b, so the bin only moves up (a search per bucket took milliseconds per fine grid at start-up).
        var bin = 0;
        for (var b = 0; b <= buckets && _bucketsPerUnit > 0; b++)
        {
            var lower = _edges[0] + b / _bucketsPerUnit;
            while (bin < Count - 1 && lower >= _edges[bin + 1]) bin++;
            _firstBin[b] = bin;
        }
    }

    /// <inheritdoc />
    public override int Count => _edges.Length - 1;

    /// <inheritdoc />
    public override ReadOnlySpan<double> Edges => _edges;

    /// <inheritdoc />
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public override int Index(double value)
    {
        if (value < _edges[0]) return Underflow;
        if (value >= _edges[^1]) return Count;
        if (_bucketsPerUnit > 0)
        {
            // Start at the bin holding the bucket's lower boundary and step up at most twice, without branches (a
            // bucket rarely meets more than three bins); then one test, nearly always true, confirms the bin. It fails
            // only where rounding put the value a bucket high or many narrow bins share the bucket, and a binary
            // search decides there: the answer is the binary search's in every case.
            var bucket = Math.Min((int)((value - _edges[0]) * _bucketsPerUnit), _firstBin.Length - 1);
            var bin = _firstBin[bucket];
            // bin + 1 never passes the last edge: a value below the last edge never steps past the last bin.
            var up = value >= _edges[bin + 1];
            bin += System.Runtime.CompilerServices.Unsafe.As<bool, byte>(ref up);
            up = value >= _edges[bin + 1];
            bin += System.Runtime.CompilerServices.Unsafe.As<bool, byte>(ref up);
            if (value >= _edges[bin] && value < _edges[bin + 1]) return bin;
            return value < _edges[bin] ? Search(value, 0, bin) : Search(value, bin, Count - 1);
        }
        var i = Array.BinarySearch(_edges, value);
        return i >= 0 ? i : ~i - 1;
    }

    /// <inheritdoc />
    /// <remarks>
    /// Up to <see cref="EdgeCountSearch.MaxEdges"/> edges, the cells are counted in SIMD registers
    /// (<see cref="EdgeCountSearch"/>): the guide table's step fails where narrow bins crowd a bucket (long tails put
    /// the outer edges far out), and the binary search it then falls back on mispredicts: binning the benchmark sample's
    /// 20 features took about 10 ns a value with the table alone, 3.6 with counting (BenchmarkDotNet, AMD EPYC). Longer axes, and the last values of a block, take the guide table,
    /// with <see cref="Index"/> inlined (this class is sealed) rather than a virtual call per value.
    /// </remarks>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public override void Cells(ReadOnlySpan<double> values, Span<int> cells, int nanCell)
    {
        var i = 0;
        if (_edges.Length <= EdgeCountSearch.MaxEdges && EdgeCountSearch.IsSupported)
            i = EdgeCountSearch.Cells(values, _edges, cells, nanCell);
        for (; i < values.Length; i++)
        {
            var v = values[i];
            cells[i] = double.IsNaN(v) ? nanCell : Index(v) + 1;
        }
    }

    /// <inheritdoc />
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public override void Cells(ReadOnlySpan<float> values, Span<int> cells, int nanCell)
    {
        if (_blockSearch is { } blocks)
        {
            blocks.Cells(values, cells, nanCell);
            return;
        }
        var i = _float32Edges is { } edges ? EdgeCountSearch.Cells(values, edges, cells, nanCell) : 0;
        for (; i < values.Length; i++)
        {
            var v = values[i];
            cells[i] = float.IsNaN(v) ? nanCell : Index(v) + 1;
        }
    }

    /// <summary>The last bin in [lo, hi] whose lower edge is at most value (lo when none is).</summary>
    private int Search(double value, int lo, int hi)
    {
        while (lo < hi)
        {
            var mid = (lo + hi + 1) >> 1;
            if (value >= _edges[mid]) lo = mid;
            else hi = mid - 1;
        }
        return lo;
    }
}
