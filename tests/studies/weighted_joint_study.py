#!/usr/bin/python3
"""Weighted joint (energy) test through the real gatetasks program.

Per replica, numpy draws a weighted reference and an unweighted surrogate of one law:
  * the law: a correlated pair (a, b), standard bivariate normal with correlation 0.6;
  * reference: rows drawn from that law shifted by (0.5, 0.3) — the second mean moves with the first, so only the
    marginal of a changes — and weighted by phi(a) / phi(a - 0.5) (importance weights); 5% of rows are doubled,
    one copy at weight 1.5 w and one at -0.5 w, which leaves the law the weights describe unchanged while making
    some weights negative;
  * surrogate: unweighted rows of the law itself, or with --break-correlation, rows whose b is independent of a
    (same marginals): a surrogate whose marginals pass but whose joint structure is wrong.
The energy test is a goodness-of-fit diagnostic (docs/contract.md): it never fails a run, it reads "distinguishable
at this size" or not, at the contract's family-wise level over the contract's tests. The script counts replicas
whose energy test reads distinguishable (from the JUnit report's `gatetasks.diagnostic.*` suite property) and prints
that rate with its 95% Clopper-Pearson interval (scipy.stats.beta). For a faithful surrogate every such reading is
a false alarm.

    /usr/bin/python3 tests/studies/weighted_joint_study.py --cli 'dotnet src/GateTasks.Cli/bin/Release/net8.0/gatetasks.dll' \
        --replicas 50
    /usr/bin/python3 tests/studies/weighted_joint_study.py --cli '...' --replicas 20 --break-correlation
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
RHO = 0.6

CONTRACT = """contract-version: 1
title: weighted-joint-study
sample:
  path: surrogate.csv
  weight: weight
reference: reference.json
decision:
  confidence: 0.95
  false-alarm: {alpha}
  correction: holm
  inconclusive: warn
features:
  - name: a
    checks: {{ mean-shift-max: 0.5 }}
  - name: b
    checks: {{ mean-shift-max: 0.5 }}
joint:
  features: [a, b]
  energy-test: on
  subsample: {subsample}
"""


def law(rng, n):
    a = rng.normal(0.0, 1.0, n)
    b = RHO * a + np.sqrt(1 - RHO ** 2) * rng.normal(0.0, 1.0, n)
    return a, b


def reference(rng, n):
    a, b = law(rng, n)
    a, b = a + 0.5, b + 0.5 * RHO
    w = np.exp(-0.5 * a ** 2 + 0.5 * (a - 0.5) ** 2)
    twin = rng.random(n) < 0.05
    a = np.concatenate([a, a[twin]])
    b = np.concatenate([b, b[twin]])
    w = np.concatenate([np.where(twin, 1.5 * w, w), -0.5 * w[twin]])
    order = rng.permutation(a.size)
    return a[order], b[order], w[order]


def surrogate(rng, n, broken):
    a, b = law(rng, n)
    if broken:
        b = rng.permutation(b)
    return a, b, np.ones(n)


def write_csv(path, a, b, w):
    with open(path, "w", encoding="utf-8") as fh:
        fh.write("a,b,weight\n")
        for x, y, z in zip(a, b, w):
            fh.write(f"{x!r},{y!r},{z!r}\n")



def energy_readings(junit):
    """The energy test's diagnostic readings in a JUnit report (suite properties gatetasks.diagnostic.<subject>.<test>)."""
    out = []
    for prop in ET.parse(junit).getroot().iter("property"):
        name = prop.get("name", "")
        if name.startswith("gatetasks.diagnostic.") and name.endswith("energy-test"):
            out.append(prop.get("value"))
    return out


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--cli", required=True, help="command that runs gatetasks, e.g. 'dotnet path/gatetasks.dll'")
    ap.add_argument("--replicas", type=int, default=50)
    ap.add_argument("--reference-events", type=int, default=20000)
    ap.add_argument("--sample-events", type=int, default=20000)
    ap.add_argument("--subsample", type=int, default=1000)
    ap.add_argument("--break-correlation", action="store_true")
    ap.add_argument("--seed", type=int, default=20261204)
    ap.add_argument("--work", default=None)
    args = ap.parse_args()
    cli = shlex.split(args.cli)
    rng = np.random.default_rng(args.seed)
    work = args.work or tempfile.mkdtemp(prefix="gatetasks-joint-")
    os.makedirs(work, exist_ok=True)
    with open(os.path.join(work, "contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(CONTRACT.format(alpha=FALSE_ALARM, subsample=args.subsample))
    failing = 0
    for r in range(args.replicas):
        write_csv(os.path.join(work, "trusted.csv"), *reference(rng, args.reference_events))
        write_csv(os.path.join(work, "surrogate.csv"), *surrogate(rng, args.sample_events, args.break_correlation))
        ref = os.path.join(work, "reference.json")
        if os.path.exists(ref):
            os.remove(ref)
        b = subprocess.run(cli + ["reference", "build", "--from", "trusted.csv", "--contract", "contract.yaml",
                                  "--weight", "weight", "--output", "reference.json"], cwd=work, capture_output=True, text=True)
        if b.returncode != 0:
            sys.exit(f"replica {r}: reference build exited {b.returncode}\n{b.stdout}\n{b.stderr}")
        c = subprocess.run(cli + ["check", "--contract", "contract.yaml", "--junit", "result.xml"], cwd=work, capture_output=True, text=True)
        if c.returncode not in (0, 1, 5):
            sys.exit(f"replica {r}: check exited {c.returncode}\n{c.stdout}\n{c.stderr}")
        readings = energy_readings(os.path.join(work, "result.xml"))
        if len(readings) != 1:
            sys.exit(f"replica {r}: expected one energy-test reading, found {readings}")
        distinguishable = readings[0] == "distinguishable"
        failing += distinguishable
        print(f"replica {r}: exit {c.returncode} energy test {readings[0]}", flush=True)
    lo, hi = clopper_pearson(failing, args.replicas)
    print(f"replicas {args.replicas}, reference events {args.reference_events}, sample events {args.sample_events}, "
          f"subsample {args.subsample}, broken correlation {args.break_correlation}, seed {args.seed}")
    print(f"distinguishable replicas {failing} ({failing / args.replicas:.4f}), 95% Clopper-Pearson [{lo:.4f}, {hi:.4f}]; "
          f"stated family-wise false-alarm level {FALSE_ALARM}")


if __name__ == "__main__":
    main()
