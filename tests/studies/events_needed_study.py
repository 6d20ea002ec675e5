#!/usr/bin/python3
"""Does a surrogate sample of the stated "events needed" decide an inconclusive check?

A fixed reference and a fixed surrogate law are drawn with numpy; a small pilot surrogate leaves some checks
inconclusive, and the real gatetasks program states for each the surrogate events that would decide it. Fresh
surrogates of exactly that size are then drawn from the same law, checked by the real program, and the share of
replicas in which the check is decided (passed or failed) is counted, with its 95% Clopper-Pearson (1934) interval
(scipy.stats.beta). The checks cover the pass side (a mean shift inside its tolerance), the fail side (a shift beyond
it) and a category of a category block (a feature with a condition of its own, 20% of the events), each with
`mean-shift-max` (normal parts) and `ks-max` (a distribution-free band; its distance is biased upwards on a small pilot,
so its figures scatter more).

The program states its figure for a 90% chance if the effect is as the pilot estimated; the pilot's own noise moves
the estimate, so the rate over pilots is expected below 90% but well above an even chance.

Usage:
  /usr/bin/python3 tests/studies/events_needed_study.py --gatetasks PATH [--pilots 10] [--replicas 40] [--seed 1]
      [--max-events N] [--work DIR] [--json FILE]
PATH is the gatetasks program: an executable, or a .dll run with `dotnet`.
"""
import argparse
import json
import math
import os
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

import numpy as np


from clopper_pearson import clopper_pearson

REFERENCE_EVENTS = 200_000
PILOT_EVENTS = 2_000
CATEGORY_SHARE = 0.2

CONTRACT = """contract-version: 1
title: events-needed-study
sample: surrogate.csv
reference: reference.json
decision: { confidence: 0.95, false-alarm: 0.01, correction: holm, inconclusive: warn }
acceptance: { required: off }
defaults:
  binning: { bins: 10, spacing: quantile }
  checks: { mean-shift-max: 0.03, ks-max: 0.02 }
features:
  - name: x
  - name: y
  - name: z
    checks: { mean-shift-max: 0.04 }
    categories:
      by: c
      values: [0, 1]
"""


def draw(rng, n, shifted):
    """One sample: x inside its tolerance (0.01 of 0.03), y beyond it (0.08), z shifted by 0.01 (tolerance 0.04)."""
    shift_x, shift_y, shift_z = (0.01, 0.08, 0.01) if shifted else (0.0, 0.0, 0.0)
    c = (rng.random(n) < CATEGORY_SHARE).astype(np.int64)
    return {
        "x": rng.normal(shift_x, 1.0, n),
        "y": rng.normal(shift_y, 1.0, n),
        "z": rng.normal(shift_z, 1.0, n),
        "c": c,
    }


def write_csv(path, columns):
    names = list(columns)
    data = np.column_stack([columns[k] for k in names])
    np.savetxt(path, data, delimiter=",", header=",".join(names), comments="", fmt=["%.9g", "%.9g", "%.9g", "%d"])


def run(gatetasks, args, cwd):
    cmd = (["dotnet", gatetasks] if gatetasks.endswith(".dll") else [gatetasks]) + args
    p = subprocess.run(cmd, cwd=cwd, capture_output=True, text=True, timeout=600)
    return p.returncode, p.stdout, p.stderr


def checks_of(junit):
    """Each testcase's properties, keyed by (feature, check, region)."""
    out = {}
    for case in ET.parse(junit).getroot().iter("testcase"):
        props = {p.get("name"): p.get("value") for p in case.iter("property")}
        if "feature" in props:
            out[(props["feature"], props["check"], props["region"])] = props
    return out


def check(gatetasks, work, sample_rows, tag):
    write_csv(os.path.join(work, "surrogate.csv"), sample_rows)
    junit = os.path.join(work, tag + ".junit.xml")
    code, out, err = run(gatetasks, ["check", "--contract", "contract.yaml", "--junit", junit], work)
    if code not in (0, 1, 5):
        sys.exit(f"gatetasks check exited {code}:\n{out}\n{err}")
    return checks_of(junit)



