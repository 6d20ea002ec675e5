"""The check's binned work done by a general-purpose numeric stack (Debian's numpy and scipy) on the same events,
exported to .npy: the 20 histograms with the reference's edges (searchsorted + bincount, numpy's fastest exact
form for arbitrary edges; np.histogram sorts and closes its last bin), then per feature the binned KS distance with
its Kolmogorov-limit p-value, the chi-square homogeneity test of the two histograms and the largest bin-ratio
deviation. Prints JSON: seconds for loading, histogramming and statistics, and the cells.

usage: /usr/bin/python3 numpy-check.py SAMPLE.npy REFERENCE.json OUT.json
"""
import json
import sys
import time

started = time.perf_counter()
import numpy as np  # noqa: E402
import scipy  # noqa: E402
from scipy import stats  # noqa: E402

imported = time.perf_counter()


def main(sample_path, reference_path, out_path):
    with open(reference_path, encoding="utf-8") as f:
        reference = json.load(f)["features"]
    t0 = time.perf_counter()
    sample = np.load(sample_path)
    t1 = time.perf_counter()
    cells = {}
    for row, (name, feature) in enumerate(reference.items()):
        edges = np.asarray(feature["edges"], dtype=np.float64)
        # side='right' counts the edges <= x: 0 is the underflow, k is [e(k-1), e(k)), len(edges) the overflow.
        index = np.searchsorted(edges, sample[row], side="right")
        cells[name] = np.bincount(index, minlength=len(edges) + 1)
    t2 = time.perf_counter()
    results = {}
    for name, feature in reference.items():
        r = np.asarray(feature["cells"], dtype=np.float64)
        s = cells[name].astype(np.float64)
        n_r, n_s = r.sum(), s.sum()
        distance = float(np.max(np.abs(np.cumsum(r) / n_r - np.cumsum(s) / n_s)))
        p_ks = float(stats.kstwobign.sf(np.sqrt(n_r * n_s / (n_r + n_s)) * distance))
        used = (r + s) > 0
        chi2, p_chi2, dof, _ = stats.chi2_contingency(np.vstack([r[used], s[used]]), correction=False)
        filled = r > 0
        ratio = float(np.max(np.abs((s[filled] / n_s) / (r[filled] / n_r) - 1)))
        results[name] = {"ks_distance": distance, "ks_p": p_ks, "chi2": float(chi2), "chi2_p": float(p_chi2),
                         "chi2_ndf": int(dof), "ratio_max": ratio}
    t3 = time.perf_counter()
    with open(out_path, "w", encoding="utf-8") as f:
        json.dump({
            "engine": f"numpy {np.__version__}, scipy {scipy.__version__}",
            "import_seconds": imported - started,
            "load_seconds": t1 - t0,
            "seconds": t2 - t1,
            "stats_seconds": t3 - t2,
            "features": {k: [int(x) for x in v] for k, v in cells.items()},
            "checks": results,
        }, f, indent=1)


if __name__ == "__main__":
    if len(sys.argv) != 4:
        sys.exit(__doc__.split("\n\n")[-1])
    main(*sys.argv[1:])
