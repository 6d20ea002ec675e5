#!/usr/bin/env bash
# End-to-end benchmark of the gate against independent engines on the same data, on this machine.
#
#   tests/benchmarks/run.sh                # 10^7 events x 20 float32 features (a few minutes on two cores)
#   tests/benchmarks/run.sh --small        # 10^6 events
#   tests/benchmarks/run.sh --tiny         # 10^5 events, one repetition (what the test suite runs)
#
# Each repetition also times the check with a joint block added to the contract (docs/contract.md, joint structure),
# one variant at a time, each against a reference built with that block: all joint checks (Fréchet, kernel and the
# two sliced checks at the default 64 projections) over all 20 features, the same over 5 features, and each kind
# alone over 20 features; and with each further check kind (moments, quantiles, distances, far tails, categories,
# correlations) added alone, and with every kind and joint check at once. The report gives each variant's added time
# against the plain check of the same repetition, split into a fixed part (the same on the 1000-event sample) and a
# part that grows with the events. It also times `gatetasks rank` over 20 candidates of 10^6 events each (10^5 at
# --small, 3 of 10^4 at --tiny) in one process, and prints every performance target with its measured value.
#
# Options: --repeat N (timed repetitions, median reported; default 3, 1 for --tiny), --out FILE (also write the
# Markdown there), --work DIR (keep the data there instead of a temporary folder), --no-build (use the built
# assemblies named by GATETASKS_BENCH_CLI and GATETASKS_BENCH_HARNESS, default the Release builds),
# --skip-build-overhead (do not pack the MSBuild package and time no-op builds).
#
# Needs: the .NET SDK, node and npm (DuckDB's @duckdb/node-api is installed by this script into a cache folder,
# GATETASKS_BENCH_CACHE, default ~/.cache/gatetasks-bench), Debian's python3-numpy and python3-scipy
# (/usr/bin/python3), GNU time (/usr/bin/time) and taskset. Prints a Markdown report to stdout; exit 0 when every
# tool ran and all three computed the same histograms (a missed target is reported, not an error), 1 when a run
# failed or the histograms differ, 2 for bad options, 3 when a tool is missing.
set -euo pipefail

here=$(cd "$(dirname "$0")" && pwd)
root=$(cd "$here/../.." && pwd)
duckdb_version=1.5.6-r.1

mode=full repeat="" out="" work="" build=1 build_overhead=1
while [ $# -gt 0 ]; do
  case "$1" in
    --small) mode=small ;;
    --tiny) mode=tiny ;;
    --repeat) repeat=${2:?--repeat needs a number}; shift ;;
    --out) out=${2:?--out needs a file}; shift ;;
    --work) work=${2:?--work needs a folder}; shift ;;
    --no-build) build=0 ;;
    --skip-build-overhead) build_overhead=0 ;;
    -h|--help) sed -n '2,26p' "$0" | sed 's/^# \{0,1\}//'; exit 0 ;;
    *) echo "run.sh: unknown option '$1' (see --help)" >&2; exit 2 ;;
  esac
  shift
done
case "$mode" in
  full)  events=10000000 linear=1000000 row_groups=20 reference_events=1000000 candidates=20 ;;
  small) events=1000000  linear=100000  row_groups=10 reference_events=200000  candidates=20 ;;
  tiny)  events=100000   linear=10000   row_groups=10 reference_events=50000   candidates=3 ;;
esac
startup_events=1000
[ -n "$repeat" ] || { [ "$mode" = tiny ] && repeat=1 || repeat=3; }
case "$repeat" in ''|*[!0-9]*|0) echo "run.sh: --repeat needs a positive number" >&2; exit 2 ;; esac

say() { echo "run.sh: $*" >&2; }
need() { command -v "$1" >/dev/null 2>&1 || { say "needs $1 ($2)"; exit 3; }; }
need dotnet "the .NET SDK"
need node "apt-get install nodejs"
need npm "apt-get install npm"
need taskset "apt-get install util-linux"
[ -x /usr/bin/time ] || { say "needs GNU time at /usr/bin/time (apt-get install time)"; exit 3; }
python=/usr/bin/python3
"$python" -c 'import numpy, scipy' 2>/dev/null || { say "needs $python with numpy and scipy (apt-get install python3-numpy python3-scipy)"; exit 3; }

