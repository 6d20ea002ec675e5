using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Keeps a seeded reservoir (<see cref="ReservoirSample"/>) of rows of the joint feature set while streaming,
/// skipping rows with a NaN in any of them, so the multivariate test sees a bounded, unbiased subsample.
/// </summary>
internal sealed class JointSubsample(IReadOnlyList<int> features, int capacity, int seed)
{
    private readonly ReservoirSample _reservoir = new(capacity, features.Count, seed);
    private readonly double[] _row = new double[features.Count];

    public void Add(FeatureView view)
    {
        for (var r = 0; r < view.Rows; r++)
        {
            var ok = true;
            for (var f = 0; f < features.Count && ok; f++)
            {
                var x = view.Feature(features[f])[r];
                ok = !double.IsNaN(x);
                _row[f] = x;
            }
            if (ok) _reservoir.Add(_row);
        }
    }

    /// <summary>Merges another subsample of the same features into a uniform subsample of both (see <see cref="ReservoirSample.Merge"/>).</summary>
    public void Merge(JointSubsample other) => _reservoir.Merge(other._reservoir);

    /// <summary>Rows offered so far (without NaN).</summary>
    public long Seen => _reservoir.Seen;

    /// <summary>The subsample's state: rows offered and the rows kept.</summary>
    public JointState State() => new(Seen, _reservoir.Rows.Select(r => (IReadOnlyList<double>)r.ToArray()).ToList());

    /// <summary>Sets a state in the form <see cref="State"/> gives it (into a fresh accumulation).</summary>
    public void SetState(JointState state) => _reservoir.Restore(state.Rows.Select(r => r.ToArray()).ToArray(), state.Seen);

    /// <summary>A copy of the kept rows.</summary>
    public double[][] Rows => _reservoir.Rows.Select(row => row.ToArray()).ToArray();
}
