using MathNet.Numerics.Random;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Fixed-capacity uniform random subsample of a stream of rows (Vitter 1985, Algorithm R): after t rows have
/// been offered, each of them is kept with probability min(1, capacity/t), whatever t is, so a bounded
/// subsample of a streamed sample can be kept in O(capacity · features) memory. Rows are unweighted. The
/// choice depends only on the seed and the order rows are offered in, not on how they are split into batches.
/// </summary>
internal sealed class ReservoirSample
{
    private readonly double[][] _rows;
    private readonly Xoshiro256StarStar _rng;
    private int _kept;

    /// <summary>An empty reservoir holding up to <paramref name="capacity"/> rows of <paramref name="features"/> values.</summary>
    internal ReservoirSample(int capacity, int features, int seed)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(capacity, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(features, 1);
        Capacity = capacity;
        Features = features;
        _rows = new double[capacity][];
        _rng = new Xoshiro256StarStar(seed, threadSafe: false);
    }

    /// <summary>Most rows kept.</summary>
    internal int Capacity { get; }

    /// <summary>Values per row.</summary>
    internal int Features { get; }

    /// <summary>Rows offered so far.</summary>
    internal long Seen { get; private set; }

    /// <summary>
    /// The kept rows, min(Seen, Capacity) of them, in reservoir slot order (not stream order). The arrays are
    /// the reservoir's own and are overwritten by later <c>Add</c> calls; copy them to keep a snapshot.
    /// </summary>
    internal double[][] Rows => _rows.AsSpan(0, _kept).ToArray();

    /// <summary>Offers one row (copied if kept).</summary>
    internal void Add(ReadOnlySpan<double> row)
    {
        if (row.Length != Features)
            throw new ArgumentException($"A row has {row.Length} values; this reservoir holds rows of {Features}.", nameof(row));
        int slot = NextSlot();
        if (slot >= 0) row.CopyTo(Slot(slot));
    }

    /// <summary>
    /// Offers the first <paramref name="rows"/> rows of a column-major batch: <paramref name="columns"/>[f]
    /// holds feature f for every row (at least <paramref name="rows"/> values each).
    /// </summary>
    internal void Add(IReadOnlyList<double[]> columns, int rows)
    {
        ArgumentNullException.ThrowIfNull(columns);
        if (columns.Count != Features)
            throw new ArgumentException($"The batch has {columns.Count} columns; this reservoir holds rows of {Features}.", nameof(columns));
        ArgumentOutOfRangeException.ThrowIfNegative(rows);
        for (int f = 0; f < columns.Count; f++)
        {
            if (columns[f].Length < rows)
                throw new ArgumentException($"Column {f} has {columns[f].Length} values but the batch has {rows} rows.", nameof(columns));
        }
        for (int r = 0; r < rows; r++)
        {
            int slot = NextSlot();
            if (slot < 0) continue;
            double[] target = Slot(slot);
            for (int f = 0; f < target.Length; f++) target[f] = columns[f][r];
        }
    }

    /// <summary>Sets the state read from a partial file: the kept rows and how many rows the stream had.</summary>
    internal void Restore(double[][] rows, long seen)
    {
        if (rows.Length > Capacity || rows.Any(r => r.Length != Features) || seen < rows.Length)
            throw new ArgumentException("The stored subsample does not fit this reservoir.", nameof(rows));
        Array.Clear(_rows);
        for (var i = 0; i < rows.Length; i++) _rows[i] = rows[i].ToArray();
        _kept = rows.Length;
        Seen = seen;
    }

    /// <summary>
    /// Makes this reservoir a uniform subsample of the union of both streams: the number of rows drawn from each is
    /// hypergeometric in their stream sizes (drawn one row at a time, each side with probability proportional to its
    /// rows not yet drawn), and each side's kept rows, a uniform subset of its stream, are taken in a seeded random
    /// order. Valid, but not the subsample one pass over both streams would have kept.
    /// </summary>
    internal void Merge(ReservoirSample other)
    {
        if (other.Features != Features) throw new ArgumentException("Reservoirs differ in row length.", nameof(other));
        var mine = Shuffled(Rows);
        var theirs = Shuffled(other.Rows);
        long a = Seen, b = other.Seen;
        var take = (int)Math.Min(Capacity, a + b);
        var merged = new double[take][];
        int i = 0, j = 0;
        for (var t = 0; t < take; t++)
        {
            var fromMine = b == 0 || (a > 0 && _rng.NextDouble() * (a + b) < a);
            merged[t] = (fromMine ? mine[i++] : theirs[j++]).ToArray();
            if (fromMine) a--; else b--;
        }
        Array.Clear(_rows);
        merged.CopyTo(_rows, 0);
        _kept = take;
        Seen += other.Seen;
    }

    private double[][] Shuffled(double[][] rows)
    {
        var copy = rows.ToArray();
        for (var k = copy.Length - 1; k > 0; k--)
        {
            var m = _rng.Next(k + 1);
            (copy[k], copy[m]) = (copy[m], copy[k]);
        }
        return copy;
    }

    /// <summary>Slot the next offered row goes to, or −1 if it is not kept (Algorithm R's replacement step).</summary>
    private int NextSlot()
    {
        long t = Seen++;
        if (t < Capacity)
        {
            _kept++;
            return (int)t;
        }
        // Uniform j in [0, t]; the row replaces slot j when j < capacity, i.e. with probability capacity/(t+1).
        long j = t < int.MaxValue ? _rng.Next((int)(t + 1)) : _rng.NextInt64(t + 1);
        return j < Capacity ? (int)j : -1;
    }

    private double[] Slot(int slot) => _rows[slot] ??= new double[Features];
}
