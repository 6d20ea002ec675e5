#!/usr/bin/python3
"""Power and size of the joint block's tolerance checks through the real gatetasks program.

The law (drawn by numpy): five features per event,
    x  ~ N(0, 1)
    y  = exp(Z / 2), Z = r x + sqrt(1 - r^2) e, e ~ N(0, 1)    skewed, Pearson(x, y) = P (r = P / C, C below)
    n1 ~ N(0, 1), n2 ~ U(0, 1), n3 ~ Exp(1)                     independent of everything
so (x, y) is a forward-jet-like correlated pair (one member skewed) beside three independent features. Pearson(x, y)
is exactly P: by Stein's lemma Cov(x, exp(Z/2)) = r/2 E[exp(Z/2)] = r/2 e^(1/8), Var y = e^(1/2) - e^(1/4), so
C = e^(1/8) / (2 sqrt(e^(1/2) - e^(1/4))) = 0.93818. The reference is a sample of P = 0.50 (--reference-events,
default 10^6 events).

Modes (each unweighted, and weighted when --weights is given, see below):
  permuted   a faithful draw with y permuted across events (marginals exact, Pearson 0): counted FAIL of the block
  shifted    a draw with Pearson 0.45 instead of 0.50: counted FAIL of the block
  null       a faithful draw of the reference's law: counted FAIL of the block (a false alarm)
The joint block FAILs when any of its checks fails. Its tolerances (below) lie under each check's true value for
the shifted law, so a FAIL there means a stated tolerance is really exceeded, and a FAIL of the null is a false alarm.

Weighted (--weighting weighted): in reference and surrogate alike, a random 10% of events are written twice with
the same features, one copy at weight 1.5 and one at -0.5 (the law the weights describe is unchanged; 5% of the
rows carry a negative weight); the other events have weight 1.

A run can be split over processes by weighting (--weighting weighted in one, unweighted in another): the seeds
depend on the weighting's name, not on its place in the list. One reference per weighting is drawn and built once
(seed [seed, 0, weighting]) and shared by every replica of every mode: the power modes ask about a fixed reference,
and for the null the rates are conditional on that reference (its noise is a common offset of all replicas; at
10^6 reference events it is as large as a 10^6-event surrogate's, so the null at 10^6 is the stricter case).
Surrogate replica i of mode m draws from numpy.random.default_rng([seed, 1 + mode index, weighting, size, i]).

    /usr/bin/python3 tests/studies/joint_power_study.py --cli "dotnet src/GateTasks.Cli/bin/Release/net8.0/gatetasks.dll" \
        [--modes permuted:100000,shifted:1000000,null:100000,null:1000000] [--replicas 80,20,40,20] \
        [--weighting unweighted,weighted] [--checks frechet,kernel[,sliced]] [--seed 1] [--reference-events 1000000]
        [--work DIR] [--truth]

--modes lists mode:events pairs and --replicas their replica counts (one number for all, or one per pair); --first
(likewise) starts at that replica index, so a later run adds replicas with new seeds to an earlier one (the
reference is the same).
--truth only prints each check's true value for the shifted law (closed form for the Fréchet distance, a 4*10^6
event numpy sample for the others) and exits. Needs Debian's python3-numpy and python3-scipy. The last lines are a
Markdown table; the machine-readable lines are
`summary weighting=W mode=M events=N replicas=R fails=K rate=X lower=L upper=U` (95% Clopper-Pearson interval).
"""
import argparse
import math
import os
import shlex
import subprocess
import sys
import tempfile
import time
import xml.etree.ElementTree as ET

import numpy as np
from scipy import linalg

from clopper_pearson import clopper_pearson

C = math.exp(1 / 8) / (2 * math.sqrt(math.exp(0.5) - math.exp(0.25)))
P_REFERENCE, P_SHIFTED = 0.50, 0.45
FEATURES = ["x", "y", "n1", "n2", "n3"]
FALSE_ALARM = 0.01
SPLIT_SHARE = 0.10

