#!/usr/bin/python3
"""Null study of the correlation checks through the real gatetasks program.

Per replica, numpy draws a fresh reference sample and a fresh surrogate sample from one heavy-tailed correlated law
(an energy-like x ~ lognormal(3, 0.8) and a response-like y = x (1 + 0.9 t_5), Pearson about 0.5), gatetasks builds
the reference and checks the surrogate under a contract with `pearson-max` and `spearman-max` at a tight tolerance
(default 0.003, far below the coefficients' noise, so that a correct error leaves the checks undecided and a FAIL
can only come from an error that is too small). The surrogate is perfect, so every FAIL is a false alarm; the study
counts replicas with any correlation check failed and reports the rate with its 95% Clopper-Pearson interval
against the contract's false-alarm level (1%, Holm over the two checks).

    /usr/bin/python3 tests/studies/correlation_null_study.py --gatetasks src/GateTasks.Cli/bin/Release/net10.0/gatetasks.dll \
        --replicas 200 [--events 20000] [--seed 1] [--tolerance 0.003] [--work DIR]

Needs Debian's python3-numpy and python3-scipy (scipy only for the interval). Prints one line per replica and a
summary; exit code 0 whatever the rate (the caller judges it). The last line is machine-readable:
`summary replicas=N failed=K rate=R lower=L upper=U pearson_failed=P spearman_failed=S`.
"""
import argparse
import os
import re
import subprocess
import sys
import tempfile

import numpy as np


from clopper_pearson import clopper_pearson

CONTRACT = """contract-version: 1
sample: sample.csv
reference: reference.parquet
features:
  - name: energy
    binning: {{ bins: 20, spacing: quantile }}
    checks:
      mean-shift-max: 1000
  - name: response
    binning: {{ bins: 20, spacing: quantile }}
    checks:
      mean-shift-max: 1000
correlations:
  - features: [energy, response]
    pearson-max: {tol}
    spearman-max: {tol}
"""
PEARSON_LINE = 15
SPEARMAN_LINE = 16


def draw(rng, n):
    x = rng.lognormal(3.0, 0.8, n)
    y = x * (1.0 + 0.9 * rng.standard_t(5, n))
    return x, y


def write_csv(path, x, y):
    with open(path, "w", encoding="utf-8") as fh:
        fh.write("energy,response\n")
        for a, b in zip(x, y):
            fh.write(f"{a!r},{b!r}\n")



def run(gatetasks, args, cwd):
    gatetasks = os.path.abspath(gatetasks)
    cmd = ["dotnet", gatetasks] + args if gatetasks.endswith(".dll") else [gatetasks] + args
    return subprocess.run(cmd, cwd=cwd, capture_output=True, text=True, timeout=600)


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("--gatetasks", required=True, help="the gatetasks program, or its .dll (run with dotnet)")
    p.add_argument("--replicas", type=int, default=200)
    p.add_argument("--events", type=int, default=20000, help="events in each of reference and surrogate")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--tolerance", type=float, default=0.003)
    p.add_argument("--work", help="folder to work in (default: a temporary one)")
    a = p.parse_args()
    work = a.work or tempfile.mkdtemp(prefix="gatetasks-corr-study-")
    os.makedirs(os.path.join(work, ".git"), exist_ok=True)
    with open(os.path.join(work, "contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(CONTRACT.format(tol=a.tolerance))
    failed = pearson_failed = spearman_failed = 0
    for i in range(a.replicas):
        rng = np.random.default_rng([a.seed, i])
        write_csv(os.path.join(work, "reference.csv"), *draw(rng, a.events))
        write_csv(os.path.join(work, "sample.csv"), *draw(rng, a.events))
        b = run(a.gatetasks, ["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv"], work)
        if b.returncode != 0:
            sys.exit(f"replica {i}: reference build exited {b.returncode}\n{b.stdout}{b.stderr}")
        c = run(a.gatetasks, ["check", "--contract", "contract.yaml"], work)
        if c.returncode not in (0, 1, 5):  # passed, failed, undecided (docs/cli.md)
            sys.exit(f"replica {i}: check exited {c.returncode}\n{c.stdout}{c.stderr}")
        lines = [m.group(1) for m in re.finditer(r"contract\.yaml\((\d+),\d+\): error GATE3015", c.stdout + c.stderr)]
        pf = str(PEARSON_LINE) in lines
        sf = str(SPEARMAN_LINE) in lines
        pearson_failed += pf
        spearman_failed += sf
        failed += pf or sf
        print(f"replica {i}: exit {c.returncode} pearson {'FAIL' if pf else 'ok'} spearman {'FAIL' if sf else 'ok'}", flush=True)
    lo, hi = clopper_pearson(failed, a.replicas)
    print(f"summary replicas={a.replicas} failed={failed} rate={failed / a.replicas:.4f} lower={lo:.4f} upper={hi:.4f} "
          f"pearson_failed={pearson_failed} spearman_failed={spearman_failed}")


if __name__ == "__main__":
    main()
