using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// The unit-weight co-moments of several pairs over one batch, vectorised over events (four rows to a SIMD register),
/// then joined to each pair's running co-moments. Two passes over the batch (the two-pass algorithm of Chan, Golub &amp;
/// LeVeque 1983, Am. Stat. 37:242): each column's batch mean, then the central sums about those means, a column's own
/// powers (M_20, M_30, M_40) once however many pairs it is in and each pair's mixed ones. The batch's moments then join
/// the running ones by the pairwise update of Chan, Golub &amp; LeVeque (1979), carried to mixed moments of order four as
/// Pébay (2008) writes it (<see cref="CoMoments.AddCentral"/>).
/// </summary>
/// <remarks>
/// The batch is cut into slices of <see cref="SliceRows"/> rows at fixed offsets; a slice's columns stay in cache while
/// all its pairs are summed, and each slice keeps its own sums, added in slice order at the end. Lane k of a slice sums
/// the rows k, k + 4, …; rows past the slice's end are padded with the column's mean (a deviation of exactly zero). So
/// the numbers depend on the batch alone, not on the threads that share the slices out, nor on whether the machine
/// runs the registers in hardware (no fused multiply-add: every operation rounds as scalar IEEE arithmetic does).
/// </remarks>
internal sealed class PairBatchMoments
{
    /// <summary>One of a batch's columns (a feature's values or ranks), read on the thread that sums a slice.</summary>
    public delegate ReadOnlySpan<double> Column();

    /// <summary>Rows of a slice: a multiple of the register's width, small enough that a slice's columns stay in cache.</summary>
    public const int SliceRows = 2048;

    private const int Lanes = 4;
    // Per column: Σ(x − shift) (first pass), then Σd², Σd³, Σd⁴ about the batch mean.
    private const int ColumnSlots = 4;
    // Per pair: Σ dx·dy, dx²·dy, dx·dy², dx³·dy, dx²·dy², dx·dy³ (M_11, M_21, M_12, M_31, M_22, M_13).
    private const int PairSlots = 6;

    // Each slice's sums, slice after slice; kept between batches so a stream allocates it once.
    private Vector256<double>[] _partials = [];

    /// <summary>
    /// Adds to each pair's target the co-moments of its two columns over the batch's <paramref name="rows"/> rows (unit
    /// weights, no NaN).
    /// </summary>
    public void Add(IReadOnlyList<Column> columns, IReadOnlyList<(int X, int Y, WeightedCorrelation Target)> pairs, int rows, ParallelOptions options)
    {
        if (pairs.Count == 0 || rows == 0) return;
        var slices = (rows + SliceRows - 1) / SliceRows;
        var pairBase = columns.Count * ColumnSlots;
        var slots = pairBase + pairs.Count * PairSlots;
        if (_partials.Length < slices * slots) _partials = new Vector256<double>[slices * slots];
        var partials = _partials;
        Array.Clear(partials, 0, slices * slots);
        // First pass: each column's sum of deviations from its batch's first value, so the mean keeps the deviations'
        // digits when the values sit far from zero.
        var shifts = new double[columns.Count];
        for (var c = 0; c < columns.Count; c++) shifts[c] = columns[c]()[0];
        Parallel.For(0, slices, options, s =>
        {
            var (from, count) = (s * SliceRows, Math.Min(SliceRows, rows - s * SliceRows));
            var whole = count & ~(Lanes - 1);
            Span<double> tail = stackalloc double[Lanes];
            for (var c = 0; c < columns.Count; c++)
            {
                ref var sum = ref partials[s * slots + c * ColumnSlots];
                var column = columns[c]().Slice(from, count);
                Sum(column[..whole], shifts[c], ref sum);
                if (whole < count) Sum(Padded(column[whole..], shifts[c], tail), shifts[c], ref sum);
            }
        });
        var means = new double[columns.Count];
        for (var c = 0; c < columns.Count; c++) means[c] = shifts[c] + Total(partials, slices, slots, c * ColumnSlots) / rows;
        Parallel.For(0, slices, options, s =>
        {
            var (from, count) = (s * SliceRows, Math.Min(SliceRows, rows - s * SliceRows));
            var whole = count & ~(Lanes - 1);
            var at = partials.AsSpan(s * slots, slots);
            // The last slice's rows past the last whole register: one more register each, padded with the column's
            // mean, added after the whole ones as the loop would add it.
            Span<double> tails = stackalloc double[whole < count ? columns.Count * Lanes : 0];
            for (var c = 0; c < columns.Count; c++)
            {
                var column = columns[c]().Slice(from, count);
                var into = at.Slice(c * ColumnSlots + 1, ColumnSlots - 1);
                Powers(column[..whole], means[c], into);
                if (whole < count) Powers(Padded(column[whole..], means[c], tails.Slice(c * Lanes, Lanes)), means[c], into);
            }
            for (var p = 0; p < pairs.Count; p++)
            {
                var (x, y) = (pairs[p].X, pairs[p].Y);
                var into = at.Slice(pairBase + p * PairSlots, PairSlots);
                Mixed(columns[x]().Slice(from, whole), columns[y]().Slice(from, whole), means[x], means[y], into);
                if (whole < count) Mixed(tails.Slice(x * Lanes, Lanes), tails.Slice(y * Lanes, Lanes), means[x], means[y], into);
            }
        });
        var own = new double[columns.Count * ColumnSlots];
        for (var k = 0; k < own.Length; k++) own[k] = k % ColumnSlots == 0 ? 0 : Total(partials, slices, slots, k);
        Span<double> central = stackalloc double[12];
        for (var p = 0; p < pairs.Count; p++)
        {
            var (x, y) = (pairs[p].X * ColumnSlots, pairs[p].Y * ColumnSlots);
            double Mixed(int k) => Total(partials, slices, slots, pairBase + p * PairSlots + k);
            // In CoMoments' order: M_20, M_11, M_02, M_30, M_21, M_12, M_03, M_40, M_31, M_22, M_13, M_04.
            (central[0], central[1], central[2], central[3]) = (own[x + 1], Mixed(0), own[y + 1], own[x + 2]);
            (central[4], central[5], central[6], central[7]) = (Mixed(1), Mixed(2), own[y + 2], own[x + 3]);
            (central[8], central[9], central[10], central[11]) = (Mixed(3), Mixed(4), Mixed(5), own[y + 3]);
            pairs[p].Target.AddUnitCentral(rows, means[pairs[p].X], means[pairs[p].Y], central);
        }
    }

