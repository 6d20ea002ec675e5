using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Working arrays of the histogram bootstraps, kept per thread and handed out again to the next check of the same
/// size: a fine grid's bootstrap needs about a megabyte of them, which, fresh for every check, costs page faults and
/// zeroing that rival the replicas themselves. Each use is a numbered slot, and its contents are left over from an
/// earlier check: a caller overwrites every element before reading it. Small arrays (coarse bins) are not kept, so a
/// thread holds at most one array per slot, of the size of the largest grids (memory set by the grid, not the sample).
/// </summary>
internal sealed class BootstrapScratch
{
    public const int ReferenceDraws = 0, SampleDraws = 1, Mixed = 2, MixedSquares = 3, ReferenceKappa = 4, MixedKappa = 5,
        FirstLane = 6; // FirstLane + 2·lane for a lane's reference cells, + 1 for its sample cells; lanes 0 to 3
    private const int Slots = FirstLane + 8, LawSlots = 2, KeptFrom = 256;

    [ThreadStatic] private static BootstrapScratch? _current;

    private readonly double[]?[] _doubles = new double[Slots][];
    private readonly PoissonLaw[]?[] _laws = new PoissonLaw[LawSlots][];

    /// <summary>This thread's scratch.</summary>
    public static BootstrapScratch Current => _current ??= new BootstrapScratch();

    /// <summary>An array of exactly <paramref name="length"/> doubles for <paramref name="slot"/>, contents undefined.</summary>
    public double[] Doubles(int slot, int length) => Take(_doubles, slot, length);

    /// <summary>An array of exactly <paramref name="length"/> Poisson laws for <paramref name="slot"/> (0 or 1), contents undefined.</summary>
    public PoissonLaw[] Laws(int slot, int length) => Take(_laws, slot, length);

    private static T[] Take<T>(T[]?[] kept, int slot, int length)
    {
        if (length < KeptFrom) return new T[length];
        if (kept[slot] is { } array && array.Length == length) return array;
        return kept[slot] = new T[length];
    }
}
