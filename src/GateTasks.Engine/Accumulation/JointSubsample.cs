using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Keeps a seeded reservoir (<see cref="ReservoirSample"/>) of rows of the joint feature set while streaming,
/// skipping rows with a NaN in any of them, so the multivariate test sees a bounded, unbiased subsample. The
/// reservoir is a uniform sample of events; each kept row carries its event weight as a mark (1 when the sample is
/// unweighted), stored as one more value of the row, so that the test can weigh the rows as the sample does.
/// </summary>
internal sealed class JointSubsample(IReadOnlyList<int> features, int capacity, int seed)
{
    private readonly ReservoirSample _reservoir = new(capacity, features.Count + 1, seed);
    private readonly double[] _row = new double[features.Count + 1];

    public void Add(FeatureView view)
    {
        var weights = view.Weights;
        var d = features.Count;
        for (var r = 0; r < view.Rows; r++)
        {
            var ok = true;
            for (var f = 0; f < d && ok; f++)
            {
                var x = view.Feature(features[f])[r];
                ok = !double.IsNaN(x);
                _row[f] = x;
            }
            _row[d] = weights.IsEmpty ? 1.0 : weights[r];
            if (ok) _reservoir.Add(_row);
        }
    }

    /// <summary>Merges another subsample of the same features into a uniform subsample of both (see <see cref="ReservoirSample.Merge"/>).</summary>
    public void Merge(JointSubsample other) => _reservoir.Merge(other._reservoir);

    /// <summary>Rows offered so far (without NaN).</summary>
    public long Seen => _reservoir.Seen;

    /// <summary>The subsample's state: rows offered, the rows kept and their weights.</summary>
    public JointState State() => new(Seen, _reservoir.Rows.Select(r => (IReadOnlyList<double>)r[..^1].ToArray()).ToList(),
        _reservoir.Rows.Select(r => r[^1]).ToList());

    /// <summary>Sets a state in the form <see cref="State"/> gives it (into a fresh accumulation).</summary>
    public void SetState(JointState state)
    {
        if (state.Weights.Count != state.Rows.Count)
            throw new ArgumentException("The stored subsample has not one weight per row.", nameof(state));
        _reservoir.Restore(state.Rows.Select((r, i) => r.Append(state.Weights[i]).ToArray()).ToArray(), state.Seen);
    }

    /// <summary>A copy of the kept rows (feature values only).</summary>
    public double[][] Rows => _reservoir.Rows.Select(row => row[..^1].ToArray()).ToArray();

    /// <summary>The kept rows' event weights, in the order of <see cref="Rows"/>.</summary>
    public double[] Weights => _reservoir.Rows.Select(row => row[^1]).ToArray();
}
