#!/usr/bin/env bash
# Runs every fuzz target (or those named) for a long time, one after the other, each on one
# core at the lowest priority (one process, no -jobs: the statistics stay in the log), and
# prints per target the executions reached, the wall time, executions per second, the corpus
# size and the peak RSS. Needs the fuzz preset built:
#   cmake --preset fuzz && cmake --build --preset fuzz && ctest --preset fuzz -R seeds
# Usage: tests/fuzz/run_long.sh [-t SECONDS_PER_TARGET] [TARGET...]   (default 3600 s)
# Corpora grow in build-fuzz/fuzz-corpus/TARGET; a finding is written there as
# TARGET-crash-* (commit it under tests/fuzz/regressions/TARGET/ once fixed).
set -euo pipefail
cd "$(dirname "$0")/../.."
seconds=3600
if [ "${1:-}" = "-t" ]; then seconds=$2; shift 2; fi
targets=("$@")
[ ${#targets[@]} -gt 0 ] || targets=(records tokenize pack possessive_model verbs_data targets_data
                                     noun_phrase_data rewrite audit_log person_context)
export ASAN_OPTIONS=detect_leaks=1:abort_on_error=1 UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1
b=build-fuzz
for t in "${targets[@]}"; do
  mkdir -p "$b/fuzz-corpus/$t"
  dirs=("$b/fuzz-corpus/$t" "$b/fuzz-seeds/$t")
  [ -d "tests/fuzz/regressions/$t" ] && dirs+=("tests/fuzz/regressions/$t")
  log="$b/fuzz-corpus/$t.log"
  status=0
  start=$(date +%s)
  nice -n 19 "$b/tests/fuzz/fuzz_$t" -max_total_time="$seconds" -timeout=30 \
    -rss_limit_mb=2048 -print_final_stats=1 -artifact_prefix="$b/fuzz-corpus/$t-" "${dirs[@]}" \
    >"$log" 2>&1 || status=$?
  wall=$(($(date +%s) - start))
  stat() { grep -o "stat::$1: *[0-9]*" "$log" | grep -o '[0-9]*$' | tail -1; }
  corpus=$(find "$b/fuzz-corpus/$t" -type f | wc -l)
  echo "$t: $(stat number_of_executed_units) executions in $wall s wall" \
    "($(stat average_exec_per_sec) exec/s), corpus $corpus files," \
    "peak RSS $(stat peak_rss_mb) MB, exit $status (log: $log)"
done
