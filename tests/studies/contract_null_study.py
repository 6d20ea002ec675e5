#!/usr/bin/python3
"""Contract-level null study through the real gatetasks program: every kind of tolerance check at once, unweighted
and with negative weights.

Per replica, numpy draws a fresh reference sample and a fresh surrogate sample from one law:
  * energy, response: a heavy-tailed correlated pair (the generator of correlation_null_study.py: energy-like
    x ~ lognormal(3, 0.8), response-like y = x (1 + 0.9 t_5)), with `pearson-max` and `spearman-max`, and the
    energy with `ks-max`, `wasserstein-max`, the moment and quantile checks;
  * k: a sparse discrete feature (the generator of sparse_weighted_null.py: Poisson(1) capped at 9, categories 5 and
    above below 0.5% of events each), with `fraction-max` and `ratio-max`;
  * x: a continuous feature (standard normal) with `ks-max`, `wasserstein-max`, `ratio-max`, the moment and
    quantile checks;
  * in the weighted mode, a weight: -0.5 for a random 5% of events, +1 for the rest (sparse_weighted_null.py's
    law), in reference and surrogate alike; the unweighted mode has no weight column.
`gatetasks reference build` builds the reference, `gatetasks check` checks the surrogate (exit 0 passed, 1 failed,
5 undecided; docs/cli.md). Both samples follow the law, so a failing replica is a false alarm; the contract
promises at most its `false-alarm` (Holm over all its checks) per replica. The study prints each mode's rate of
failing replicas with its 95% Clopper-Pearson interval (scipy.stats.beta) and which checks failed.

    /usr/bin/python3 tests/studies/contract_null_study.py --cli 'dotnet src/GateTasks.Cli/bin/Release/net8.0/gatetasks.dll' \
        --replicas 200 [--modes unweighted,weighted] [--reference-events 20000] [--sample-events 20000] [--seed 1]

Needs Debian's python3-numpy and python3-scipy. Samples are written as CSV. The last line of each mode is
machine-readable: `summary mode=M replicas=N failed=K rate=R lower=L upper=U undecided=U level=A`.
Exit status 0 whatever the rates (the caller judges them), 2 when gatetasks itself did not run as documented.
"""
import argparse
import os
import shlex
import subprocess
import sys
import tempfile

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import correlation_null_study as correlated  # noqa: E402  (the heavy-tailed pair's generator)
import sparse_weighted_null as sparse  # noqa: E402  (the sparse discrete feature's and the weights' generator)

FALSE_ALARM = 0.01

CONTRACT = """contract-version: 1
title: contract-null-study
sample:
  path: surrogate.csv
{weight}reference: reference.json
decision:
  confidence: 0.95
  false-alarm: {alpha}
  correction: holm
  inconclusive: warn
defaults:
  binning: {{ bins: 20, spacing: quantile }}
  core: 0.90
features:
  - name: energy
    checks:
      ks-max: 0.03
      wasserstein-max: 0.05
      mean-shift-max: 0.03
      width-ratio-max: 0.05
      quantile-shift-max: 0.05
      iqr-width-ratio-max: 0.05
  - name: response
    checks:
      ks-max: 0.03
  - name: k
    kind: discrete
    checks:
      ks-max: off
      wasserstein-max: off
      ratio-max: {{ core: 0.10, tails: 0.50 }}
      fraction-max: 0.01
  - name: x
    checks:
      ks-max: 0.03
      wasserstein-max: 0.05
      ratio-max: {{ core: 0.10, tails: 0.30 }}
      mean-shift-max: 0.03
      width-ratio-max: 0.05
      quantile-shift-max: 0.05
correlations:
  - features: [energy, response]
    pearson-max: 0.05
    spearman-max: 0.03
"""


def draw(rng, n, weighted):
    """One sample of n events: the pair, the sparse discrete feature, the normal feature and (weighted) the weights."""
    energy, response = correlated.draw(rng, n)
    k, x, w = sparse.draw(rng, n)
    return energy, response, k, x, (w if weighted else None)


