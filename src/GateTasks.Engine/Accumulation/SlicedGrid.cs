using System.Security.Cryptography;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// What a joint block's sliced histograms are filled on, fixed by the reference: the joint features in their declared
/// order, the K unit directions (row-major [k·d + j]), the reference's per-feature means and standard deviations that
/// standardise the rows, and each projection's edges. Reference and every sample read these numbers from the reference
/// file, so they project and bin alike; <see cref="Digest"/> names the whole grid, so histograms filled on different
/// grids are never added up.
/// </summary>
internal sealed record SlicedGrid(IReadOnlyList<string> Features, double[] Directions, double[] Means, double[] StandardDeviations, double[][] Edges)
{
    /// <summary>The number of projections K.</summary>
    public int Projections => Edges.Length;

    /// <summary>The projection these numbers define (throws <see cref="ArgumentException"/> on numbers that define none).</summary>
    public SlicedProjection Projection() => new(Directions, Means, StandardDeviations);

    /// <summary>A fresh counter on this grid.</summary>
    public SlicedHistogramCounter Counter() => new(Projection(), Edges);

    /// <summary>
    /// SHA-256 (lower-case hex) over the feature names and the bits of every direction component, mean, standard
    /// deviation and edge, each list preceded by its length: equal digests, equal grids.
    /// </summary>
    public string Digest
    {
        get
        {
            using var hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
            void Count(int n) => hash.AppendData(BitConverter.GetBytes(n));
            void Numbers(IReadOnlyList<double> values)
            {
                Count(values.Count);
                foreach (var v in values) hash.AppendData(BitConverter.GetBytes(BitConverter.DoubleToInt64Bits(v)));
            }
            Count(Features.Count);
            foreach (var f in Features)
            {
                var bytes = System.Text.Encoding.UTF8.GetBytes(f);
                Count(bytes.Length);
                hash.AppendData(bytes);
            }
            Numbers(Directions);
            Numbers(Means);
            Numbers(StandardDeviations);
            Count(Edges.Length);
            foreach (var e in Edges) Numbers(e);
            return Convert.ToHexString(hash.GetHashAndReset()).ToLowerInvariant();
        }
    }
}
