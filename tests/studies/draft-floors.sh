#!/usr/bin/env bash
# On-demand study of `gatetasks draft`'s floors (docs/drafting.md, "What the reference can resolve"): per replica,
# numpy (Debian's /usr/bin/python3) writes a fresh trusted sample and a perfect surrogate ten times larger from one
# law (a 31-value multiplicity, a long-tailed pT, a normal η); the real program drafts a contract for 10^4 data events
# (where the rule's tolerances are below the reference's noise, so the floors bind), builds the reference and checks
# the surrogate. It counts replicas that pass every check, and replicas with a check waiting for "more reference
# events", with 95% Clopper–Pearson intervals (scipy.stats.beta).
#   tests/studies/draft-floors.sh [REPLICAS=40] [TRUSTED=100000] [SURROGATE=1000000]
set -euo pipefail
replicas=${1:-40}; trusted=${2:-100000}; surrogate=${3:-1000000}
root=$(cd "$(dirname "$0")/../.." && pwd)
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
dotnet build "$root/src/GateTasks.Cli/GateTasks.Cli.csproj" -c Release -nodeReuse:false --nologo -v q >/dev/null
gt="$root/src/GateTasks.Cli/bin/Release/net8.0/gatetasks"
cat > "$work/gen.py" <<'PY'
import sys, numpy as np
seed, n, path = int(sys.argv[1]), int(sys.argv[2]), sys.argv[3]
rng = np.random.default_rng(seed)
n_jets = np.minimum(rng.geometric(0.12, n) - 1, 30)
pt = (20.0 + rng.exponential(50.0, n)) * rng.normal(1.0, 0.1, n)
eta = rng.normal(0.0, 1.5, n)
np.savetxt(path, np.column_stack([n_jets, pt, eta]), fmt=["%d", "%.9g", "%.9g"], delimiter=",", header="n_jets,pt,eta", comments="")
PY
passed=0; limited=0
for ((r = 1; r <= replicas; r++)); do
  /usr/bin/python3 "$work/gen.py" $((2 * r)) "$trusted" "$work/trusted.csv"
  /usr/bin/python3 "$work/gen.py" $((2 * r + 1)) "$surrogate" "$work/surrogate.csv"
  (cd "$work" && "$gt" draft --from trusted.csv --data-events 10000 --sample-path surrogate.csv --reference-path ref.parquet -o c.yaml --force >/dev/null \
     && "$gt" reference build --contract c.yaml --from trusted.csv >/dev/null)
  if (cd "$work" && "$gt" check --contract c.yaml > out.txt 2>&1); then passed=$((passed + 1)); fi
  if grep -q "more reference events" "$work/out.txt"; then limited=$((limited + 1)); grep "more reference events" "$work/out.txt" | grep -v GATE; fi
  grep -E " (fail|inconclusive) " "$work/out.txt" | sed "s/^/  replica $r: /" || true
  echo "replica $r: passed so far $passed, reference-limited so far $limited"
done
/usr/bin/python3 - "$replicas" "$passed" "$limited" <<'PY'
import sys
from scipy.stats import beta
n, k, l = map(int, sys.argv[1:])
def cp(k, n):
    return (0.0 if k == 0 else beta.ppf(0.025, k, n - k + 1), 1.0 if k == n else beta.ppf(0.975, k + 1, n - k))
print(f"| replicas | passed every check | 95% CP | with a reference-limited check | 95% CP |\n|---:|---:|---|---:|---|")
print(f"| {n} | {k} | [{cp(k, n)[0]:.3f}, {cp(k, n)[1]:.3f}] | {l} | [{cp(l, n)[0]:.3f}, {cp(l, n)[1]:.3f}] |")
PY
