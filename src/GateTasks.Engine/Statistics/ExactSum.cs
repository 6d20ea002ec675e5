namespace GateTasks.Engine.Statistics;

/// <summary>
/// An exact sum of doubles, kept as a short list of non-overlapping terms (Shewchuk 1997, "Adaptive precision
/// floating-point arithmetic", grow-expansion with two-sum; the algorithm of Python's math.fsum). Adding is exact, so
/// the sum does not depend on the order or grouping of its terms: the terms of shards merge into exactly the sum of
/// one pass. <see cref="Value"/> is the exact sum correctly rounded to a double. A non-finite term — weights so large
/// that a batch's sum of them or of their squares overflows — is an input error (GATE2007), not a crash.
/// </summary>
internal sealed class ExactSum
{
    private readonly List<double> _terms = [];

    /// <summary>The terms, smallest magnitude first (for storing; adding them to a new sum reads them back).</summary>
    public IReadOnlyList<double> Terms => _terms;

    public void Add(double x)
    {
        if (!double.IsFinite(x))
            throw new Diagnostics.GateInputException(Diagnostics.ErrorCodes.SampleBadWeight,
                $"A sum of event weights (or of their squares) is {x}: the weights are too large for double precision; rescale them.");
        if (x == 0) return;
        var i = 0;
        for (var j = 0; j < _terms.Count; j++)
        {
            var y = _terms[j];
            if (Math.Abs(x) < Math.Abs(y)) (x, y) = (y, x);
            var hi = x + y;
            var lo = y - (hi - x); // Fast two-sum: exact because |x| ≥ |y|.
            if (lo != 0) _terms[i++] = lo;
            x = hi;
        }
        _terms.RemoveRange(i, _terms.Count - i);
        _terms.Add(x);
    }

    /// <summary>An independent copy with the same terms (not added again: copied as they are).</summary>
    public ExactSum Copy()
    {
        var copy = new ExactSum();
        copy._terms.AddRange(_terms);
        return copy;
    }

    /// <summary>Adds every term of <paramref name="other"/>: exact, so merging in any order gives the same sum.</summary>
    public void Add(ExactSum other)
    {
        foreach (var p in other._terms.ToArray()) Add(p);
    }

    /// <summary>The exact sum rounded to the nearest double (ties to even), as math.fsum rounds.</summary>
    public double Value
    {
        get
        {
            var n = _terms.Count;
            if (n == 0) return 0;
            var hi = _terms[--n];
            var lo = 0.0;
            while (n > 0)
            {
                var x = hi;
                var y = _terms[--n];
                hi = x + y;
                lo = y - (hi - x);
                if (lo != 0) break;
            }
            // Half-way cases: the remaining terms decide the rounding direction (as in math.fsum).
            if (n > 0 && ((lo < 0 && _terms[n - 1] < 0) || (lo > 0 && _terms[n - 1] > 0)))
            {
                var y = lo * 2;
                var x = hi + y;
                if (y == x - hi) hi = x;
            }
            return hi;
        }
    }
}
