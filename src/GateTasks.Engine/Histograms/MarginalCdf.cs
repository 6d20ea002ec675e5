using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// The cumulative distribution of a histogram, linear within each bin (under- and overflow as point masses at the
/// axis ends): maps a value to its probability rank, as ranks are needed for Spearman's coefficient.
/// </summary>
internal sealed class MarginalCdf
{
    private readonly double[] _edges;
    private readonly double[] _below; // CDF at each edge
    private readonly double _under;

    public MarginalCdf(Histogram h)
    {
        Axis = h.Axis;
        _edges = h.Axis.Edges.ToArray();
        var w = h.SumW;
        var total = h.TotalSumW;
        _below = new double[_edges.Length];
        var c = w[0];
        _under = total > 0 ? w[0] / total : 0;
        for (var i = 0; i < _edges.Length; i++)
        {
            _below[i] = total > 0 ? c / total : 0;
            if (i < _edges.Length - 1) c += w[i + 1];
        }
        // Per storage cell, the four numbers RankOf reads for it, already subtracted as RankOf subtracts them (so the
        // batch's ranks are the same to the bit): lower edge, width, CDF at the lower edge, the CDF's rise over the bin.
        // The flows keep their point rank in the third slot (width 1 and rise 0 only keep their lanes' arithmetic tame).
        _cell = new double[4 * (_edges.Length + 1)];
        for (var cell = 0; cell <= _edges.Length; cell++)
        {
            var at = 4 * cell;
            if (cell == 0 || cell == _edges.Length)
            {
                (_cell[at], _cell[at + 1], _cell[at + 2], _cell[at + 3]) = (0, 1, RankOf(0, cell, _edges, _below, _under), 0);
                continue;
            }
            var b = cell - 1;
            (_cell[at], _cell[at + 1]) = (_edges[b], _edges[b + 1] - _edges[b]);
            (_cell[at + 2], _cell[at + 3]) = (_below[b], _below[b + 1] - _below[b]);
        }
    }

    private readonly double[] _cell;

    /// <summary>The histogram's axis, whose storage cells <see cref="Rank"/> takes.</summary>
    public Axis Axis { get; }

    public double Evaluate(double x)
    {
        if (double.IsNaN(x)) return double.NaN;
        if (x < _edges[0]) return _under / 2;
        if (x >= _edges[^1]) return (_below[^1] + 1) / 2;
        var i = Array.BinarySearch(_edges, x);
        if (i >= 0) return _below[i];
        var b = ~i - 1;
        var f = (x - _edges[b]) / (_edges[b + 1] - _edges[b]);
        return _below[b] + f * (_below[b + 1] - _below[b]);
    }

    /// <summary>
    /// <see cref="Evaluate"/> for a value not NaN whose storage cell on <see cref="Axis"/> is known (0 the underflow,
    /// bins from 1, the last the overflow): the same number to the bit, without a search. The axis puts a value at an
    /// edge into the bin above, as the search does, and a value at a lower edge interpolates to that edge's CDF exactly.
    /// </summary>
    public double Rank(double x, int cell) => RankOf(x, cell, _edges, _below, _under);

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    private static double RankOf(double x, int cell, double[] edges, double[] below, double under)
    {
        if (cell == 0) return under / 2;
        if (cell == edges.Length) return (below[^1] + 1) / 2;
        var b = cell - 1;
        var f = (x - edges[b]) / (edges[b + 1] - edges[b]);
        return below[b] + f * (below[b + 1] - below[b]);
    }

    /// <summary>
    /// <see cref="Rank"/> of a batch: each value's rank from its storage cell, NaN where the cell is
    /// <paramref name="nanCell"/>; whether any was. Four values at a time where the machine has AVX: the
    /// same subtractions, division, product and sum per lane as <see cref="Rank"/> (no fused multiply-add), so the same
    /// bits. Compiled optimised from the first call, as it runs for every value.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public bool Ranks(ReadOnlySpan<double> values, ReadOnlySpan<int> cells, Span<double> ranks, int nanCell)
    {
        var nan = false;
        var r = 0;
        if (Avx.IsSupported)
        {
            ref var t = ref MemoryMarshal.GetArrayDataReference(_cell);
            ref var x = ref MemoryMarshal.GetReference(values);
            ref var c = ref MemoryMarshal.GetReference(cells);
            ref var into = ref MemoryMarshal.GetReference(ranks);
            var (nanCells, under, over) = (Vector128.Create(nanCell), Vector128<int>.Zero, Vector128.Create(_edges.Length));
            for (; r <= values.Length - 4; r += 4)
            {
                var k = Vector128.LoadUnsafe(ref c, (nuint)r);
                if (Vector128.EqualsAny(k, nanCells))
                {
                    nan |= RanksOneByOne(values.Slice(r, 4), cells.Slice(r, 4), ranks.Slice(r, 4), nanCell);
                    continue;
                }
                // Each lane's (lower edge, width, CDF, rise), transposed into one register per quantity.
                var (a0, a1) = (Vector256.LoadUnsafe(ref t, (nuint)(4 * k.GetElement(0))), Vector256.LoadUnsafe(ref t, (nuint)(4 * k.GetElement(1))));
                var (a2, a3) = (Vector256.LoadUnsafe(ref t, (nuint)(4 * k.GetElement(2))), Vector256.LoadUnsafe(ref t, (nuint)(4 * k.GetElement(3))));
                var (t0, t1) = (Avx.UnpackLow(a0, a1), Avx.UnpackHigh(a0, a1));
                var (t2, t3) = (Avx.UnpackLow(a2, a3), Avx.UnpackHigh(a2, a3));
                var (lo, below) = (Avx.Permute2x128(t0, t2, 0x20), Avx.Permute2x128(t0, t2, 0x31));
                var (width, rise) = (Avx.Permute2x128(t1, t3, 0x20), Avx.Permute2x128(t1, t3, 0x31));
                var f = (Vector256.LoadUnsafe(ref x, (nuint)r) - lo) / width;
                var inside = below + f * rise;
                var flow = Vector128.Equals(k, under) | Vector128.Equals(k, over);
                Vector256.ConditionalSelect(Vector256.WidenLower(flow.ToVector256()).AsDouble(), below, inside).StoreUnsafe(ref into, (nuint)r);
            }
        }
        return RanksOneByOne(values[r..], cells[r..], ranks[r..], nanCell) | nan;
    }

    private bool RanksOneByOne(ReadOnlySpan<double> values, ReadOnlySpan<int> cells, Span<double> ranks, int nanCell)
    {
        var nan = false;
        var (edges, below, under) = (_edges, _below, _under);
        for (var r = 0; r < values.Length; r++)
        {
            if (cells[r] == nanCell)
            {
                nan = true;
                ranks[r] = double.NaN;
            }
            else ranks[r] = RankOf(values[r], cells[r], edges, below, under);
        }
        return nan;
    }
}
