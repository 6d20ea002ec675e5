namespace GateTasks.Engine.Statistics;

/// <summary>
/// The Gaussian fit of a weighted sample of d features: its weighted mean vector and population covariance
/// Σw(x − x̄)(x − x̄)ᵀ/Σw (numpy.cov(..., aweights=w, bias=True) for positive weights), with Σw and the Kish (1965)
/// effective count. Mean and covariance are NaN when the weights sum to zero.
/// </summary>
internal sealed class GaussianFit
{
    /// <summary>A fit from a mean vector and a row-major d × d covariance (taken as given; used for known laws).</summary>
    public GaussianFit(double[] mean, double[] covariance, double sumOfWeights, double effectiveCount, long count)
    {
        if (covariance.Length != mean.Length * mean.Length)
            throw new ArgumentException($"A covariance of {mean.Length} features needs {mean.Length * mean.Length} numbers, got {covariance.Length}.", nameof(covariance));
        Mean = mean;
        Covariance = covariance;
        SumOfWeights = sumOfWeights;
        EffectiveCount = effectiveCount;
        Count = count;
    }

    /// <summary>Number of features d.</summary>
    public int Dimension => Mean.Length;

    /// <summary>Weighted mean vector (NaN when Σw = 0).</summary>
    public double[] Mean { get; }

    /// <summary>Population covariance, row-major d × d (NaN when Σw = 0).</summary>
    public double[] Covariance { get; }

    /// <summary>Σw, signed weights summed with their signs.</summary>
    public double SumOfWeights { get; }

    /// <summary>Kish (1965) effective count (Σw)²/Σw².</summary>
    public double EffectiveCount { get; }

    /// <summary>Events with a non-zero weight.</summary>
    public long Count { get; }

    /// <summary>False when the weights cancel and there is no mean or covariance.</summary>
    public bool IsDefined => SumOfWeights != 0 && double.IsFinite(SumOfWeights);

    /// <summary>
    /// Joins the positive-weight events and the negative-weight events (both kept with |w|) into the fit of the
    /// signed sample: the pairwise update of Chan, Golub &amp; LeVeque (1979) with the second part's weight taken as
    /// −W₋. With W = W₊ − W₋ and δ = x̄₋ − x̄₊: x̄ = x̄₊ − W₋/W·δ and C = C₊ − C₋ − W₊W₋/W·δδᵀ, covariance C/W.
    /// When W = 0 every moment is undefined (NaN) rather than divided by zero. With negative weights the covariance
    /// need not be positive semi-definite; consumers treat it as the estimate it is.
    /// </summary>
    public static GaussianFit Join(CovarianceMoments positive, CovarianceMoments negative)
    {
        if (positive.Dimension != negative.Dimension)
            throw new ArgumentException("Positive and negative moments have different dimensions.", nameof(negative));
        var d = positive.Dimension;
        double wPlus = positive.SumOfWeights, wMinus = negative.SumOfWeights;
        var total = wPlus - wMinus;
        var count = positive.Count + negative.Count;
        var effective = KishCount.Of(total, positive.SumOfSquaredWeights + negative.SumOfSquaredWeights);
        var mean = new double[d];
        var covariance = new double[d * d];
        if (total == 0)
        {
            Array.Fill(mean, double.NaN);
            Array.Fill(covariance, double.NaN);
            return new GaussianFit(mean, covariance, 0, 0, count);
        }
        var mPlus = positive.Mean;
        var mMinus = negative.Mean;
        var cPlus = positive.Comoments;
        var cMinus = negative.Comoments;
        var delta = new double[d];
        for (var k = 0; k < d; k++)
        {
            delta[k] = mMinus[k] - mPlus[k];
            mean[k] = mPlus[k] - wMinus / total * delta[k];
        }
        var cross = wMinus == 0 ? 0 : wPlus * wMinus / total;
        for (var p = 0; p < d; p++)
            for (var q = 0; q < d; q++)
                covariance[p * d + q] = (cPlus[p * d + q] - cMinus[p * d + q] - cross * delta[p] * delta[q]) / total;
        return new GaussianFit(mean, covariance, total, effective, count);
    }
}
