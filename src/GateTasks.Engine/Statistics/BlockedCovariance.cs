using System.Buffers;
using System.Globalization;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Streamed weighted mean vector and covariance of d features, kept in B blocks so that the finite-size bias and the
/// uncertainty of a distance between Gaussian fits can be estimated from subsets (<see cref="FrechetExtrapolation"/>).
/// The caller says which block each row goes to (the row's index within its file modulo B, so that shards and one pass
/// put every row in the same block). Each block keeps positive- and negative-weight events apart
/// (<see cref="CovarianceMoments"/>, whose Σ|w| only grows away from zero), joined when read
/// (<see cref="GaussianFit.Join"/>): a running Σw that passes through zero loses nothing.
/// A batch is added as <see cref="WeightedCorrelation.AddBatch"/> adds one, its moments per block and sign first (here in
/// one pass, about a shift near the mean) and then joined to the running ones once by the pairwise update (Chan, Golub
/// &amp; LeVeque 1979; Pébay 2008, SAND2008-6212). Blocks and shards merge by the same update, so a
/// merge of shards equals one pass to rounding. Memory depends on d, B and the batch, never on the sample size.
/// </summary>
internal sealed class BlockedCovariance
{
    // Rows are centred and multiplied out a range at a time, holding about this many values (some 256 kB of each
    // column range, its deviations and the weighted deviations) so that a range's data stay in cache.
    private const int CachedValues = 32_768;

    private readonly CovarianceMoments[] _slots; // block b: positive at 2b, negative at 2b + 1

    // Per-batch scratch, sized once (d, B) and cleared only where a batch touched it.
    private readonly long[] _batchCount;
    private readonly double[] _batchWeight, _batchWeight2, _batchMean, _batchComoments, _shift;
    private readonly bool[] _touched;

    public BlockedCovariance(int dimension, int blocks)
    {
        if (dimension < 1) throw new ArgumentOutOfRangeException(nameof(dimension), dimension, "At least one feature is needed.");
        if (blocks < 2) throw new ArgumentOutOfRangeException(nameof(blocks), blocks, "At least two blocks are needed.");
        Dimension = dimension;
        Blocks = blocks;
        var slots = 2 * blocks;
        _slots = new CovarianceMoments[slots];
        for (var s = 0; s < slots; s++) _slots[s] = new CovarianceMoments(dimension);
        _batchCount = new long[slots];
        _batchWeight = new double[slots];
        _batchWeight2 = new double[slots];
        _batchMean = new double[slots * dimension];
        _shift = new double[slots * dimension];
        _batchComoments = new double[slots * dimension * dimension];
        _touched = new bool[slots];
    }

    /// <summary>Number of features d.</summary>
    public int Dimension { get; }

    /// <summary>Number of blocks B.</summary>
    public int Blocks { get; }

    /// <summary>Events with a non-zero weight added.</summary>
    public long Count => _slots.Sum(s => s.Count);

    /// <summary>The positive-weight events of block <paramref name="block"/> (weights as |w|).</summary>
    public CovarianceMoments Positive(int block) => _slots[2 * block];

    /// <summary>The negative-weight events of block <paramref name="block"/> (weights as |w|).</summary>
    public CovarianceMoments Negative(int block) => _slots[2 * block + 1];

    /// <summary>
    /// Adds a batch whose row i (0-based within the batch) goes to block (<paramref name="firstRow"/> + i) mod B:
    /// <paramref name="firstRow"/> is the index of the batch's first row within its file.
    /// </summary>
    public void AddBatch(ReadOnlySpan<ReadOnlyMemory<double>> columns, ReadOnlySpan<double> weights, long firstRow)
    {
        if (firstRow < 0) throw new ArgumentOutOfRangeException(nameof(firstRow), firstRow, "A row index is not negative.");
        var n = columns.Length > 0 ? columns[0].Length : 0;
        var blocks = ArrayPool<int>.Shared.Rent(Math.Max(n, 1));
        try
        {
            var b = (int)(firstRow % Blocks);
            for (var i = 0; i < n; i++)
            {
                blocks[i] = b;
                if (++b == Blocks) b = 0;
            }
            AddBatch(columns, weights, blocks.AsSpan(0, n));
        }
        finally
        {
            ArrayPool<int>.Shared.Return(blocks);
        }
    }