def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--gatetasks", required=True)
    ap.add_argument("--pilots", type=int, default=10)
    ap.add_argument("--replicas", type=int, default=40)
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--max-events", type=int, default=2_000_000, help="skip a check whose stated size is larger")
    ap.add_argument("--work")
    ap.add_argument("--json")
    a = ap.parse_args()
    work = a.work or tempfile.mkdtemp(prefix="gatetasks-needed-")
    os.makedirs(work, exist_ok=True)
    with open(os.path.join(work, "contract.yaml"), "w") as f:
        f.write(CONTRACT)
    rng = np.random.default_rng(a.seed)
    write_csv(os.path.join(work, "fullsim.csv"), draw(rng, REFERENCE_EVENTS, shifted=False))
    code, out, err = run(a.gatetasks, ["reference", "build", "--contract", "contract.yaml", "--from", "fullsim.csv"], work)
    if code != 0:
        sys.exit(f"reference build exited {code}:\n{out}\n{err}")

    rows = []
    for pilot in range(a.pilots):
        pilot_checks = check(a.gatetasks, work, draw(rng, PILOT_EVENTS, shifted=True), f"pilot{pilot}")
        for key, props in sorted(pilot_checks.items()):
            if props["verdict"] != "inconclusive":
                continue
            needed = float(props.get("events_needed", "nan"))
            if not math.isfinite(needed):
                # +inf: "more reference events" (no surrogate size decides at the estimated effect); NaN: no figure at all.
                rows.append({"pilot": pilot, "check": "/".join(key), "events_needed": props.get("events_needed"), "replicas": 0, "decided": 0,
                             "more_reference": needed == math.inf})
                print(f"pilot {pilot} {'/'.join(key):40s} needed {props.get('events_needed')}: not drawn", flush=True)
                continue
            size = int(math.ceil(needed))
            if size > a.max_events:
                rows.append({"pilot": pilot, "check": "/".join(key), "events_needed": size, "replicas": 0, "decided": 0, "too_large": True})
                print(f"pilot {pilot} {'/'.join(key):40s} needed {size:>9d}: above --max-events, not drawn", flush=True)
                continue
            decided = passed = failed = 0
            for r in range(a.replicas):
                verdict = check(a.gatetasks, work, draw(rng, size, shifted=True), "replica")[key]["verdict"]
                decided += verdict in ("pass", "fail")
                passed += verdict == "pass"
                failed += verdict == "fail"
            rows.append({"pilot": pilot, "check": "/".join(key), "events_needed": size,
                         "events_needed_in_category": props.get("events_needed_in_category"),
                         "stated_side": props.get("events_needed_decides"), "stated_chance": props.get("events_needed_chance"),
                         "replicas": a.replicas, "decided": decided, "passed": passed, "failed": failed})
            print(f"pilot {pilot} {'/'.join(key):40s} needed {size:>9d} decided {decided}/{a.replicas} "
                  f"(pass {passed}, fail {failed}; stated {props.get('events_needed_decides')})", flush=True)

    total = sum(r["replicas"] for r in rows)
    decided = sum(r["decided"] for r in rows)
    lo, hi = clopper_pearson(decided, total) if total else (float("nan"), float("nan"))
    summary = {"replicas": total, "decided": decided, "rate": decided / total if total else float("nan"),
               "ci95": [lo, hi], "checks": rows, "undecided_without_figure": sum(1 for r in rows if r["replicas"] == 0 and not r.get("too_large") and not r.get("more_reference")),
               "more_reference_events": sum(1 for r in rows if r.get("more_reference")),
               "above_max_events": sum(1 for r in rows if r.get("too_large")),
               "numpy": np.__version__, "seed": a.seed}
    print(f"decided {decided} of {total} replicas at the stated size: {summary['rate']:.3f} [95% CI {lo:.3f}, {hi:.3f}]")
    if a.json:
        with open(a.json, "w") as f:
            json.dump(summary, f, indent=1)


if __name__ == "__main__":
    main()
