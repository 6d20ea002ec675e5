#!/usr/bin/python3
"""Null study of bin ratios on sparse bins and KS checks on signed weights, through the real gatetasks program.

Per replica, numpy draws a fresh reference sample and a fresh surrogate sample from one law:
  * k: a discrete feature, Poisson(1) capped at 9 (categories 5 and above hold < 0.5% of events each),
  * x: a continuous feature, standard normal,
  * weight: -0.5 for a random 5% of events, +1 for the rest (so cells, flows included, can hold negative sums).
The reference is built with `gatetasks reference build --weight weight`, the surrogate checked with
`gatetasks check`. Both samples follow the law, so every check's effect is zero and a failing replica is a false
alarm; the contract promises at most `false-alarm` (Holm over its checks) per replica. The script prints the
observed rate of failing replicas with its 95% Clopper-Pearson interval (scipy.stats.beta) against that level.

    /usr/bin/python3 tests/studies/sparse_weighted_null.py --cli 'dotnet src/GateTasks.Cli/bin/Release/net10.0/gatetasks.dll' \
        --replicas 200 --reference-events 40000 --sample-events 20000

Exit status: 0 when the number of failing replicas is at most --max-failures (default: no limit), 1 otherwise.
"""
import argparse
import os
import shlex
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

import numpy as np


from clopper_pearson import clopper_pearson

FALSE_ALARM = 0.01

CONTRACT = """contract-version: 1
title: sparse-weighted-null
sample:
  path: surrogate.csv
  weight: weight
reference: reference.json
decision:
  confidence: 0.95
  false-alarm: {alpha}
  correction: holm
  inconclusive: warn
defaults:
  binning: {{ bins: 20, spacing: quantile }}
  core: 0.90
features:
  - name: k
    kind: discrete
    checks:
      ratio-max: {{ core: 0.10, tails: 0.50 }}
      ks-max: 0.05
  - name: x
    checks:
      ratio-max: {{ core: 0.10, tails: 0.30 }}
      ks-max: 0.05
      mean-shift-max: 0.05
"""


def draw(rng, n):
    k = np.minimum(rng.poisson(1.0, n), 9)
    x = rng.normal(0.0, 1.0, n)
    w = np.where(rng.random(n) < 0.05, -0.5, 1.0)
    return k, x, w


def write_csv(path, k, x, w):
    with open(path, "w", encoding="utf-8") as fh:
        fh.write("k,x,weight\n")
        for a, b, c in zip(k, x, w):
            fh.write(f"{int(a)},{b!r},{c!r}\n")


def outcome(junit):
    root = ET.parse(junit).getroot()
    for p in root.iter("property"):
        if p.get("name") == "gatetasks.outcome":
            return p.get("value")
    return None


def failed_checks(junit):
    root = ET.parse(junit).getroot()
    return [f"{c.get('classname')}/{c.get('name')}" for c in root.iter("testcase") if c.find("failure") is not None]



def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--cli", required=True, help="command that runs gatetasks, e.g. 'dotnet path/gatetasks.dll'")
    ap.add_argument("--replicas", type=int, default=200)
    ap.add_argument("--reference-events", type=int, default=40000)
    ap.add_argument("--sample-events", type=int, default=20000)
    ap.add_argument("--seed", type=int, default=20261202)
    ap.add_argument("--max-failures", type=int, default=-1)
    ap.add_argument("--work", default=None, help="folder for the replicas' files (default: a temporary one)")
    args = ap.parse_args()
    cli = shlex.split(args.cli)
    rng = np.random.default_rng(args.seed)
    work = args.work or tempfile.mkdtemp(prefix="gatetasks-null-")
    os.makedirs(work, exist_ok=True)
    with open(os.path.join(work, "contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(CONTRACT.format(alpha=FALSE_ALARM))
    failing = 0
    undecided = 0
    by_check = {}
    for r in range(args.replicas):
        write_csv(os.path.join(work, "trusted.csv"), *draw(rng, args.reference_events))
        write_csv(os.path.join(work, "surrogate.csv"), *draw(rng, args.sample_events))
        ref = os.path.join(work, "reference.json")
        if os.path.exists(ref):
            os.remove(ref)
        b = subprocess.run(cli + ["reference", "build", "--from", "trusted.csv", "--contract", "contract.yaml",
                                  "--weight", "weight", "--output", "reference.json"],
                           cwd=work, capture_output=True, text=True)
        if b.returncode != 0:
            sys.exit(f"replica {r}: reference build exited {b.returncode}\n{b.stdout}\n{b.stderr}")
        junit = os.path.join(work, "junit.xml")
        c = subprocess.run(cli + ["check", "--contract", "contract.yaml", "--junit", "junit.xml"],
                           cwd=work, capture_output=True, text=True)
        if c.returncode not in (0, 1, 5):
            sys.exit(f"replica {r}: check exited {c.returncode}\n{c.stdout}\n{c.stderr}")
        got = outcome(junit)
        if c.returncode == 1:
            failing += 1
            for name in failed_checks(junit):
                by_check[name] = by_check.get(name, 0) + 1
        elif c.returncode == 5:
            undecided += 1
        print(f"replica {r}: exit {c.returncode} ({got})", flush=True)
    lo, hi = clopper_pearson(failing, args.replicas)
    print(f"replicas {args.replicas}, reference events {args.reference_events}, sample events {args.sample_events}, seed {args.seed}")
    print(f"failing replicas {failing} ({failing / args.replicas:.4f}), 95% Clopper-Pearson [{lo:.4f}, {hi:.4f}]; "
          f"stated family-wise false-alarm level {FALSE_ALARM}; undecided replicas {undecided}")
    for name, n in sorted(by_check.items()):
        print(f"  failed {n} times: {name}")
    if args.max_failures >= 0 and failing > args.max_failures:
        sys.exit(1)


if __name__ == "__main__":
    main()
