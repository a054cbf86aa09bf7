#!/usr/bin/env bash
# Runs each libFuzzer target of fuzz/ for SECONDS (default 60) from its seed corpus: the demo
# models and scenarios for the XML readers (and fuzz/seeds/scenario/, inputs that once failed),
# fuzz/seeds/ for the report's CSV and JSON readers.
# Inputs it finds interesting go to BUILD/fuzz-corpus/<target>/, a crash, leak, sanitizer report,
# timeout (10 s an input) or memory blow-up (2 GB) to BUILD/fuzz-findings/ and fails the script.
# Usage: fuzz/run_fuzzers.sh BUILD [SECONDS]   (BUILD configured with -DUPRIGHT_FUZZ=ON)
set -euo pipefail
build=${1:?usage: fuzz/run_fuzzers.sh BUILD [SECONDS]}
seconds=${2:-60}
here="$(cd "$(dirname "$0")" && pwd)"
root="$(dirname "$here")"
findings="$build/fuzz-findings"
mkdir -p "$findings"

run() {
  local target=$1 dict=$2
  shift 2
  local corpus="$build/fuzz-corpus/$target"
  mkdir -p "$corpus"
  local options=(-max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 -max_len=65536
                 -artifact_prefix="$findings/$target-" -print_final_stats=1)
  [ -n "$dict" ] && options+=(-dict="$dict")
  echo "fuzz: $target for $seconds s"
  "$build/fuzz/$target" "${options[@]}" "$corpus" "$@" 2>"$build/fuzz-$target.log" || {
    echo "fuzz: $target found a failing input (see $build/fuzz-$target.log and $findings/)" >&2
    tail -40 "$build/fuzz-$target.log" >&2
    return 1
  }
  grep -E "^stat::number_of_executed_units|^stat::new_units_added" "$build/fuzz-$target.log" |
    sed "s/^/fuzz: $target /"
}

status=0
run upright_fuzz_model "$here/xml.dict" "$root/models" || status=1
run upright_fuzz_scenario "$here/xml.dict" "$root/scenarios" "$here/seeds/scenario" || status=1
run upright_fuzz_csv "" "$here/seeds/csv" || status=1
run upright_fuzz_manifest "" "$here/seeds/json" || status=1
exit $status