    /// <summary>
    /// Adds a batch: d columns of equal length, weights (empty: every weight 1; zero weights are skipped) and the block
    /// of each row. Values and weights must be finite (the caller decides what to do with missing values first).
    /// </summary>
    public void AddBatch(ReadOnlySpan<ReadOnlyMemory<double>> columns, ReadOnlySpan<double> weights, ReadOnlySpan<int> blockOfRow)
    {
        var d = Dimension;
        if (columns.Length != d)
            throw new ArgumentException($"Expected {d} feature columns, got {columns.Length}.", nameof(columns));
        var n = columns[0].Length;
        for (var k = 1; k < d; k++)
            if (columns[k].Length != n)
                throw new ArgumentException($"Column {k} has {columns[k].Length} rows, column 0 has {n}.", nameof(columns));
        if (!weights.IsEmpty && weights.Length != n)
            throw new ArgumentException($"{weights.Length} weights for {n} rows.", nameof(weights));
        if (blockOfRow.Length != n)
            throw new ArgumentException($"{blockOfRow.Length} block indices for {n} rows.", nameof(blockOfRow));
        if (n == 0) return;

        var slotOfRow = ArrayPool<int>.Shared.Rent(n);
        var weightOfRow = ArrayPool<double>.Shared.Rent(n);
        var range = Math.Min(n, Math.Clamp(CachedValues / d, 64, 4096));
        var rowsBySlot = ArrayPool<int>.Shared.Rent(range);
        var deviations = ArrayPool<double>.Shared.Rent(range * d);
        var weighted = ArrayPool<double>.Shared.Rent(range * d);
        try
        {
            // Pass 1: slot (block and sign), |w|, and each slot's count, Σ|w| and Σw² (and its shift, on first use).
            for (var i = 0; i < n; i++)
            {
                var w = weights.IsEmpty ? 1.0 : weights[i];
                if (!double.IsFinite(w))
                    throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"Weight {w} of row {i} is not finite."), nameof(weights));
                if (w == 0)
                {
                    slotOfRow[i] = -1;
                    continue;
                }
                var block = blockOfRow[i];
                if ((uint)block >= (uint)Blocks)
                    throw new ArgumentOutOfRangeException(nameof(blockOfRow), block, $"Row {i}: block index outside 0..{Blocks - 1}.");
                var s = 2 * block + (w < 0 ? 1 : 0);
                if (!_touched[s])
                {
                    _touched[s] = true;
                    (_batchCount[s], _batchWeight[s], _batchWeight2[s]) = (0, 0, 0);
                    Array.Clear(_batchMean, s * d, d);
                    Array.Clear(_batchComoments, s * d * d, d * d);
                    // The shift the batch is centred on: the slot's running mean, or this first row of the slot.
                    if (_slots[s].SumOfWeights > 0)
                        _slots[s].Mean.CopyTo(_shift.AsSpan(s * d, d));
                    else
                        for (var k = 0; k < d; k++) _shift[s * d + k] = columns[k].Span[i];
                }
                var a = Math.Abs(w);
                slotOfRow[i] = s;
                weightOfRow[i] = a;
                _batchCount[s]++;
                _batchWeight[s] += a;
                _batchWeight2[s] += a * a;
            }
            // Pass 2, a range of consecutive rows at a time (small enough for its columns to stay in cache): the range's
            // rows gathered by slot (a counting sort), shifted by their slot's shift c into feature-major buffers
            // D (deviations x − c) and A·D (weighted), the slot's Σ a·D raised by the sums of A·D and the lower
            // triangle of its Σ a·D Dᵀ by the dot products Σ_r a_r D_rp D_rq: vectorised, and independent of how rows
            // interleave between blocks. Sums about a shift close to the mean lose no precision that centring on the
            // exact mean would keep (Chan, Golub & LeVeque 1983, Am. Stat. 37:242, "shifted data"); the first row of a
            // slot, or its running mean, is such a shift.
            var offsets = new int[_slots.Length + 1];
            for (var start = 0; start < n; start += range)
            {
                var rows = Math.Min(range, n - start);
                Array.Clear(offsets);
                for (var i = start; i < start + rows; i++)
                    if (slotOfRow[i] >= 0) offsets[slotOfRow[i] + 1]++;
                for (var s = 0; s < _slots.Length; s++) offsets[s + 1] += offsets[s];
                for (var s = _slots.Length; s > 0; s--) offsets[s] = offsets[s - 1];
                for (var i = start; i < start + rows; i++)
                    if (slotOfRow[i] >= 0) rowsBySlot[offsets[slotOfRow[i] + 1]++] = i;
                // offsets[s + 1] is now the end of slot s, offsets[s] its start.
                for (var s = 0; s < _slots.Length; s++)
                {
                    var m = offsets[s + 1] - offsets[s];
                    if (m == 0) continue;
                    var chunk = rowsBySlot.AsSpan(offsets[s], m);
                    for (var k = 0; k < d; k++)
                    {
                        var x = columns[k].Span;
                        var shift = _shift[s * d + k];
                        var dk = deviations.AsSpan(k * range, m);
                        var wk = weighted.AsSpan(k * range, m);
                        var sum = 0.0;
                        for (var r = 0; r < m; r++)
                        {
                            var i = chunk[r];
                            dk[r] = x[i] - shift;
                            wk[r] = weightOfRow[i] * dk[r];
                            sum += wk[r];
                        }
                        _batchMean[s * d + k] += sum;
                    }
                    var c = _batchComoments.AsSpan(s * d * d, d * d);
                    for (var p = 0; p < d; p++)
                    {
                        var wp = weighted.AsSpan(p * range, m);
                        var q = 0;
                        for (; q + 3 <= p; q += 4)
                        {
                            var (s0, s1, s2, s3) = CovarianceMoments.Dot4(wp, deviations.AsSpan(q * range, m), deviations.AsSpan((q + 1) * range, m),
                                deviations.AsSpan((q + 2) * range, m), deviations.AsSpan((q + 3) * range, m));
                            c[p * d + q] += s0;
                            c[p * d + q + 1] += s1;
                            c[p * d + q + 2] += s2;
                            c[p * d + q + 3] += s3;
                        }
                        for (; q <= p; q++)
                            c[p * d + q] += CovarianceMoments.Dot(wp, deviations.AsSpan(q * range, m));
                    }
                }
            }

