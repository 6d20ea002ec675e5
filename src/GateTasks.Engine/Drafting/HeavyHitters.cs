namespace GateTasks.Engine.Drafting;

/// <summary>
/// The values that may hold more than a 1/(k+1) share of a stream, in one pass and k counters (Misra &amp; Gries 1982,
/// "Finding repeated elements"): every such value is among the candidates, whose counts are lower bounds; their exact
/// shares take a second pass. Each decrement round removes k+1 units of count, so the work is O(1) per value amortised.
/// </summary>
internal sealed class HeavyHitters(int counters)
{
    private readonly Dictionary<double, long> _counts = new(counters + 1);

    public void Add(double value)
    {
        if (_counts.TryGetValue(value, out var c))
        {
            _counts[value] = c + 1;
            return;
        }
        if (_counts.Count < counters)
        {
            _counts[value] = 1;
            return;
        }
        // Full: the new value and one count of every candidate cancel out (a candidate at zero leaves).
        foreach (var v in _counts.Keys.ToList())
        {
            var n = _counts[v];
            if (n == 1) _counts.Remove(v);
            else _counts[v] = n - 1;
        }
    }

    /// <summary>The candidates: a superset of the values with a share above 1/(k+1).</summary>
    public IReadOnlyCollection<double> Candidates => _counts.Keys;
}
