#!/usr/bin/env python3
"""Calls the gate after each checkpoint of a training loop and follows the binding headroom per epoch.

After each epoch the loop writes the surrogate's sample for that checkpoint, runs

    gatetasks check --contract CONTRACT --sample SAMPLE --json RESULT

reads RESULT with json.load, and keeps, per epoch, the run's outcome and its binding check: the check, among those
that did not fail, whose upper bound uses the largest share of its tolerance. At the end it writes the figures to
headroom.csv and, when matplotlib is installed, plots the binding share against the epoch (headroom.png); without
matplotlib the CSV alone is written and the script says so. Only the standard library is needed.

Here the "training" is a stand-in: epoch N's sample is the N-th of --samples, taken in turn. In a real loop, replace
write_checkpoint_sample() with the code that generates the checkpoint's events. See docs/training-loop.md.
"""
import argparse
import csv
import json
import os
import shlex
import subprocess
import sys

# gatetasks check's exit codes (docs/cli.md): a result was written for each of these.
FINISHED = {0: "passed", 1: "failed", 4: "not accepted", 5: "undecided"}


def write_checkpoint_sample(epoch, samples):
    """Stand-in for the training step: returns the sample file of this epoch's checkpoint."""
    return samples[(epoch - 1) % len(samples)]


def check(gatetasks, contract, sample, result_path):
    """Runs the gate on one sample; returns the JSON result (a dict) and the exit code."""
    command = gatetasks + ["check", "--contract", contract, "--sample", sample, "--json", result_path]
    run = subprocess.run(command, capture_output=True, text=True)
    if run.returncode not in FINISHED:
        # An input error (2) or an internal error (3): the JSON says the run did not finish, and why.
        sys.stderr.write(run.stderr)
    with open(result_path, encoding="utf-8") as f:
        return json.load(f), run.returncode


def binding(result):
    """The binding check of a finished result: (name, upper share, point share), or None."""
    if not result.get("finished") or not result["binding_checks"]:
        return None
    b = result["binding_checks"][0]
    return f'{b["subject"]} {b["check"]}', b["upper_share"], b["point_share"]


def worst_share(result):
    """The largest upper share of any check, failed ones included (null shares, unmeasured checks, left out)."""
    shares = [c["headroom"]["upper_share"] for c in result.get("checks", []) if c["headroom"]["upper_share"] is not None]
    return max(shares) if shares else None


def plot(rows, path):
    """Plots the binding share per epoch; returns False when matplotlib is not installed."""
    try:
        import matplotlib
        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError:
        return False
    epochs = [r["epoch"] for r in rows if r["binding_share"] != ""]
    shares = [r["binding_share"] for r in rows if r["binding_share"] != ""]
    fig, ax = plt.subplots(figsize=(6, 3.5))
    ax.plot(epochs, shares, marker="o", label="binding check (upper bound / tolerance)")
    ax.axhline(1.0, color="grey", linestyle="--", label="tolerance")
    ax.set_xlabel("epoch")
    ax.set_ylabel("share of tolerance used")
    ax.legend()
    fig.tight_layout()
    fig.savefig(path)
    return True


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--gatetasks", default="gatetasks", help='how to start the gate, e.g. "gatetasks" or "dotnet path/gatetasks.dll"')
    parser.add_argument("--contract", required=True, help="the precision contract (YAML)")
    parser.add_argument("--samples", nargs="+", required=True, help="checkpoint samples, used in turn (stand-in for training)")
    parser.add_argument("--epochs", type=int, default=4)
    parser.add_argument("--out", default="gate-headroom", help="folder for the JSON results, headroom.csv and headroom.png")
    args = parser.parse_args()

    gatetasks = shlex.split(args.gatetasks)
    os.makedirs(args.out, exist_ok=True)
    rows = []
    for epoch in range(1, args.epochs + 1):
        sample = write_checkpoint_sample(epoch, args.samples)
        result, code = check(gatetasks, args.contract, sample, os.path.join(args.out, f"epoch-{epoch}.json"))
        b = binding(result)
        worst = worst_share(result)
        row = {
            "epoch": epoch,
            "outcome": result["outcome"],
            "failed": result["counts"]["failed"] if result.get("finished") else "",
            "binding_check": b[0] if b else "",
            "binding_share": b[1] if b else "",
            "binding_point_share": b[2] if b and b[2] is not None else "",
            "worst_share": worst if worst is not None else "",
        }
        rows.append(row)
        share = f'{row["binding_share"]:.3f}' if b else "-"
        print(f'epoch {epoch}: {row["outcome"]} (exit {code}); binding {row["binding_check"] or "-"} uses {share} of its tolerance')

    with open(os.path.join(args.out, "headroom.csv"), "w", newline="", encoding="utf-8") as f:
        writer = csv.DictWriter(f, fieldnames=list(rows[0]))
        writer.writeheader()
        writer.writerows(rows)
    print("wrote " + os.path.join(args.out, "headroom.csv"))
    if plot(rows, os.path.join(args.out, "headroom.png")):
        print("wrote " + os.path.join(args.out, "headroom.png"))
    else:
        print("matplotlib is not installed: no plot (apt-get install python3-matplotlib); the CSV holds the figures")


if __name__ == "__main__":
    main()