export DOTNET_CLI_TELEMETRY_OPTOUT=1 DOTNET_NOLOGO=1 MSBUILDDISABLENODEREUSE=1
# The CLI as the packages ship it: published, with its ReadyToRun code (a build's output has none) and the linux-x64
# native executable, which `dotnet gatetasks.dll` hands over to where it can run, as the installed tool does
# (GATETASKS_PORTABLE=1 times the portable tool instead).
cli=${GATETASKS_BENCH_CLI:-$root/src/GateTasks.Cli/bin/Release/net8.0/publish/gatetasks.dll}
harness=${GATETASKS_BENCH_HARNESS:-$root/tests/GateTasks.Benchmarks/bin/Release/net10.0/GateTasks.Benchmarks.dll}
if [ "$build" = 1 ]; then
  say "publishing the CLI and building the benchmark harness (Release)"
  dotnet publish "$root/src/GateTasks.Cli/GateTasks.Cli.csproj" -c Release -p:UseAppHost=false --nologo -v:q -nodeReuse:false >&2
  dotnet build "$root/tests/GateTasks.Benchmarks/GateTasks.Benchmarks.csproj" -c Release --nologo -v:q -nodeReuse:false >&2
fi
for f in "$cli" "$harness"; do [ -f "$f" ] || { say "$f not found (build it, or drop --no-build)"; exit 3; }; done

# DuckDB for Node, from the npm registry, once per version; installed beside and then moved, so an interrupted
# install never leaves a half folder behind.
cache=${GATETASKS_BENCH_CACHE:-${XDG_CACHE_HOME:-${HOME:-/tmp}/.cache}/gatetasks-bench}
modules=$cache/duckdb-node-api-$duckdb_version
if [ ! -f "$modules/node_modules/@duckdb/node-api/package.json" ]; then
  say "installing @duckdb/node-api@$duckdb_version into $modules"
  mkdir -p "$cache"
  staging=$(mktemp -d "$cache/.install-XXXXXX")
  npm install --prefix "$staging" --no-audit --no-fund --loglevel=error "@duckdb/node-api@$duckdb_version" >&2
  mv -T "$staging" "$modules" 2>/dev/null || rm -rf "$staging"
fi

if [ -z "$work" ]; then
  work=$(mktemp -d "${TMPDIR:-/tmp}/gatetasks-bench-XXXXXX")
  trap 'rm -rf "$work"' EXIT
fi
mkdir -p "$work/times" "$work/out" "$work/logs"
work=$(cd "$work" && pwd)
harness_run() { dotnet "$harness" "$@"; }

say "generating $events + $linear + $startup_events sample events and $reference_events reference events in $work"
harness_run generate --out "$work/sample.parquet" --events "$events" --row-groups "$row_groups" --seed 1
harness_run generate --out "$work/sample-linear.parquet" --events "$linear" --row-groups "$row_groups" --seed 3
harness_run generate --out "$work/sample-startup.parquet" --events "$startup_events" --row-groups 1 --seed 4
harness_run generate --out "$work/fullsim.parquet" --events "$reference_events" --row-groups 4 --seed 2
harness_run contract --out "$work/precision-contract.yaml" --sample sample.parquet --reference reference.parquet
dotnet "$cli" reference build --contract "$work/precision-contract.yaml" --from "$work/fullsim.parquet" >"$work/logs/reference.out"
# The joint variants: NAME FEATURES KEYS (the keys' lines of the joint block, separated by ';').
joint_all="x00, x01, x02, x03, x04, x05, x06, x07, x08, x09, x10, x11, x12, x13, x14, x15, x16, x17, x18, x19"
joint_sliced="sliced-ks-max: { worst: 0.03, mean: 0.01 };sliced-wasserstein-max: { worst: 0.08, mean: 0.03 }"
joint_variants=(
  "all20|$joint_all|frechet-max: 0.02;kernel-distance-max: 0.005;$joint_sliced"
  "all5|x00, x01, x02, x03, x04|frechet-max: 0.02;kernel-distance-max: 0.005;$joint_sliced"
  "frechet20|$joint_all|frechet-max: 0.02"
  "kernel20|$joint_all|kernel-distance-max: 0.005"
  "sliced20|$joint_all|$joint_sliced"
)
joint_names=()
for variant in "${joint_variants[@]}"; do
  IFS='|' read -r name features keys <<<"$variant"
  joint_names+=("$name")
  contract=$work/contract-joint-$name.yaml
  sed "s|^reference: reference.parquet\$|reference: reference-joint-$name.parquet|" "$work/precision-contract.yaml" >"$contract"
  grep -q "^reference: reference-joint-$name.parquet\$" "$contract" || { say "the harness contract has no 'reference: reference.parquet' line"; exit 1; }
  { echo "joint:"; echo "  features: [$features]"; tr ';' '\n' <<<"$keys" | sed 's/^/  /'; } >>"$contract"
  dotnet "$cli" reference build --contract "$contract" --from "$work/fullsim.parquet" >"$work/logs/reference-joint-$name.out"
