namespace GateTasks.Engine.Contracts;

/// <summary>
/// A feature's checks while the contract is read, keyed by (kind, region) and kept in report order: a feature copies
/// the defaults' table and overrides or removes entries.
/// </summary>
internal sealed class CheckTable
{
    private readonly Dictionary<(CheckKind, CheckRegion), CheckSpec> _items = [];

    public CheckTable Copy()
    {
        var c = new CheckTable();
        foreach (var (k, v) in _items) c._items[k] = v;
        return c;
    }

    public void Set(CheckSpec spec) => _items[(spec.Kind, RegionOf(spec))] = spec;

    public void Remove(CheckKind kind, CheckRegion region) => _items.Remove((kind, region));

    public void RemoveAll(CheckKind kind)
    {
        foreach (var key in _items.Keys.Where(k => k.Item1 == kind).ToList()) _items.Remove(key);
    }

    /// <summary>By kind, then region (all, core, tails, then declared regions by name).</summary>
    public List<CheckSpec> ToList() =>
        _items.OrderBy(e => e.Key.Item1).ThenBy(e => e.Key.Item2.Kind).ThenBy(e => e.Key.Item2.Name, StringComparer.Ordinal).Select(e => e.Value).ToList();

    private static CheckRegion RegionOf(CheckSpec spec) => spec is RegionToleranceCheck regional ? regional.Region : CheckRegion.All;
}
