#!/usr/bin/python3
"""Does `gatetasks check` pass a perfect surrogate of the size `gatetasks plan` states, at the plan's rate?

For each scenario numpy draws a trusted sample from a known law, the real gatetasks program builds the reference
and plans (`gatetasks plan`: per check the events a perfect surrogate needs to pass with probability >= the
contract's confidence). Then, per replica, numpy draws a fresh trusted sample (the plan's replicas draw a fresh
reference too), gatetasks builds its reference, and for every planned size a fresh surrogate of exactly that many
events from the same law is checked by `gatetasks check`. Each check's verdict is read at its own planned size from
the JUnit report; the study counts passes and states each rate with its 95% Clopper-Pearson interval beside the
plan's target.

Scenarios (`--scenarios`, comma-separated):
  continuous  a long-tailed energy, lognormal(3, 0.8): mean-shift-max and quantile-shift-max (the latter in units of
              the unbinned sigma, which bin centres overstate about threefold here), and wasserstein-max (measured by
              check on the reference's fine grid, which the plan's replicas draw too)
  category    x ~ normal(10, 2) in a category block over c, with 3% of events in c = 1: the small category's
              ks-max widens as 1/sqrt(share) (share-scaling), its mean-shift-max is its own (per-category)
  discrete    n_jets ~ Poisson(2) capped at 6: fraction-max

    /usr/bin/python3 tests/studies/plan_agreement_study.py --gatetasks src/GateTasks.Cli/bin/Release/net8.0/gatetasks.dll \
        --replicas 100 [--reference-events 100000] [--plan-replicas 400] [--seed 1] [--work DIR] [--json FILE]

Needs Debian's python3-numpy. Exit code 0 whatever the rates (the caller judges them); the last line is
`summary checks=C replicas=M lowest_rate=R lowest_upper=U target=T`.
"""
import argparse
import json
import math
import os
import re
import shutil
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

import numpy as np

SCENARIOS = {
    "continuous": {
        "contract": """contract-version: 1
sample: sample.csv
reference: reference.parquet
defaults:
  binning: { bins: 20, spacing: quantile }
features:
  - name: energy
    checks:
      mean-shift-max: 0.04
      quantile-shift-max: 0.08
      wasserstein-max: 0.03
""",
        "columns": ["energy"],
    },
    "category": {
        "contract": """contract-version: 1
sample: sample.csv
reference: reference.parquet
defaults:
  binning: { bins: 20, spacing: quantile }
features:
  - name: x
    checks:
      mean-shift-max: 0.04
      ks-max: 0.03
    categories:
      by: c
      values: [0, 1]
      share-scaling: { rule: inverse-sqrt, full-share: 0.5 }
      per-category:
        1: { mean-shift-max: 0.12 }
""",
        "columns": ["x", "c"],
    },
    "discrete": {
        "contract": """contract-version: 1
sample: sample.csv
reference: reference.parquet
features:
  - name: n_jets
    kind: discrete
    checks:
      fraction-max: 0.01
""",
        "columns": ["n_jets"],
    },
}


def draw(scenario, rng, n):
    """n events of the scenario's law, as columns."""
    if scenario == "continuous":
        return {"energy": rng.lognormal(3.0, 0.8, n)}
    if scenario == "category":
        return {"x": rng.normal(10.0, 2.0, n), "c": (rng.random(n) < 0.03).astype(np.int64)}
    return {"n_jets": np.minimum(rng.poisson(2.0, n), 6).astype(np.int64)}


def write_csv(path, columns):
    names = list(columns)
    data = np.column_stack([columns[k] for k in names])
    fmt = ["%d" if columns[k].dtype.kind == "i" else "%.9g" for k in names]
    np.savetxt(path, data, delimiter=",", header=",".join(names), comments="", fmt=fmt)


def run(gatetasks, args, cwd):
    cmd = (["dotnet", gatetasks] if gatetasks.endswith(".dll") else [gatetasks]) + args
    p = subprocess.run(cmd, cwd=cwd, capture_output=True, text=True, timeout=1200)
    return p.returncode, p.stdout, p.stderr


def must(gatetasks, args, cwd, codes=(0,)):
    code, out, err = run(gatetasks, args, cwd)
    if code not in codes:
        sys.exit(f"gatetasks {' '.join(args)} exited {code}:\n{out}\n{err}")
    return out


def planned_sizes(markdown):
    """(feature, check, region) -> planned events, or None where the plan says no size suffices."""
    sizes = {}
    for line in open(markdown, encoding="utf-8"):
        cells = [c.strip() for c in line.strip().strip("|").split("|")]
        if len(cells) < 5 or cells[0] in ("subject", "") or cells[0].startswith("---"):
            continue
        label = cells[1]
        m = re.fullmatch(r"([a-z0-9-]+)(?:\[(.+)\])?", label)
        if not m:
            continue
        key = (cells[0], m.group(1), m.group(2) or "all")
        events = re.sub(r"[^0-9]", "", cells[3])
        sizes[key] = int(events) if cells[3].startswith("≈") and events else None
    return sizes