done
printf '%s\n' "${joint_variants[@]}" >"$work/joint-variants.txt"
# The check kinds beyond the plain contract's (the harness's BenchmarkContract.Kinds), one variant per kind, each with
# its own reference, and one with every kind and every joint check over 20 features: nothing slow hides outside the clock.
kinds=(moments quantiles distances far-tails categories correlations)
for kind in "${kinds[@]}" every; do
  list=$kind
  [ "$kind" = every ] && list=$(IFS=,; echo "${kinds[*]}")
  contract=$work/contract-kind-$kind.yaml
  harness_run contract --out "$contract" --sample sample.parquet --reference "reference-kind-$kind.parquet" --kinds "$list"
  if [ "$kind" = every ]; then
    { echo "joint:"; echo "  features: [$joint_all]"; tr ';' '\n' <<<"frechet-max: 0.02;kernel-distance-max: 0.005;$joint_sliced" | sed 's/^/  /'; } >>"$contract"
  fi
  dotnet "$cli" reference build --contract "$contract" --from "$work/fullsim.parquet" >"$work/logs/reference-kind-$kind.out"
done
printf '%s\n' "${kinds[@]}" every >"$work/kind-variants.txt"
# rank: candidates of the linear sample's size (10^6 events at full size), one file each, checked in one process.
mkdir -p "$work/candidates"
for c in $(seq 1 "$candidates"); do
  harness_run generate --out "$work/candidates/epoch-$(printf %02d "$c").parquet" --events "$linear" --row-groups "$row_groups" --seed $((100 + c))
done
harness_run export-reference --reference "$work/reference.parquet" --out "$work/reference.json"
harness_run export-npy --sample "$work/sample.parquet" --out "$work/sample.npy"

# Pinning: both cores for the normal runs, core 0 alone for the one-core runs (when the machine has two).
cores=$(nproc)
if [ "$cores" -ge 2 ]; then two=(taskset -c 0,1) one=(taskset -c 0); else two=() one=(taskset -c 0); fi

# timed NAME COMMAND…: runs the command under GNU time (wall, user, sys seconds and peak RSS in KB) into times/NAME.
# A check may exit 1 or 5 (a failed or undecided check is still a finished run); anything else stops the benchmark.
timed() {
  local name=$1 status=0
  shift
  /usr/bin/time -f '%e %U %S %M' -o "$work/times/$name" "$@" >"$work/logs/$name.out" 2>"$work/logs/$name.err" || status=$?
  if [ "$status" -ne 0 ] && ! { { [ "$status" -eq 1 ] || [ "$status" -eq 5 ]; } && [[ $name == check-* || $name == rank* ]]; }; then
    say "$name exited $status:"
    tail -n 20 "$work/logs/$name.err" >&2
    exit 1
  fi
}
check() { dotnet "$cli" check --contract "$work/precision-contract.yaml" "$@"; }
duckdb() { node "$here/duckdb-histograms.cjs" "$modules" "$work/sample.parquet" "$work/reference.json" "$@"; }

