"""The exact binomial interval every study reports its rates with (Clopper & Pearson 1934), from scipy.stats.beta."""
from scipy import stats


def clopper_pearson(k, n, level=0.95):
    """Two-sided interval for a rate of k successes in n trials at the given confidence level."""
    a = (1 - level) / 2
    lo = 0.0 if k == 0 else float(stats.beta.ppf(a, k, n - k + 1))
    hi = 1.0 if k == n else float(stats.beta.ppf(1 - a, k + 1, n - k))
    return lo, hi