    // One slot's sum: the slices' registers in slice order, then the lanes pairwise.
    private static double Total(Vector256<double>[] partials, int slices, int slots, int slot)
    {
        var sum = partials[slot];
        for (var s = 1; s < slices; s++) sum += partials[s * slots + slot];
        return (sum.GetElement(0) + sum.GetElement(1)) + (sum.GetElement(2) + sum.GetElement(3));
    }

    // Rows fewer than a register's, then `pad` up to its width, in `into`.
    private static ReadOnlySpan<double> Padded(ReadOnlySpan<double> rows, double pad, Span<double> into)
    {
        into.Fill(pad);
        rows.CopyTo(into);
        return into;
    }

    // The kernels take whole registers of rows only (their loops call nothing, so the sums stay in registers) and add
    // their lane sums to `into`.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Sum(ReadOnlySpan<double> x, double shift, ref Vector256<double> into)
    {
        ref var a = ref MemoryMarshal.GetReference(x);
        var m = Vector256.Create(shift);
        var sum = into;
        for (var i = 0; i < x.Length; i += Lanes) sum += Vector256.LoadUnsafe(ref a, (nuint)i) - m;
        into = sum;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Powers(ReadOnlySpan<double> x, double mean, Span<Vector256<double>> into)
    {
        ref var a = ref MemoryMarshal.GetReference(x);
        var m = Vector256.Create(mean);
        var (s2, s3, s4) = (into[0], into[1], into[2]);
        for (var i = 0; i < x.Length; i += Lanes)
        {
            var d = Vector256.LoadUnsafe(ref a, (nuint)i) - m;
            var d2 = d * d;
            s2 += d2;
            s3 += d2 * d;
            s4 += d2 * d2;
        }
        (into[0], into[1], into[2]) = (s2, s3, s4);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Mixed(ReadOnlySpan<double> x, ReadOnlySpan<double> y, double meanX, double meanY, Span<Vector256<double>> into)
    {
        ref var a = ref MemoryMarshal.GetReference(x);
        ref var b = ref MemoryMarshal.GetReference(y);
        var (mx, my) = (Vector256.Create(meanX), Vector256.Create(meanY));
        var (s11, s21, s12) = (into[0], into[1], into[2]);
        var (s31, s22, s13) = (into[3], into[4], into[5]);
        for (var i = 0; i < x.Length; i += Lanes)
        {
            var dx = Vector256.LoadUnsafe(ref a, (nuint)i) - mx;
            var dy = Vector256.LoadUnsafe(ref b, (nuint)i) - my;
            Vector256<double> dx2 = dx * dx, dy2 = dy * dy, dxy = dx * dy;
            s11 += dxy;
            s21 += dx2 * dy;
            s12 += dxy * dy;
            s31 += dx2 * dxy;
            s22 += dx2 * dy2;
            s13 += dxy * dy2;
        }
        (into[0], into[1], into[2], into[3], into[4], into[5]) = (s11, s21, s12, s31, s22, s13);
    }
}