# Tolerances: each about half of its check's true value for the shifted law (--truth prints them: Fréchet 0.001615
# in closed form, kernel distance 0.000682 from 4*10^6 events a law), so the shifted law exceeds them by a margin
# that 10^6 events resolve (jackknife and block standard errors measured at 10^6 events: 5-9e-5 and 5e-5-1.7e-4, so
# about 10 and 2-6 standard errors), and the null at 10^6 sits far below them. At 10^5 events the kernel distance's error (about
# 4e-4) exceeds its tolerance: a faithful surrogate is then inconclusive on it, not passed. The sliced tolerances are
# set for the permuted law, not for the shifted one: the 0.50 -> 0.45 change moves the projected laws by about the
# sliced distances' own floor at these sizes (--truth --checks frechet,kernel,sliced: KS mean 0.0021, worst 0.0077;
# W1 mean 0.0054, worst 0.0195, each biased upwards by the 4*10^6-event noise, about 0.0006 for KS, while two samples
# of one law read about 0.002 to 0.009 at 10^5 events), so a tolerance under it could neither pass a faithful sample
# nor be shown exceeded; they are not asked to catch it. The permuted law reads about 0.09 (KS worst), 0.03 (KS mean),
# 0.29 (W1/sigma worst) and 0.09 (W1/sigma mean) at 10^5 events (SlicedJointCheckTests), about three times these.
TOLERANCE = {"frechet-max": 0.0008, "kernel-distance-max": 0.00034}
SLICED = {"sliced-ks-max": {"worst": 0.03, "mean": 0.01}, "sliced-wasserstein-max": {"worst": 0.08, "mean": 0.03}}
PROJECTIONS = 64


def draw(rng, n, pearson):
    """n events of the law with Pearson(x, y) = pearson, as an (n, 5) array in the order of FEATURES."""
    r = pearson / C
    x = rng.standard_normal(n)
    y = np.exp((r * x + math.sqrt(1 - r * r) * rng.standard_normal(n)) / 2)
    return np.column_stack([x, y, rng.standard_normal(n), rng.uniform(size=n), rng.exponential(size=n)])


def weighted_rows(rng, data, weighting):
    """(rows, weights): unweighted rows have weight 1; weighted rows split SPLIT_SHARE of the events into a 1.5 and a -0.5 copy."""
    if weighting == "unweighted":
        return data, np.ones(len(data))
    split = rng.random(len(data)) < SPLIT_SHARE
    rows = np.concatenate([data[~split], data[split], data[split]])
    w = np.concatenate([np.ones((~split).sum()), np.full(split.sum(), 1.5), np.full(split.sum(), -0.5)])
    order = rng.permutation(len(rows))  # spread the copies through the file (and over the engine's blocks)
    return rows[order], w[order]


def write_csv(path, rows, weights):
    table = np.column_stack([rows, weights])
    line = ",".join(["%.9g"] * table.shape[1]) + "\n"
    with open(path, "w", encoding="ascii") as fh:
        fh.write(",".join(FEATURES + ["w"]) + "\n")
        for start in range(0, len(table), 200_000):
            chunk = table[start:start + 200_000]
            fh.write((line * len(chunk)) % tuple(chunk.ravel()))


def contract_text(checks, weighting):
    keys = []
    if "frechet" in checks:
        keys.append(f"  frechet-max: {TOLERANCE['frechet-max']!r}")
    if "kernel" in checks:
        keys.append(f"  kernel-distance-max: {TOLERANCE['kernel-distance-max']!r}")
    if "sliced" in checks:
        for key, t in SLICED.items():
            keys.append(f"  {key}: {{ worst: {t['worst']!r}, mean: {t['mean']!r} }}")
        keys.append(f"  projections: {PROJECTIONS}")
    weight = "" if weighting == "unweighted" else ", weight: w"
    features = "".join(f"  - name: {f}\n    checks: {{ ks-max: 0.5 }}\n" for f in FEATURES)
    return (f"contract-version: 1\ntitle: joint-power-study\nsample: {{ path: sample.csv{weight} }}\n"
            f"reference: reference.parquet\ndecision:\n  false-alarm: {FALSE_ALARM}\n  correction: holm\n"
            f"features:\n{features}joint:\n  features: [{', '.join(FEATURES)}]\n" + "\n".join(keys) + "\n")


def run(cli, args, cwd):
    return subprocess.run(shlex.split(cli) + args, cwd=cwd, capture_output=True, text=True, timeout=1800)


def joint_verdicts(junit):
    """{check key: (verdict, estimate, standard error)} of the joint block's test cases in a JUnit report (docs/cli.md)."""
    out = {}
    for case in ET.parse(junit).getroot().iter("testcase"):
        if "joint(" not in (case.get("classname") or ""):
            continue
        props = case.find("properties")
        p = {} if props is None else {q.get("name"): q.get("value") for q in props}
        out[case.get("name")] = (p.get("verdict"), p.get("estimate"), p.get("standard_error"))
    return out


def standardise(data, mean, sd):
    return (data - mean) / sd


def law_moments():
    """Mean and standard deviation of each feature of the reference law, in closed form."""
    ey, vy = math.exp(1 / 8), math.exp(0.5) - math.exp(0.25)
    return np.array([0, ey, 0, 0.5, 1]), np.sqrt(np.array([1, vy, 1, 1 / 12, 1]))


