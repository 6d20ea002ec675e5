namespace GateTasks.Engine.Histograms;

/// <summary>
/// Per-cell Σw and Σw² (so uncertainties of weighted fills are known) for the regular bins plus
/// underflow and overflow. Cell 0 is the underflow, cells 1..n the regular bins, cell n+1 the overflow.
/// </summary>
internal sealed class WeightedStorage
{
    private readonly double[] _sumW;
    private readonly double[] _sumW2;

    /// <summary>Storage for <paramref name="bins"/> regular bins and two flow cells.</summary>
    public WeightedStorage(int bins)
    {
        _sumW = new double[bins + 2];
        _sumW2 = new double[bins + 2];
    }

    /// <summary>Storage of exactly <paramref name="cells"/> cells (for histograms whose flows are laid out otherwise).</summary>
    public static WeightedStorage OfCells(int cells) => new(cells - 2);

    /// <summary>Number of cells, flows included.</summary>
    public int CellCount => _sumW.Length;

    /// <summary>Σw of every cell, flows included.</summary>
    public Span<double> SumW => _sumW;

    /// <summary>Σw² of every cell, flows included.</summary>
    public Span<double> SumW2 => _sumW2;

    /// <summary>Adds a weight to a cell.</summary>
    public void Add(int cell, double weight)
    {
        _sumW[cell] += weight;
        _sumW2[cell] += weight * weight;
    }

    /// <summary>Adds <paramref name="count"/> unit weights to a cell at once (Σw and Σw² each grow by the count).</summary>
    public void AddCount(int cell, int count)
    {
        _sumW[cell] += count;
        _sumW2[cell] += count;
    }

    /// <summary>Adds another storage of the same shape cell by cell.</summary>
    public void Add(WeightedStorage other)
    {
        if (other.CellCount != CellCount) throw new ArgumentException("Storages differ in shape.", nameof(other));
        for (var i = 0; i < _sumW.Length; i++)
        {
            _sumW[i] += other._sumW[i];
            _sumW2[i] += other._sumW2[i];
        }
    }
}
