#!/usr/bin/python3
"""Null and power study of the distance checks (wasserstein-max, jsd-max) through the real gatetasks program.

Per replica, numpy draws a fresh reference sample and a fresh surrogate sample of a long-tailed energy-like feature
(energy ~ lognormal(3, 1)); the surrogate is the same law scaled by --scale (1: a perfect surrogate). gatetasks builds
the reference and checks the surrogate under a contract with `wasserstein-max` and `jsd-max` (--bins equal-probability
bins, default 20, Holm over the two checks, false-alarm 1%). With --scale 1 every FAIL is a false alarm: the tolerances default to
values at or below each estimator's noise floor (the mean distance between two samples of one law at these sizes), where
an estimate taken for unbiased fails most perfect surrogates. With --scale above 1 the study measures power; it prints
the true W1/σ of the scaled law (|s − 1|·E[X]/σ) and its true JSD on the law's equal-probability bins (--bins, 20).

    /usr/bin/python3 tests/studies/distance_null_study.py --gatetasks src/GateTasks.Cli/bin/Release/net8.0/gatetasks.dll \
        --replicas 200 [--reference-events 40000] [--events 20000] [--bins 20] [--seed 1] [--scale 1.0] \
        [--w1-tolerance 0.006] [--jsd-tolerance 0.0001] [--work DIR]

Needs Debian's python3-numpy and python3-scipy. One line per replica, then a summary; exit code 0 whatever the rates
(the caller judges them). The last line is machine-readable:
`summary replicas=N w1_failed=A jsd_failed=B any_failed=C rate=R lower=L upper=U w1_mean=M jsd_mean=J`
(rate and interval, 95% Clopper-Pearson, for any failed check; w1_mean and jsd_mean: mean uncorrected estimates). The line
before it counts replicas whose p-value of "within tolerance" is below 0.05, per check.
"""
import argparse
import math
import os
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

import numpy as np
from scipy import stats

from clopper_pearson import clopper_pearson

MU, SIGMA = 3.0, 1.0

CONTRACT = """contract-version: 1
sample: sample.csv
reference: reference.parquet
features:
  - name: energy
    binning: {{ bins: {bins}, spacing: quantile }}
    checks:
      wasserstein-max: {w1}
      jsd-max: {jsd}
"""


def write_csv(path, x):
    with open(path, "w", encoding="utf-8") as fh:
        fh.write("energy\n")
        fh.write("\n".join(repr(float(v)) for v in x))
        fh.write("\n")



def true_distances(scale, bins):
    """W1/σ and JSD (nats, on the law's equal-probability bins) between lognormal(MU, SIGMA) and its scaled copy."""
    mean = math.exp(MU + SIGMA ** 2 / 2)
    sd = mean * math.sqrt(math.exp(SIGMA ** 2) - 1)
    w1 = abs(scale - 1) * mean / sd
    z = stats.norm.ppf(np.arange(1, bins) / bins)
    p = np.diff(np.concatenate([[0.0], stats.norm.cdf(z), [1.0]]))
    q = np.diff(np.concatenate([[0.0], stats.norm.cdf(z - math.log(scale) / SIGMA), [1.0]]))
    m = (p + q) / 2
    jsd = 0.5 * float(np.sum(p * np.log(p / m)) + np.sum(q * np.log(q / m)))
    return w1, jsd


def run(gatetasks, args, cwd):
    gatetasks = os.path.abspath(gatetasks)
    cmd = ["dotnet", gatetasks] + args if gatetasks.endswith(".dll") else [gatetasks] + args
    env = {k: v for k, v in os.environ.items() if k not in ("CI", "GITHUB_ACTIONS", "TF_BUILD", "GITHUB_BASE_REF")}
    return subprocess.run(cmd, cwd=cwd, capture_output=True, text=True, timeout=600, env=env)