def verdicts(junit):
    out = {}
    for case in ET.parse(junit).getroot().iter("testcase"):
        props = {p.get("name"): p.get("value") for p in case.iter("property")}
        if "feature" in props:
            out[(props["feature"], props["check"], props["region"])] = props["verdict"]
    return out


def binomial_cdf(k, n, p):
    return sum(math.comb(n, i) * p ** i * (1 - p) ** (n - i) for i in range(k + 1))


def clopper_pearson(k, n, level=0.95):
    """Exact (Clopper & Pearson 1934) interval by bisection on the binomial CDF."""
    a = (1 - level) / 2

    def solve(f):
        lo, hi = 0.0, 1.0
        for _ in range(60):
            mid = (lo + hi) / 2
            if f(mid):
                hi = mid
            else:
                lo = mid
        return (lo + hi) / 2

    lower = 0.0 if k == 0 else solve(lambda p: 1 - binomial_cdf(k - 1, n, p) >= a)
    upper = 1.0 if k == n else solve(lambda p: binomial_cdf(k, n, p) <= a)
    return lower, upper


def study(a, scenario, rng, work):
    spec = SCENARIOS[scenario]
    folder = os.path.join(work, scenario)
    os.makedirs(folder, exist_ok=True)
    with open(os.path.join(folder, "precision-contract.yaml"), "w", encoding="utf-8") as fh:
        fh.write(spec["contract"])
    write_csv(os.path.join(folder, "trusted.csv"), draw(scenario, rng, a.reference_events))
    must(a.gatetasks, ["reference", "build", "--from", "trusted.csv"], folder)
    plan_md = os.path.join(folder, "plan.md")
    must(a.gatetasks, ["plan", "--replicas", str(a.plan_replicas), "--seed", str(a.seed), "--events", "100000", "--markdown", plan_md], folder)
    planned = planned_sizes(plan_md)
    target = float(re.search(r"confidence ([0-9.]+)", open(plan_md, encoding="utf-8").read()).group(1))
    sizes = sorted({n for n in planned.values() if n is not None and n <= a.max_events})
    passes = {k: 0 for k, n in planned.items() if n is not None and n <= a.max_events}
    for r in range(a.replicas):
        write_csv(os.path.join(folder, "trusted.csv"), draw(scenario, rng, a.reference_events))
        must(a.gatetasks, ["reference", "build", "--from", "trusted.csv"], folder)
        for n in sizes:
            write_csv(os.path.join(folder, "sample.csv"), draw(scenario, rng, n))
            junit = os.path.join(folder, "check.junit.xml")
            must(a.gatetasks, ["check", "--junit", junit], folder, codes=(0, 1, 5))
            got = verdicts(junit)
            for key, size in planned.items():
                if size == n and key in passes:
                    passes[key] += got[key] == "pass"
    rows = []
    for key, size in planned.items():
        row = {"scenario": scenario, "feature": key[0], "check": key[1], "region": key[2], "planned_events": size, "target": target}
        if key in passes:
            k = passes[key]
            lo, hi = clopper_pearson(k, a.replicas)
            row.update(replicas=a.replicas, passed=k, rate=k / a.replicas, lower=lo, upper=hi)
            print(f"{scenario:10s} {key[0]:8s} {key[1]}[{key[2]}] planned {size} events: passed {k}/{a.replicas} "
                  f"= {k / a.replicas:.3f}, 95% CP [{lo:.3f}, {hi:.3f}], plan's target {target}", flush=True)
        else:
            row.update(replicas=0)
            print(f"{scenario:10s} {key[0]:8s} {key[1]}[{key[2]}] planned: {size if size else 'no size suffices'} (not drawn)", flush=True)
        rows.append(row)
    return rows


def main():
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("--gatetasks", required=True, help="gatetasks.dll (run with dotnet) or an executable")
    p.add_argument("--replicas", type=int, default=100)
    p.add_argument("--reference-events", type=int, default=100_000)
    p.add_argument("--plan-replicas", type=int, default=400)
    p.add_argument("--max-events", type=int, default=2_000_000, help="planned sizes above this are not drawn")
    p.add_argument("--scenarios", default="continuous,category,discrete")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--work")
    p.add_argument("--json")
    a = p.parse_args()
    a.gatetasks = os.path.abspath(a.gatetasks)
    rng = np.random.default_rng(a.seed)
    work = a.work or tempfile.mkdtemp(prefix="gatetasks-plan-agreement-")
    os.makedirs(work, exist_ok=True)
    try:
        rows = []
        for scenario in a.scenarios.split(","):
            rows += study(a, scenario, rng, work)
    finally:
        if not a.work:
            shutil.rmtree(work, ignore_errors=True)
    drawn = [r for r in rows if r["replicas"] > 0]
    if a.json:
        with open(a.json, "w", encoding="utf-8") as fh:
            json.dump({"seed": a.seed, "replicas": a.replicas, "checks": rows}, fh, indent=1)
    lowest = min(drawn, key=lambda r: r["rate"]) if drawn else None
    print(f"summary checks={len(drawn)} replicas={a.replicas} lowest_rate={lowest['rate'] if lowest else float('nan'):.3f} "
          f"lowest_upper={lowest['upper'] if lowest else float('nan'):.3f} target={drawn[0]['target'] if drawn else float('nan')}")


if __name__ == "__main__":
    main()
