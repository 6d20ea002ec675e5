#!/usr/bin/python3
"""Discrete-fraction study of `fraction-max` through the real gatetasks program.

Per replica, numpy draws a fresh reference sample and a fresh surrogate sample:
  * n_jets: a multiplicity, Poisson(2.2) capped at 12 (categories 8 and above hold < 0.5% of events each),
  * x: a continuous feature, standard normal (a second check in the contract's family),
  * weight (with --weighted): -0.5 for a random 5% of events, +1 for the rest.
With --shift S the surrogate moves a share S of all events from n_jets = 2 to n_jets = 3 (the events at 2 are
picked at random; S must not exceed the share at 2, about 0.27), so the largest category-fraction difference is S.
Without it both samples follow one law: every effect is zero and a failing replica is a false alarm, which the
contract bounds by its family-wise `false-alarm` (Holm over its checks).

The reference is built with `gatetasks reference build`, the surrogate checked with `gatetasks check`, each in a
process of its own. The script prints the rate of failing replicas (and of replicas whose fraction-max check
failed) with 95% Clopper-Pearson intervals (scipy.stats.beta).

    /usr/bin/python3 tests/studies/fraction_study.py --cli 'dotnet src/GateTasks.Cli/bin/Release/net8.0/gatetasks.dll' \
        --replicas 200 --weighted
    /usr/bin/python3 tests/studies/fraction_study.py --cli '...' --replicas 50 --shift 0.15 --sample-events 700
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
title: fraction-study
sample:
  path: surrogate.csv
{weight}reference: reference.json
decision:
  confidence: 0.95
  false-alarm: {alpha}
  correction: holm
  inconclusive: warn
features:
  - name: n_jets
    kind: discrete
    checks:
      fraction-max: {tolerance}
  - name: x
    binning: {{ bins: 20, spacing: quantile }}
    checks:
      mean-shift-max: 0.05
"""


def draw(rng, n, weighted, shift=0.0):
    k = np.minimum(rng.poisson(2.2, n), 12)
    if shift > 0:
        at2 = np.flatnonzero(k == 2)
        move = int(round(shift * n))
        if move > at2.size:
            sys.exit(f"--shift {shift} moves {move} events but only {at2.size} are at n_jets = 2")
        k[rng.choice(at2, size=move, replace=False)] = 3
    x = rng.normal(0.0, 1.0, n)
    w = np.where(rng.random(n) < 0.05, -0.5, 1.0) if weighted else np.ones(n)
    return k, x, w


def write_csv(path, k, x, w):
    with open(path, "w", encoding="utf-8") as fh:
        fh.write("n_jets,x,weight\n")
        for a, b, c in zip(k, x, w):
            fh.write(f"{int(a)},{b!r},{c!r}\n")


def verdicts(junit):
    root = ET.parse(junit).getroot()
    out = {}
    for c in root.iter("testcase"):
        state = "fail" if c.find("failure") is not None else "inconclusive" if c.find("skipped") is not None else "pass"
        out[f"{c.get('classname')}/{c.get('name')}"] = state
    return out



def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--cli", required=True, help="command that runs gatetasks, e.g. 'dotnet path/gatetasks.dll'")
    ap.add_argument("--replicas", type=int, default=200)
    ap.add_argument("--reference-events", type=int, default=40000)
    ap.add_argument("--sample-events", type=int, default=20000)
    ap.add_argument("--tolerance", type=float, default=0.05)
    ap.add_argument("--shift", type=float, default=0.0)
    ap.add_argument("--weighted", action="store_true")
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--work", default=None, help="folder for the replicas' files (default: a temporary one)")
    args = ap.parse_args()
    cli = shlex.split(args.cli)
    rng = np.random.default_rng(args.seed)
    work = args.work or tempfile.mkdtemp(prefix="gatetasks-fraction-")
    os.makedirs(work, exist_ok=True)
    with open(os.path.join(work, "contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(CONTRACT.format(alpha=FALSE_ALARM, tolerance=args.tolerance,
                                 weight="  weight: weight\n" if args.weighted else ""))
    failing = fraction_failing = undecided = unbuilt = 0
    for r in range(args.replicas):
        write_csv(os.path.join(work, "trusted.csv"), *draw(rng, args.reference_events, args.weighted))
        write_csv(os.path.join(work, "surrogate.csv"), *draw(rng, args.sample_events, args.weighted, args.shift))
        ref = os.path.join(work, "reference.json")
        if os.path.exists(ref):
            os.remove(ref)
        build = cli + ["reference", "build", "--from", "trusted.csv", "--contract", "contract.yaml", "--output", "reference.json"]
        if args.weighted:
            build += ["--weight", "weight"]
        b = subprocess.run(build, cwd=work, capture_output=True, text=True)
        if b.returncode != 0:
            # A reference the program refuses to build is no verdict on the check; it is counted and reported.
            unbuilt += 1
            print(f"replica {r}: reference build exited {b.returncode}: {(b.stdout + b.stderr).strip()[-300:]}", flush=True)
            continue
        c = subprocess.run(cli + ["check", "--contract", "contract.yaml", "--junit", "junit.xml"],
                           cwd=work, capture_output=True, text=True)
        if c.returncode not in (0, 1, 5):
            sys.exit(f"replica {r}: check exited {c.returncode}\n{c.stdout}\n{c.stderr}")
        v = verdicts(os.path.join(work, "junit.xml"))
        fraction = next((s for name, s in v.items() if "fraction-max" in name), "missing")
        failing += c.returncode == 1
        undecided += c.returncode == 5
        fraction_failing += fraction == "fail"
        print(f"replica {r}: exit {c.returncode}, fraction-max {fraction}", flush=True)
    decided = args.replicas - unbuilt
    lo, hi = clopper_pearson(failing, decided)
    flo, fhi = clopper_pearson(fraction_failing, decided)
    print(f"replicas {args.replicas}, reference events {args.reference_events}, sample events {args.sample_events}, "
          f"tolerance {args.tolerance}, shift {args.shift}, weighted {args.weighted}, seed {args.seed}")
    if unbuilt:
        print(f"replicas whose reference the program refused to build: {unbuilt} (left out of the rates)")
    print(f"fraction-max failed {fraction_failing} of {decided} ({fraction_failing / max(decided, 1):.4f}), 95% Clopper-Pearson [{flo:.4f}, {fhi:.4f}]")
    print(f"failing replicas {failing} of {decided} ({failing / max(decided, 1):.4f}), 95% Clopper-Pearson [{lo:.4f}, {hi:.4f}]; "
          f"stated family-wise false-alarm level {FALSE_ALARM}; undecided replicas {undecided}")


if __name__ == "__main__":
    main()
