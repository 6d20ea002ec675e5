using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// The fixed unit directions of a sliced comparison (Rabin, Peyré, Delon &amp; Bernot 2011; Bonneel, Rabin, Peyré &amp;
/// Pfister 2015): direction k is d standard normal draws normalised to unit length, which makes it uniform on the
/// sphere (Muller 1959). The draws come from MathNet's Xoshiro256** generator seeded by <see cref="Seed"/>, a hash of
/// the feature names in their declared order, so the reference and every sample of the same feature set get the same
/// directions without storing anything, and the first K directions of a longer list are the same K. Each component
/// is rounded to single precision after normalising: the normal draws go through a logarithm and a square root whose
/// last bit may differ between platforms' math libraries, and the rounding absorbs such a difference (the reference
/// should still store the directions it used, so a sample reads them rather than drawing them again).
/// </summary>
internal static class SlicedDirections
{
    /// <summary>
    /// <paramref name="count"/> unit directions in as many dimensions as there are <paramref name="features"/>,
    /// row-major: component j of direction k is at [k·d + j].
    /// </summary>
    public static double[] Draw(IReadOnlyList<string> features, int count)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(count, 1);
        if (features.Count == 0) throw new ArgumentException("A sliced comparison needs at least one feature.", nameof(features));
        var d = features.Count;
        var rng = new Xoshiro256StarStar(Seed(features), threadSafe: false);
        var result = new double[count * d];
        for (var k = 0; k < count; k++)
        {
            var row = result.AsSpan(k * d, d);
            double norm;
            do
            {
                var squares = 0.0;
                for (var j = 0; j < d; j++)
                {
                    row[j] = Normal.Sample(rng, 0, 1);
                    squares += row[j] * row[j];
                }
                norm = Math.Sqrt(squares);
            } while (!(norm > 1e-6)); // a draw at the origin has no direction; practically never taken
            for (var j = 0; j < d; j++) row[j] = (float)(row[j] / norm);
        }
        return result;
    }

    /// <summary>
    /// The generator's seed: FNV-1a (Fowler, Noll, Vo) over the names joined by NUL, folded to a non-negative int —
    /// stable across runs and platforms, unlike <see cref="string.GetHashCode()"/>. The order of the names matters
    /// (component j belongs to feature j).
    /// </summary>
    public static int Seed(IReadOnlyList<string> features)
    {
        var h = 14695981039346656037UL;
        foreach (var ch in string.Join('\u0000', features))
        {
            h ^= ch;
            h *= 1099511628211UL;
        }
        return (int)((h ^ (h >> 32)) & 0x7fffffff);
    }
}