            // From sums about the shift to the batch's mean and co-moments: m' = Σa·D/W, x̄ = c + m',
            // C = Σa·D Dᵀ − W m' m'ᵀ.
            for (var s = 0; s < _slots.Length; s++)
            {
                if (!_touched[s]) continue;
                var w = _batchWeight[s];
                var offset = _batchMean.AsSpan(s * d, d);
                for (var k = 0; k < d; k++)
                {
                    offset[k] /= w;
                    if (!double.IsFinite(offset[k] + _shift[s * d + k])) ThrowNotFinite(columns, k);
                }
                var c = _batchComoments.AsSpan(s * d * d, d * d);
                for (var p = 0; p < d; p++)
                    for (var q = 0; q <= p; q++)
                        c[p * d + q] = c[q * d + p] = c[p * d + q] - w * offset[p] * offset[q];
                for (var k = 0; k < d; k++) offset[k] += _shift[s * d + k];
            }
            for (var s = 0; s < _slots.Length; s++)
            {
                if (!_touched[s]) continue;
                _touched[s] = false;
                var c = _batchComoments.AsSpan(s * d * d, d * d);
                _slots[s].Merge(_batchCount[s], _batchWeight[s], _batchWeight2[s], _batchMean.AsSpan(s * d, d), c);
            }
        }
        catch
        {
            Array.Clear(_touched);
            throw;
        }
        finally
        {
            ArrayPool<int>.Shared.Return(slotOfRow);
            ArrayPool<double>.Shared.Return(weightOfRow);
            ArrayPool<int>.Shared.Return(rowsBySlot);
            ArrayPool<double>.Shared.Return(deviations);
            ArrayPool<double>.Shared.Return(weighted);
        }
    }

    private static void ThrowNotFinite(ReadOnlySpan<ReadOnlyMemory<double>> columns, int k)
    {
        var x = columns[k].Span;
        for (var i = 0; i < x.Length; i++)
            if (!double.IsFinite(x[i]))
                throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"Value {x[i]} in column {k}, row {i} is not finite."), nameof(columns));
        throw new ArgumentException($"The weighted sum of column {k} overflows.", nameof(columns));
    }

    /// <summary>
    /// Joins a part of block <paramref name="block"/>'s events of one sign, given as its count, Σ|w|, Σw², mean and
    /// full d × d co-moment matrix (weights as |w|), by the pairwise update.
    /// </summary>
    public void AddMoments(int block, bool negative, long count, double sumOfWeights, double sumOfSquaredWeights,
        ReadOnlySpan<double> mean, ReadOnlySpan<double> comoments)
    {
        if ((uint)block >= (uint)Blocks) throw new ArgumentOutOfRangeException(nameof(block), block, $"A block index is within 0..{Blocks - 1}.");
        for (var k = 0; k < Dimension; k++)
            if (!double.IsFinite(mean[k]))
                throw new ArgumentException($"The weighted mean of feature {k} is {mean[k]}: its values or weights overflow.", nameof(mean));
        _slots[2 * block + (negative ? 1 : 0)].Merge(count, sumOfWeights, sumOfSquaredWeights, mean, comoments);
    }

    /// <summary>Adds another accumulation block by block (same d and B); equal to one pass to rounding.</summary>
    public void Merge(BlockedCovariance other)
    {
        if (other.Dimension != Dimension || other.Blocks != Blocks)
            throw new ArgumentException(
                $"Cannot merge {other.Dimension} features in {other.Blocks} blocks into {Dimension} features in {Blocks} blocks.", nameof(other));
        for (var s = 0; s < _slots.Length; s++) _slots[s].Merge(other._slots[s]);
    }

    /// <summary>The Gaussian fit of the blocks listed (each sign merged over them, then joined).</summary>
    public GaussianFit Fit(IEnumerable<int> blocks)
    {
        var positive = new CovarianceMoments(Dimension);
        var negative = new CovarianceMoments(Dimension);
        foreach (var b in blocks)
        {
            positive.Merge(Positive(b));
            negative.Merge(Negative(b));
        }
        return GaussianFit.Join(positive, negative);
    }

    /// <summary>The Gaussian fit of every event.</summary>
    public GaussianFit Fit() => Fit(Enumerable.Range(0, Blocks));

    /// <summary>How many numbers <see cref="State"/> gives for d features in B blocks.</summary>
    public static int StateLength(int dimension, int blocks) => 2 + 2 * blocks * CovarianceMoments.StateLength(dimension);

    /// <summary>The whole state as numbers, for a partial file: d, B, then each block's positive and negative moments.</summary>
    public double[] State()
    {
        var per = CovarianceMoments.StateLength(Dimension);
        var s = new double[StateLength(Dimension, Blocks)];
        (s[0], s[1]) = (Dimension, Blocks);
        for (var i = 0; i < _slots.Length; i++) _slots[i].WriteState(s.AsSpan(2 + i * per, per));
        return s;
    }

    /// <summary>Sets the state <see cref="State"/> gave; false (and nothing changed) when the numbers are not of that form for this d and B.</summary>
    public bool Restore(ReadOnlySpan<double> s)
    {
        if (s.Length != StateLength(Dimension, Blocks) || s[0] != Dimension || s[1] != Blocks) return false;
        var per = CovarianceMoments.StateLength(Dimension);
        for (var i = 0; i < _slots.Length; i++) _slots[i].ReadState(s.Slice(2 + i * per, per));
        return true;
    }
}
