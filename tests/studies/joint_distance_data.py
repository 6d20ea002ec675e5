#!/usr/bin/python3
"""Write a reference and a surrogate sample for the joint block's distance checks, drawn with numpy.

    /usr/bin/python3 tests/studies/joint_distance_data.py --out DIR --events N --seed S --surrogate faithful|permuted|partly-permuted [--fraction F]

Both files hold columns x, y (a correlated pair, Pearson 0.5: y = 0.5 x + sqrt(0.75) z with x, z standard normal,
then y mapped to exp(y / 2) so that it is skewed) and u (uniform, independent of both), N events each, drawn
independently from numpy.random.default_rng(S) (reference) and default_rng(S + 1) (surrogate). A faithful surrogate
is another draw of the same law; a permuted one is such a draw with y permuted across events
(rng.permutation), which keeps every marginal exactly and removes the correlation. A partly permuted one permutes y
only among a random fraction F of the events (rng.choice without replacement, then rng.permutation of those values),
which keeps every marginal exactly and scales the correlation by about 1 - F: a graded series of surrogates, as the
checkpoints of a training run might be, for ranking by the global score.
"""
import argparse
import os

import numpy as np


def draw(rng, n):
    x = rng.standard_normal(n)
    y = np.exp((0.5 * x + np.sqrt(0.75) * rng.standard_normal(n)) / 2)
    u = rng.uniform(size=n)
    return np.column_stack([x, y, u])


def main():
    p = argparse.ArgumentParser()
    p.add_argument("--out", required=True)
    p.add_argument("--events", type=int, default=100_000)
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--surrogate", choices=["faithful", "permuted", "partly-permuted"], default="faithful")
    p.add_argument("--fraction", type=float, default=0.5)
    a = p.parse_args()
    os.makedirs(a.out, exist_ok=True)
    reference = draw(np.random.default_rng(a.seed), a.events)
    rng = np.random.default_rng(a.seed + 1)
    sample = draw(rng, a.events)
    if a.surrogate == "permuted":
        sample[:, 1] = rng.permutation(sample[:, 1])
    elif a.surrogate == "partly-permuted":
        chosen = rng.choice(a.events, size=int(round(a.fraction * a.events)), replace=False)
        sample[chosen, 1] = rng.permutation(sample[chosen, 1])
    for name, data in (("reference.csv", reference), ("sample.csv", sample)):
        np.savetxt(os.path.join(a.out, name), data, delimiter=",", header="x,y,u", comments="", fmt="%.17g")
    r = np.corrcoef(sample[:, 0], sample[:, 1])[0, 1]
    print(f"surrogate {a.surrogate}: {a.events} events, Pearson(x, y) {r:.4f}")


if __name__ == "__main__":
    main()