say "warming the page cache and each tool once"
cat "$work"/*.parquet "$work/sample.npy" >/dev/null
check --sample "$work/sample-linear.parquet" >/dev/null 2>&1 || true
duckdb 2 "$work/out/warm.json" >/dev/null

for i in $(seq 1 "$repeat"); do
  say "timed repetition $i of $repeat"
  timed "check-full.$i" "${two[@]}" dotnet "$cli" check --contract "$work/precision-contract.yaml"
  for name in "${joint_names[@]}"; do
    timed "check-joint-$name.$i" "${two[@]}" dotnet "$cli" check --contract "$work/contract-joint-$name.yaml"
    timed "check-joint-$name-startup.$i" "${two[@]}" dotnet "$cli" check --contract "$work/contract-joint-$name.yaml" --sample "$work/sample-startup.parquet"
  done
  for kind in "${kinds[@]}" every; do
    timed "check-kind-$kind.$i" "${two[@]}" dotnet "$cli" check --contract "$work/contract-kind-$kind.yaml"
    timed "check-kind-$kind-startup.$i" "${two[@]}" dotnet "$cli" check --contract "$work/contract-kind-$kind.yaml" --sample "$work/sample-startup.parquet"
  done
  timed "rank.$i" "${two[@]}" dotnet "$cli" rank "$work/candidates/epoch-*.parquet" --contract "$work/precision-contract.yaml"
  timed "check-one-core.$i" "${one[@]}" dotnet "$cli" check --contract "$work/precision-contract.yaml"
  timed "check-linear.$i" "${two[@]}" dotnet "$cli" check --contract "$work/precision-contract.yaml" --sample "$work/sample-linear.parquet"
  timed "check-startup.$i" "${two[@]}" dotnet "$cli" check --contract "$work/precision-contract.yaml" --sample "$work/sample-startup.parquet"
  timed "fill.$i" "${two[@]}" dotnet "$harness" fill --reference "$work/reference.parquet" --sample "$work/sample.parquet" --out "$work/out/fill.$i.json"
  timed "duckdb-2.$i" "${two[@]}" node "$here/duckdb-histograms.cjs" "$modules" "$work/sample.parquet" "$work/reference.json" 2 "$work/out/duckdb-2.$i.json"
  timed "duckdb-1.$i" "${one[@]}" node "$here/duckdb-histograms.cjs" "$modules" "$work/sample.parquet" "$work/reference.json" 1 "$work/out/duckdb-1.$i.json"
  timed "numpy.$i" "${two[@]}" "$python" "$here/numpy-check.py" "$work/sample.npy" "$work/reference.json" "$work/out/numpy.$i.json"
done
cp "$work/logs/check-full.1.out" "$work/out/check-full.txt"

# The fan-out's steps, for the cost model (docs/performance.md): each candidate filled as one shard into a partial
# file, the partials merged into one, and the check decided from it. Once, outside the repetitions.
say "filling $candidates shards, merging their partials and checking from them"
mkdir -p "$work/partials"
for c in $(seq 1 "$candidates"); do
  name=$(printf %02d "$c")
  timed "shard-fill.$name" "${two[@]}" dotnet "$cli" fill --contract "$work/precision-contract.yaml" \
    --sample "$work/candidates/epoch-$name.parquet" --output "$work/partials/epoch-$name.partial"
done
timed "shard-merge.1" "${two[@]}" dotnet "$cli" merge --contract "$work/precision-contract.yaml" \
  --output "$work/merged.partial" "$work/partials/*.partial"
timed "check-partials.1" "${two[@]}" dotnet "$cli" check --contract "$work/precision-contract.yaml" --partials "$work/merged.partial"
stat -c %s "$work"/partials/*.partial | sort -n | tail -n 1 >"$work/partial-bytes"

if [ "$build_overhead" = 1 ]; then
  say "packing the MSBuild package into a local feed and timing no-op builds"
  msb=$work/msbuild
  # Afresh each run: a kept --work folder would otherwise restore the package this fixed version had last time.
  rm -rf "$msb"
  mkdir -p "$msb/sources" "$msb/with" "$msb/without"
  # Packed from a copy, so the repository's own build outputs stay as they are.
  (cd "$root" && tar --exclude=bin --exclude=obj -cf - Directory.Build.props Directory.Build.targets Directory.Packages.props global.json nuget.config README.md docs/precision-contract.schema.json src) \
    | tar -xf - -C "$msb/sources"
  dotnet pack "$msb/sources/src/GateTasks.MSBuild" -c Release -o "$msb/feed" -p:Version=0.0.1-bench -nodeReuse:false --disable-build-servers -v:q --nologo >"$work/logs/pack.out" 2>&1 \
    || { say "packing failed:"; tail -n 20 "$work/logs/pack.out" >&2; exit 1; }
  export NUGET_PACKAGES=$msb/packages
  for side in with without; do
    cat >"$msb/$side/nuget.config" <<EOF
<?xml version="1.0" encoding="utf-8"?>
<configuration>
  <packageSources>
    <clear />
    <add key="bench" value="$msb/feed" />
    <add key="nuget.org" value="https://api.nuget.org/v3/index.json" protocolVersion="3" />
  </packageSources>
</configuration>
EOF
    reference=""
    # Verdicts are not what is measured here: a failed check of the small sample only warns.
    [ "$side" = with ] && reference='  <PropertyGroup>
    <GateFailuresAsWarnings>true</GateFailuresAsWarnings>
  </PropertyGroup>
  <ItemGroup>
    <PackageReference Include="GateTasks" Version="0.0.1-bench" PrivateAssets="all" />
  </ItemGroup>
'
    cat >"$msb/$side/Bench.csproj" <<EOF
<Project Sdk="Microsoft.NET.Sdk">
  <PropertyGroup>
    <TargetFramework>net10.0</TargetFramework>
    <Nullable>enable</Nullable>
  </PropertyGroup>
$reference</Project>
EOF
    echo 'namespace Bench; public static class Answer { public static int Value => 42; }' >"$msb/$side/Answer.cs"
  done
  # The gate skips a no-op build only after a passing check, so it checks a sample large enough to pass.
  cp "$work/sample-linear.parquet" "$msb/with/sample.parquet"
  cp "$work/reference.parquet" "$msb/with/reference.parquet"
  harness_run contract --out "$msb/with/precision-contract.yaml" --sample sample.parquet --reference reference.parquet
  # With the benchmark's tolerances 10^6 events leave some checks undecided (the reference limits them), and the gate
  # reruns after any outcome but a pass: looser tolerances let this check pass, so the no-op builds can skip it.
  sed -i -e 's/ratio-max: { core: 0.03, tails: 0.10 }/ratio-max: { core: 0.10, tails: 0.30 }/' -e 's/ks-max: 0.01$/ks-max: 0.02/' "$msb/with/precision-contract.yaml"
  grep -q 'ratio-max: { core: 0.10, tails: 0.30 }' "$msb/with/precision-contract.yaml" && grep -q 'ks-max: 0.02$' "$msb/with/precision-contract.yaml" \
    || { say "the harness contract's tolerances are not the ones this script loosens"; exit 1; }
  build() { (cd "$msb/$1" && dotnet build Bench.csproj -nodeReuse:false --disable-build-servers -v:q --nologo >"$work/logs/build-$1.out" 2>&1) \
    || { say "dotnet build of the $1 project failed:"; tail -n 20 "$work/logs/build-$1.out" >&2; exit 1; }; }
  # First build (restore, compile, and the gate's check), then one untimed no-op build each.
  for side in with without; do build "$side"; build "$side"; done
  junit=$msb/with/gate-reports/precision-contract.junit.xml
  [ -f "$junit" ] || { say "the build with the package wrote no gate report ($junit)"; exit 1; }
  before=$(stat -c %Y.%s "$junit")
  for i in $(seq 1 $((repeat < 5 ? 5 : repeat))); do
    for side in with without; do
      start=$(date +%s.%N)
      build "$side"
      end=$(date +%s.%N)
      echo "$start $end" | awk '{ printf "%.3f\n", $2 - $1 }' >"$work/times/build-$side.$i"
    done
  done
  [ "$(stat -c %Y.%s "$junit")" = "$before" ] && echo skipped >"$work/times/build-gate" || echo reran >"$work/times/build-gate"
fi

cat >"$work/meta.json" <<EOF
{"mode": "$mode", "events": $events, "linear_events": $linear, "startup_events": $startup_events,
 "reference_events": $reference_events, "row_groups": $row_groups, "repeat": $repeat, "cores": $cores, "candidates": $candidates,
 "duckdb_package": "@duckdb/node-api $duckdb_version", "node": "$(node --version)", "dotnet": "$(dotnet --version)",
 "sample_bytes": $(stat -c %s "$work/sample.parquet"), "build_overhead": $build_overhead, "elapsed_seconds": $SECONDS}
EOF
"$python" "$here/summarize.py" "$work" ${out:+"$out"}