def frechet_truth():
    """Fréchet distance between the Gaussian fits of the two laws, standardised by the reference law: only the (x, y)
    correlation differs, so it is that of two unit-variance bivariate normals (scipy.linalg.sqrtm)."""
    a = np.eye(5)
    b = np.eye(5)
    a[0, 1] = a[1, 0] = P_REFERENCE
    b[0, 1] = b[1, 0] = P_SHIFTED
    root = linalg.sqrtm(a @ b).real
    return float(np.trace(a + b - 2 * root))


def kernel_truth(n=4_000_000, seed=99):
    """MMD^2 with k(u, v) = (u.v/d + 1)^3 between the laws: the sum over k of C(3, k)/d^k times the squared distance
    between the laws' k-th moment tensors, the tensors from n events of each law drawn with common random numbers."""
    mean, sd = law_moments()
    d = len(FEATURES)
    diff = [np.zeros((d,) * k) for k in (1, 2, 3)]
    for part in range(0, n, 500_000):
        m = min(500_000, n - part)
        for sign, p in ((1, P_REFERENCE), (-1, P_SHIFTED)):
            u = standardise(draw(np.random.default_rng([seed, part]), m, p), mean, sd)
            diff[0] += sign * u.sum(0) / n
            diff[1] += sign * np.einsum("ni,nj->ij", u, u) / n
            diff[2] += sign * np.einsum("ni,nj,nk->ijk", u, u, u, optimize=True) / n
    return float(sum(math.comb(3, k) / d ** k * (diff[k - 1] ** 2).sum() for k in (1, 2, 3)))