def write_csv(path, energy, response, k, x, w):
    columns = [energy, response, k.astype(float), x] + ([w] if w is not None else [])
    header = "energy,response,k,x" + (",weight" if w is not None else "")
    np.savetxt(path, np.column_stack(columns), delimiter=",", header=header, comments="", fmt="%.17g")


def study(cli, mode, replicas, reference_events, sample_events, seed, work, first=0):
    weighted = mode == "weighted"
    folder = os.path.join(work, mode)
    os.makedirs(os.path.join(folder, ".git"), exist_ok=True)
    with open(os.path.join(folder, "contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(CONTRACT.format(alpha=FALSE_ALARM, weight="  weight: weight\n" if weighted else ""))
    failing = undecided = 0
    by_check = {}
    for r in range(first, first + replicas):
        rng = np.random.default_rng([seed, 1 if weighted else 0, r])
        write_csv(os.path.join(folder, "trusted.csv"), *draw(rng, reference_events, weighted))
        write_csv(os.path.join(folder, "surrogate.csv"), *draw(rng, sample_events, weighted))
        build = ["reference", "build", "--from", "trusted.csv", "--contract", "contract.yaml", "--output", "reference.json"]
        if weighted:
            build += ["--weight", "weight"]
        b = subprocess.run(cli + build, cwd=folder, capture_output=True, text=True)
        if b.returncode != 0:
            print(f"{mode} replica {r}: reference build exited {b.returncode}\n{b.stdout}\n{b.stderr}", file=sys.stderr)
            sys.exit(2)
        c = subprocess.run(cli + ["check", "--contract", "contract.yaml", "--junit", "junit.xml"], cwd=folder, capture_output=True, text=True)
        if c.returncode not in (0, 1, 5):
            print(f"{mode} replica {r}: check exited {c.returncode}\n{c.stdout}\n{c.stderr}", file=sys.stderr)
            sys.exit(2)
        if c.returncode == 1:
            failing += 1
            for name in sparse.failed_checks(os.path.join(folder, "junit.xml")):
                by_check[name] = by_check.get(name, 0) + 1
        elif c.returncode == 5:
            undecided += 1
        print(f"{mode} replica {r}: exit {c.returncode}", flush=True)
    lo, hi = sparse.clopper_pearson(failing, replicas)
    print(f"{mode}: replicas {first}..{first + replicas - 1}, reference events {reference_events}, sample events {sample_events}, seed {seed}")
    print(f"{mode}: failing replicas {failing} ({failing / replicas:.4f}), 95% Clopper-Pearson [{lo:.4f}, {hi:.4f}]; "
          f"stated family-wise false-alarm level {FALSE_ALARM}; undecided replicas {undecided}")
    for name, n in sorted(by_check.items()):
        print(f"{mode}:   failed {n} times: {name}")
    print(f"summary mode={mode} replicas={replicas} failed={failing} rate={failing / replicas:.4f} lower={lo:.4f} upper={hi:.4f} "
          f"undecided={undecided} level={FALSE_ALARM}", flush=True)


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--cli", required=True, help="command that runs gatetasks, e.g. 'dotnet path/gatetasks.dll'")
    ap.add_argument("--replicas", type=int, default=200)
    ap.add_argument("--modes", default="unweighted,weighted")
    ap.add_argument("--reference-events", type=int, default=20000)
    ap.add_argument("--sample-events", type=int, default=20000)
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--first-replica", type=int, default=0,
                    help="number of the first replica (its seed), to split a study over several processes")
    ap.add_argument("--work", default=None, help="folder for the replicas' files (default: a temporary one)")
    a = ap.parse_args()
    # Paths in the command are taken from here: the replicas run in their own folder.
    cli = [os.path.abspath(part) if os.path.exists(part) else part for part in shlex.split(a.cli)]
    work = a.work or tempfile.mkdtemp(prefix="gatetasks-contract-null-")
    for mode in a.modes.split(","):
        if mode not in ("unweighted", "weighted"):
            ap.error(f"unknown mode '{mode}'")
        study(cli, mode, a.replicas, a.reference_events, a.sample_events, a.seed, work, a.first_replica)


if __name__ == "__main__":
    main()
