using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Streaming weighted mean and variance (West 1979, Comm. ACM 22:532), mergeable by the pairwise update of
/// Chan, Golub &amp; LeVeque (1979), with Σw and Σw² for the Kish (1965) effective count (Σw)²/Σw².
/// Memory is constant whatever the number of entries. Weights may be negative (event generators produce
/// them); mean and variance are NaN while Σw is zero, and defined again once it is not (sums about the pivot are kept
/// for that). The running mean is kept relative to the first value
/// seen, so a large common offset does not cost precision in the deviations.
/// </summary>
internal sealed class WeightedMoments
{
    private double _pivot = double.NaN;
    private double _meanFromPivot;
    private double _sumSquaredDeviations;

    // Σw(x − pivot) and Σw(x − pivot)², kept beside the running update so that a running Σw that passes through zero
    // (signed weights, e.g. two −0.5 events before a +1) loses nothing: the update restarts from them once Σw is not zero.
    private double _rawFirst, _rawSecond;

    /// <summary>Number of entries added (including zero-weight ones).</summary>
    internal long Count { get; private set; }

    /// <summary>Σw.</summary>
    internal double SumOfWeights { get; private set; }

    /// <summary>Σw².</summary>
    internal double SumOfSquaredWeights { get; private set; }

    /// <summary>Weighted mean Σwx/Σw.</summary>
    internal double Mean => SumOfWeights != 0 ? _pivot + _meanFromPivot : double.NaN;

    /// <summary>Population weighted variance Σw(x − mean)²/Σw.</summary>
    internal double Variance => SumOfWeights != 0 ? Math.Max(0.0, _sumSquaredDeviations / SumOfWeights) : double.NaN;

    /// <summary>√<see cref="Variance"/>.</summary>
    internal double StandardDeviation => Math.Sqrt(Variance);

    /// <summary>Kish effective count (Σw)²/Σw²; 0 when nothing with non-zero weight was added.</summary>
    internal double EffectiveCount => KishCount.Of(SumOfWeights, SumOfSquaredWeights);

    /// <summary>Adds one entry with weight <paramref name="w"/>.</summary>
    internal void Add(double x, double w = 1.0)
    {
        if (!double.IsFinite(x))
            throw new ArgumentException($"Value {x.ToString(System.Globalization.CultureInfo.InvariantCulture)} is not finite.", nameof(x));
        if (!double.IsFinite(w))
            throw new GateInputException(ErrorCodes.SampleBadWeight,
                $"Weight {w.ToString(System.Globalization.CultureInfo.InvariantCulture)} is not finite.");
        Count++;
        if (w == 0)
            return;
        if (double.IsNaN(_pivot))
            _pivot = x;
        double total = SumOfWeights + w;
        SumOfSquaredWeights += w * w;
        double d = x - _pivot;
        _rawFirst += w * d;
        _rawSecond += w * d * d;
        if (total == 0)
        {
            // Σw is zero for now: the mean is undefined until later entries move Σw away from zero.
            SumOfWeights = 0;
            _meanFromPivot = double.NaN;
            _sumSquaredDeviations = double.NaN;
            return;
        }
        if (SumOfWeights == 0 && double.IsNaN(_meanFromPivot))
        {
            // Leaving a zero Σw: restart the running update from the sums about the pivot.
            _meanFromPivot = _rawFirst / total;
            _sumSquaredDeviations = _rawSecond - _rawFirst * _meanFromPivot;
            SumOfWeights = total;
            return;
        }
        double delta = (x - _pivot) - _meanFromPivot;
        double r = delta * w / total;
        _meanFromPivot += r;
        _sumSquaredDeviations += SumOfWeights * delta * r;
        SumOfWeights = total;
    }

    /// <summary>The whole state as numbers, for a partial file (<see cref="Restore"/> reads it back).</summary>
    /// <summary>
    /// Adds <paramref name="count"/> unit-weight values given by their mean and sum of squared deviations from it,
    /// as one merge (Chan, Golub &amp; LeVeque 1979).
    /// </summary>
    internal void AddBatch(long count, double mean, double sumSquaredDeviations)
    {
        if (count == 0) return;
        var batch = new WeightedMoments();
        batch.Restore([count, count, count, mean, 0, sumSquaredDeviations]);
        Merge(batch);
    }

    /// <summary>An independent copy, to the bit (every field is a number).</summary>
    internal WeightedMoments Copy() => (WeightedMoments)MemberwiseClone();

    internal double[] State() => [Count, SumOfWeights, SumOfSquaredWeights, _pivot, _meanFromPivot, _sumSquaredDeviations];

    internal void Restore(ReadOnlySpan<double> s)
    {
        (Count, SumOfWeights, SumOfSquaredWeights, _pivot, _meanFromPivot, _sumSquaredDeviations) = ((long)s[0], s[1], s[2], s[3], s[4], s[5]);
        SyncRawSums();
    }

    /// <summary>The sums about the pivot from the running state (after a merge or a restore).</summary>
    private void SyncRawSums()
    {
        _rawFirst = SumOfWeights * _meanFromPivot;
        _rawSecond = _sumSquaredDeviations + SumOfWeights * _meanFromPivot * _meanFromPivot;
    }

    /// <summary>Adds everything accumulated in <paramref name="other"/> (which is left unchanged).</summary>
    internal void Merge(WeightedMoments other)
    {
        ArgumentNullException.ThrowIfNull(other);
        Count += other.Count;
        SumOfSquaredWeights += other.SumOfSquaredWeights;
        if (other.SumOfWeights == 0 && other._sumSquaredDeviations == 0)
            return;
        if (SumOfWeights == 0 && _sumSquaredDeviations == 0)
        {
            SumOfWeights = other.SumOfWeights;
            _pivot = other._pivot;
            _meanFromPivot = other._meanFromPivot;
            _sumSquaredDeviations = other._sumSquaredDeviations;
            SyncRawSums();
            return;
        }
        double total = SumOfWeights + other.SumOfWeights;
        if (total == 0)
        {
            SumOfWeights = 0;
            _meanFromPivot = double.NaN;
            _sumSquaredDeviations = double.NaN;
            return;
        }
        double delta = (other._pivot - _pivot) + other._meanFromPivot - _meanFromPivot;
        _meanFromPivot += delta * other.SumOfWeights / total;
        _sumSquaredDeviations += other._sumSquaredDeviations + delta * delta * SumOfWeights * other.SumOfWeights / total;
        SumOfWeights = total;
        SyncRawSums();
    }
}
