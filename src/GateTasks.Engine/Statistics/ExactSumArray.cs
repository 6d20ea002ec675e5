namespace GateTasks.Engine.Statistics;

/// <summary>
/// A fixed number of exact sums kept compactly for accumulators with hundreds of thousands of cells. Each sum is held
/// as two doubles whose exact sum is the exact total (hi and lo, 16 bytes), updated by error-free two-sums (Dekker
/// 1971; the arithmetic of <see cref="ExactSum"/>, Shewchuk 1997), which is exact for almost every stream of batch
/// sums; a sum whose exact value needs a third term moves to an <see cref="ExactSum"/> of its own. The exact value does not depend on the order or
/// grouping of the additions, and <see cref="Value"/> rounds it once, correctly, whichever form holds it, so shards
/// merge to the bits of one pass.
/// </summary>
internal sealed class ExactSumArray
{
    private readonly double[] _hi;
    private readonly double[] _lo;
    private Dictionary<int, ExactSum>? _spilled;

    public ExactSumArray(int count)
    {
        _hi = new double[count];
        _lo = new double[count];
    }

    public int Length => _hi.Length;

    /// <summary>Adds <paramref name="x"/> to sum <paramref name="i"/> exactly.</summary>
    public void Add(int i, double x)
    {
        if (x == 0) return;
        if (!double.IsFinite(x))
            throw new Diagnostics.GateInputException(Diagnostics.ErrorCodes.SampleBadWeight,
                $"A sum of event weights (or of their squares) is {x}: the weights are too large for double precision; rescale them.");
        if (_spilled is not null && _spilled.TryGetValue(i, out var big))
        {
            big.Add(x);
            return;
        }
        // Error-free transformations only (each two-sum's result plus its error is exactly its two inputs), so hi + lo
        // stays the exact sum; a third term is needed only when the sum spans more than about 106 bits.
        var (s, e) = TwoSum(_hi[i], x);
        var (l, f) = TwoSum(_lo[i], e);
        if (f != 0)
        {
            (s, l) = TwoSum(s, l);
            (l, f) = TwoSum(l, f);
        }
        if (f == 0)
        {
            _hi[i] = s;
            _lo[i] = l;
            return;
        }
        var sum = new ExactSum();
        sum.Add(f);
        sum.Add(l);
        sum.Add(s);
        (_spilled ??= [])[i] = sum;
        _hi[i] = 0;
        _lo[i] = 0;
    }

    /// <summary>Fast two-sum after ordering by magnitude (Dekker 1971): hi = fl(a + b) and lo = a + b − hi exactly.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    private static (double Hi, double Lo) TwoSum(double a, double b)
    {
        if (Math.Abs(a) < Math.Abs(b)) (a, b) = (b, a);
        var hi = a + b;
        return (hi, b - (hi - a));
    }

    /// <summary>Adds each entry of <paramref name="values"/> to the sum of the same index (starting at <paramref name="start"/>), skipping zeros.</summary>
    public void AddRange(ReadOnlySpan<double> values, int start = 0)
    {
        for (var i = 0; i < values.Length; i++)
            if (values[i] != 0) Add(start + i, values[i]);
    }

    /// <summary>Adds every sum of <paramref name="other"/> (same length) exactly.</summary>
    public void Add(ExactSumArray other)
    {
        if (other.Length != Length) throw new ArgumentException($"Cannot add {other.Length} sums to {Length}.", nameof(other));
        for (var i = 0; i < Length; i++)
            foreach (var t in other.Terms(i)) Add(i, t);
    }

    /// <summary>Sum i's exact value rounded once to the nearest double.</summary>
    public double Value(int i) =>
        _spilled is not null && _spilled.TryGetValue(i, out var big) ? big.Value : _hi[i] + _lo[i]; // one IEEE addition rounds the exact two-term sum correctly

    /// <summary>Sum i's terms (none for zero); added to any exact sum they give this one.</summary>
    public IReadOnlyList<double> Terms(int i)
    {
        if (_spilled is not null && _spilled.TryGetValue(i, out var big)) return big.Terms.ToArray();
        if (_lo[i] == 0) return _hi[i] != 0 ? [_hi[i]] : [];
        return _hi[i] != 0 ? [_lo[i], _hi[i]] : [_lo[i]];
    }

    /// <summary>The whole array as plain numbers: each sum's two leading terms, and the few sums that needed more in full.</summary>
    public ExactSumArrayState State()
    {
        var spilled = _spilled is null
            ? new List<SpilledSum>()
            : _spilled.OrderBy(p => p.Key).Select(p => new SpilledSum(p.Key, p.Value.Terms.ToArray())).ToList();
        return new ExactSumArrayState((double[])_hi.Clone(), (double[])_lo.Clone(), spilled);
    }

    /// <summary>Adds a state in the form <see cref="State"/> gives it; false when its length differs or an index is out of range.</summary>
    public bool AddState(ExactSumArrayState state)
    {
        if (state.High.Count != Length || state.Low.Count != Length) return false;
        if (state.Spilled.Any(s => s.Index < 0 || s.Index >= Length)) return false;
        for (var i = 0; i < Length; i++)
        {
            Add(i, state.Low[i]);
            Add(i, state.High[i]);
        }
        foreach (var s in state.Spilled)
            foreach (var t in s.Terms) Add(s.Index, t);
        return true;
    }
}

/// <summary>
/// An <see cref="ExactSumArray"/>'s state: per sum its larger (<see cref="High"/>) and smaller (<see cref="Low"/>)
/// term, and in <see cref="Spilled"/> the sums held in full (their entries in High and Low are zero).
/// </summary>
internal sealed record ExactSumArrayState(IReadOnlyList<double> High, IReadOnlyList<double> Low, IReadOnlyList<SpilledSum> Spilled);

/// <summary>One sum of an <see cref="ExactSumArrayState"/> that needed more than two terms.</summary>
internal sealed record SpilledSum(int Index, IReadOnlyList<double> Terms);
