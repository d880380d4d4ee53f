#!/usr/bin/env bash
# Augmentation throughput on the 1x corpus: `evenhand run --mode augment --pack en-gender`
# against bench/naive_swap.py (Python re + json, one regex over ~100 word pairs), and against
# evenhand's own pass-through on the same file and thread count. Prints a Markdown table.
#
# Environment: BENCH_RUNS (default 3), BENCH_THREADS (default "1 2"), BENCH_PACK (default
# en-gender), BENCH_NAIVE_RUNS (default BENCH_RUNS), EVENHAND (binary), BENCH_QUIET_LOAD (as
# in passthrough.sh).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
BENCH_LOG="$WORK/augment.log"
THREADS="${BENCH_THREADS:-1 2}"
PACK="${BENCH_PACK:-en-gender}"
NAIVE_RUNS="${BENCH_NAIVE_RUNS:-$RUNS}"
FIELDS=(--field /text --field '/messages/*/content')

start_bench corpus-1x.jsonl.zst
X="$DATA/corpus-1x.jsonl.zst"
if ! "$EVENHAND" check --pack "$PACK" > "$WORK/check.out" 2>&1 &&
  ! "$EVENHAND" check "$PACK" > "$WORK/check.out" 2>&1; then
  cat "$WORK/check.out" >&2
  die "the pack '$PACK' does not load yet (evenhand check failed; see above)"
fi

bytes=$(raw_bytes "$X")
warm "$X"
load_start=$(load1)
echo "# augment $(date -u +%FT%TZ) load=$load_start" >> "$BENCH_LOG"

declare -A aw=() pw=() arss=() acopies=() acpu=()
nw=()
ncpu=()
ncopies=""
for ((r = 1; r <= RUNS || r <= NAIVE_RUNS; r++)); do
  if ((r <= NAIVE_RUNS)); then
    timed "naive_swap run $r" python3 "$BENCH_DIR/naive_swap.py" "$X" "$WORK/naive-1x.jsonl.zst"
    nw+=("$T_WALL")
    ncpu+=("$T_CPU")
    ncopies=$(sed -n 's/^naive_swap: .*, \([0-9]*\) swapped copies$/\1/p' "$WORK/last.stderr")
  fi
  ((r <= RUNS)) || continue
  for t in $THREADS; do
    timed "evenhand augment threads $t run $r" "$EVENHAND" run --mode augment --pack "$PACK" \
      --in "$X" --out "$WORK/aug-1x-t$t.jsonl.zst" "${FIELDS[@]}" --threads "$t"
    aw[$t]="${aw[$t]:-} $T_WALL"
    arss[$t]="${arss[$t]:-} $T_RSS_MB"
    acpu[$t]="${acpu[$t]:-} $T_CPU"
    acopies[$t]=$(sed -n 's/^evenhand: .*(\([0-9]*\) counterfactual).*/\1/p' "$WORK/last.stderr")
    timed "evenhand passthrough threads $t run $r" "$EVENHAND" run --mode passthrough \
      --in "$X" --out "$WORK/pt-1x-t$t.jsonl.zst" "${FIELDS[@]}" --threads "$t"
    pw[$t]="${pw[$t]:-} $T_WALL"
  done
done

n_mbps=$(mbps "$bytes" "$(median "${nw[@]}")")
echo "Augment, $(date -u "+%F %H:%M UTC"), $(machine_line), pack $PACK"
echo "$(binary_line)"
echo "Input corpus-1x.jsonl.zst, $(awk -v b="$bytes" 'BEGIN{printf "%.0f", b/1e6}') MB uncompressed."
echo "Load average (1 min) at start: $load_start; runs per cell: $RUNS evenhand, $NAIVE_RUNS"
echo "naive_swap.py (median wall time and median CPU time, user + system; peak RSS is the largest"
echo "of the runs)."
echo
echo "naive_swap.py (1 thread): $n_mbps MB/s, CPU $(median "${ncpu[@]}") s (python3 and both zstd"
echo "processes), ${ncopies:-?} swapped copies."
echo
echo "| threads | evenhand augment MB/s | pass-through MB/s | augment / pass-through | augment / naive_swap.py | augment peak RSS MB | augment CPU s | counterfactual copies |"
echo "|---:|---:|---:|---:|---:|---:|---:|---:|"
for t in $THREADS; do
  # shellcheck disable=SC2086
  a_mbps=$(mbps "$bytes" "$(median ${aw[$t]})")
  # shellcheck disable=SC2086
  p_mbps=$(mbps "$bytes" "$(median ${pw[$t]})")
  # shellcheck disable=SC2086
  echo "| $t | $a_mbps | $p_mbps | $(ratio "$a_mbps" "$p_mbps") | $(ratio "$a_mbps" "$n_mbps") |" \
    "$(max ${arss[$t]}) | $(median ${acpu[$t]}) | ${acopies[$t]:-?} |"
  echo "threads=$t augment_walls=[${aw[$t]# }] passthrough_walls=[${pw[$t]# }] naive_walls=[${nw[*]}]" \
    >> "$BENCH_LOG"
done
echo
echo "Load average (1 min) at end: $(load1). Targets: augment >= 30x naive_swap.py; augment >= 0.5x"
echo "pass-through."