def verdicts(junit):
    """Per check name: (verdict, uncorrected estimate, p-value of "within tolerance") from the JUnit report's properties."""
    out = {}
    for case in ET.parse(junit).getroot().iter("testcase"):
        props = {p.get("name"): p.get("value") for p in case.iter("property")}
        check = props.get("check")
        if check == "wasserstein-max":
            value = float(props["w1"]) / float(props["reference_std"])
        elif check == "jsd-max":
            value = float(props["divergence_nats"])
        else:
            continue
        out[check] = (props.get("verdict"), value, float(props["p_value"]))
    return out


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--gatetasks", required=True, help="the gatetasks program, or its .dll (run with dotnet)")
    p.add_argument("--replicas", type=int, default=200)
    p.add_argument("--reference-events", type=int, default=40000)
    p.add_argument("--events", type=int, default=20000, help="surrogate events")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--bins", type=int, default=20, help="equal-probability bins of the feature")
    p.add_argument("--scale", type=float, default=1.0, help="the surrogate's scale factor (1: perfect)")
    p.add_argument("--w1-tolerance", type=float, default=0.006)
    p.add_argument("--jsd-tolerance", type=float, default=0.0001)
    p.add_argument("--work", help="folder to work in (default: a temporary one)")
    a = p.parse_args()
    work = a.work or tempfile.mkdtemp(prefix="gatetasks-distance-study-")
    os.makedirs(os.path.join(work, ".git"), exist_ok=True)
    with open(os.path.join(work, "contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(CONTRACT.format(bins=a.bins, w1=a.w1_tolerance, jsd=a.jsd_tolerance))
    tw, tj = true_distances(a.scale, a.bins)
    print(f"truth: W1/sigma {tw:.6g} (tolerance {a.w1_tolerance}), JSD {tj:.6g} nats (tolerance {a.jsd_tolerance})", flush=True)
    w1_failed = jsd_failed = any_failed = 0
    w1_values, jsd_values = [], []
    small_p = {"wasserstein-max": 0, "jsd-max": 0}
    for i in range(a.replicas):
        rng = np.random.default_rng([a.seed, i])
        write_csv(os.path.join(work, "reference.csv"), rng.lognormal(MU, SIGMA, a.reference_events))
        write_csv(os.path.join(work, "sample.csv"), a.scale * rng.lognormal(MU, SIGMA, a.events))
        b = run(a.gatetasks, ["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv"], work)
        if b.returncode != 0:
            sys.exit(f"replica {i}: reference build exited {b.returncode}\n{b.stdout}{b.stderr}")
        c = run(a.gatetasks, ["check", "--contract", "contract.yaml", "--junit", "report.xml"], work)
        if c.returncode not in (0, 1, 5):  # passed, failed, undecided (docs/cli.md)
            sys.exit(f"replica {i}: check exited {c.returncode}\n{c.stdout}{c.stderr}")
        v = verdicts(os.path.join(work, "report.xml"))
        wf = v["wasserstein-max"][0] == "fail"
        jf = v["jsd-max"][0] == "fail"
        w1_values.append(v["wasserstein-max"][1])
        jsd_values.append(v["jsd-max"][1])
        for check in small_p:
            small_p[check] += v[check][2] < 0.05
        w1_failed += wf
        jsd_failed += jf
        any_failed += wf or jf
        print(f"replica {i}: exit {c.returncode} w1 {v['wasserstein-max'][0]} ({v['wasserstein-max'][1]:.4g}) "
              f"jsd {v['jsd-max'][0]} ({v['jsd-max'][1]:.4g})", flush=True)
    lo, hi = clopper_pearson(any_failed, a.replicas)
    wlo, whi = clopper_pearson(w1_failed, a.replicas)
    jlo, jhi = clopper_pearson(jsd_failed, a.replicas)
    print(f"w1 failed {w1_failed}/{a.replicas} [{wlo:.4f}, {whi:.4f}]; jsd failed {jsd_failed}/{a.replicas} [{jlo:.4f}, {jhi:.4f}]")
    print(f"p-value below 0.05: w1 {small_p['wasserstein-max']}/{a.replicas}, jsd {small_p['jsd-max']}/{a.replicas}")
    print(f"summary replicas={a.replicas} w1_failed={w1_failed} jsd_failed={jsd_failed} any_failed={any_failed} "
          f"rate={any_failed / a.replicas:.4f} lower={lo:.4f} upper={hi:.4f} "
          f"w1_mean={np.mean(w1_values):.6g} jsd_mean={np.mean(jsd_values):.6g}")


if __name__ == "__main__":
    main()