def sliced_truth(n=4_000_000, seed=98):
    """Mean and largest over PROJECTIONS random unit directions of the projected KS and W1 distances between the
    laws (standardised by the reference law), from n events of each law."""
    mean, sd = law_moments()
    a = standardise(draw(np.random.default_rng([seed, 1]), n, P_REFERENCE), mean, sd)
    b = standardise(draw(np.random.default_rng([seed, 2]), n, P_SHIFTED), mean, sd)
    dirs = np.random.default_rng([seed, 3]).standard_normal((PROJECTIONS, len(FEATURES)))
    dirs /= np.linalg.norm(dirs, axis=1, keepdims=True)
    ks, w1 = [], []
    for v in dirs:
        pa, pb = np.sort(a @ v), np.sort(b @ v)
        grid = np.concatenate([pa, pb])
        ks.append(np.abs(np.searchsorted(pa, grid, "right") - np.searchsorted(pb, grid, "right")).max() / n)
        w1.append(np.abs(pa - pb).mean())
    return {"sliced-ks-max": (float(np.mean(ks)), float(np.max(ks))), "sliced-wasserstein-max": (float(np.mean(w1)), float(np.max(w1)))}


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--cli")
    p.add_argument("--modes", default="permuted:100000,shifted:1000000,null:100000,null:1000000")
    p.add_argument("--replicas", default="80,20,40,20")
    p.add_argument("--weighting", default="unweighted,weighted")
    p.add_argument("--checks", default="frechet,kernel")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--reference-events", type=int, default=1_000_000)
    p.add_argument("--first", default="0", help="index of the first replica, one or one per pair (to extend a run)")
    p.add_argument("--work")
    p.add_argument("--truth", action="store_true")
    a = p.parse_args()
    checks = a.checks.split(",")
    if any(c not in ("frechet", "kernel", "sliced") for c in checks):
        sys.exit("--checks takes frechet, kernel and sliced")
    if a.truth:
        print(f"frechet-max truth {frechet_truth():.6g} (tolerance {TOLERANCE['frechet-max']})")
        print(f"kernel-distance-max truth {kernel_truth():.6g} (tolerance {TOLERANCE['kernel-distance-max']})")
        if "sliced" in checks:
            for key, (mean, worst) in sliced_truth().items():
                print(f"{key} truth mean {mean:.6g} worst {worst:.6g} (tolerances {SLICED[key]})")
        return
    if not a.cli:
        sys.exit("--cli is required (or --truth)")
    modes = [(m.split(":")[0], int(m.split(":")[1])) for m in a.modes.split(",")]
    counts = [int(r) for r in a.replicas.split(",")]
    if len(counts) == 1:
        counts *= len(modes)
    firsts = [int(f) for f in a.first.split(",")]
    if len(firsts) == 1:
        firsts *= len(modes)
    if len(counts) != len(modes) or len(firsts) != len(modes) or any(m not in ("permuted", "shifted", "null") for m, _ in modes):
        sys.exit("--modes takes permuted|shifted|null:EVENTS pairs, --replicas and --first one number or one per pair")
    work = a.work or tempfile.mkdtemp(prefix="gatetasks-joint-power-")
    started = time.monotonic()
    lines, table = [], []
    for weighting in a.weighting.split(","):
        if weighting not in ("unweighted", "weighted"):
            sys.exit("--weighting takes unweighted and weighted")
        wi = ["unweighted", "weighted"].index(weighting)  # in the seeds: one weighting run alone draws what it draws in a run of both
        folder = os.path.join(work, weighting)
        os.makedirs(os.path.join(folder, ".git"), exist_ok=True)
        with open(os.path.join(folder, "contract.yaml"), "w", encoding="utf-8") as fh:
            fh.write(contract_text(checks, weighting))
        rng = np.random.default_rng([a.seed, 0, wi])
        write_csv(os.path.join(folder, "reference.csv"), *weighted_rows(rng, draw(rng, a.reference_events, P_REFERENCE), weighting))
        build = ["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv"]
        b = run(a.cli, build + ([] if weighting == "unweighted" else ["--weight", "w"]), folder)
        if b.returncode != 0:
            sys.exit(f"{weighting}: reference build exited {b.returncode}\n{b.stdout}{b.stderr}")
        os.remove(os.path.join(folder, "reference.csv"))
        for (mode, events), replicas, first in zip(modes, counts, firsts):
            mi = ["permuted", "shifted", "null"].index(mode)
            fails, kinds = 0, {}
            t0 = time.monotonic()
            for i in range(first, first + replicas):
                r = np.random.default_rng([a.seed, 1 + mi, wi, events, i])
                data = draw(r, events, P_SHIFTED if mode == "shifted" else P_REFERENCE)
                if mode == "permuted":
                    data[:, 1] = r.permutation(data[:, 1])
                write_csv(os.path.join(folder, "sample.csv"), *weighted_rows(r, data, weighting))
                c = run(a.cli, ["check", "--contract", "contract.yaml", "--junit", "result.xml"], folder)
                if c.returncode not in (0, 1, 5):  # passed, failed, undecided (docs/cli.md)
                    sys.exit(f"{weighting} {mode} replica {i}: check exited {c.returncode}\n{c.stdout}{c.stderr}")
                v = joint_verdicts(os.path.join(folder, "result.xml"))
                if not v:
                    sys.exit(f"{weighting} {mode} replica {i}: no joint test case in the report")
                failed = any(verdict == "fail" for verdict, _, _ in v.values())
                fails += failed
                for key, (verdict, _, _) in v.items():
                    kinds.setdefault(key, {}).setdefault(verdict, 0)
                    kinds[key][verdict] += 1
                shown = " ".join(f"[{k} {verdict} {est}±{se}]" for k, (verdict, est, se) in sorted(v.items()))
                print(f"{weighting} {mode} {events} replica {i}: exit {c.returncode} {shown}", flush=True)
            lo, hi = clopper_pearson(fails, replicas)
            per = "; ".join(f"{k}: " + ", ".join(f"{n} {v}" for v, n in sorted(vs.items())) for k, vs in sorted(kinds.items()))
            lines.append(f"summary weighting={weighting} mode={mode} events={events} replicas={replicas} fails={fails} "
                         f"rate={fails / replicas:.4f} lower={lo:.4f} upper={hi:.4f}")
            table.append(f"| {weighting} | {mode} | {events:,} | {fails}/{replicas} | {fails / replicas:.3f} | "
                         f"[{lo:.3f}, {hi:.3f}] | {per} | {time.monotonic() - t0:.0f} s |")
            print(lines[-1], flush=True)
    tol = ", ".join(f"{k} {v}" for k, v in TOLERANCE.items() if k.split("-")[0] in ("frechet",) and "frechet" in checks
                    or k.startswith("kernel") and "kernel" in checks)
    if "sliced" in checks:
        tol += ", " + ", ".join(f"{k} {v}" for k, v in SLICED.items()) + f", projections {PROJECTIONS}"
    print(f"\nReference {a.reference_events:,} events (P = {P_REFERENCE}), seed {a.seed}, tolerances {tol}, "
          f"false-alarm {FALSE_ALARM} (Holm over the contract's {len(FEATURES)} ks-max checks and the joint checks), "
          f"{time.monotonic() - started:.0f} s in all.\n")
    print("| weighting | mode | surrogate events | FAIL | rate | 95% CP interval | verdicts per check | time |")
    print("|---|---|---|---|---|---|---|---|")
    print("\n".join(table))
    print("\n".join(lines))


if __name__ == "__main__":
    main()
