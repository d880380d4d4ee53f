#!/usr/bin/env bash
# Cost of agreement: `evenhand run --mode augment --toward neutral` (pronouns to they/them,
# verbs made plural, a/an chosen again, neutral nouns) against the binary swap
# (`--mode augment` without --toward) on the same corpus and thread count. Target: neutral
# within 1.3x of the swap's wall time. Prints a Markdown table.
#
# Environment: BENCH_RUNS (default 3), BENCH_THREADS (default "1 2"), BENCH_INPUT (default
# corpus-1x.jsonl.zst), EVENHAND (binary), BENCH_QUIET_LOAD (as in passthrough.sh).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
BENCH_LOG="$WORK/neutral.log"
THREADS="${BENCH_THREADS:-1 2}"
INPUT="${BENCH_INPUT:-corpus-1x.jsonl.zst}"
FIELDS=(--field /text --field '/messages/*/content')

start_bench "$INPUT"
X="$DATA/$INPUT"
bytes=$(raw_bytes "$X")
warm "$X"
load_start=$(load1)
echo "# neutral $(date -u +%FT%TZ) load=$load_start" >> "$BENCH_LOG"

declare -A sw=() nw=() scpu=() ncpu=() nflag=()
for ((r = 1; r <= RUNS; r++)); do
  for t in $THREADS; do
    # Interleaved, so a change in load hits both sides alike.
    timed "swap threads $t run $r" "$EVENHAND" run --mode augment --pack en-gender \
      --in "$X" --out "$WORK/swap-t$t.jsonl.zst" "${FIELDS[@]}" --threads "$t"
    sw[$t]="${sw[$t]:-} $T_WALL"
    scpu[$t]="${scpu[$t]:-} $T_CPU"
    timed "neutral threads $t run $r" "$EVENHAND" run --mode augment --pack en-gender \
      --toward neutral --in "$X" --out "$WORK/neutral-t$t.jsonl.zst" "${FIELDS[@]}" \
      --threads "$t" --manifest "$WORK/neutral-t$t.manifest.json"
    nw[$t]="${nw[$t]:-} $T_WALL"
    ncpu[$t]="${ncpu[$t]:-} $T_CPU"
    nflag[$t]=$(jq -r '.records.flagged // "?"' "$WORK/neutral-t$t.manifest.json" 2> /dev/null || echo "?")
  done
done

echo "Neutral vs swap, $(date -u "+%F %H:%M UTC"), $(machine_line)"
echo "$(binary_line)"
echo "Input $INPUT, $(awk -v b="$bytes" 'BEGIN{printf "%.0f", b/1e6}') MB uncompressed; load" \
  "average (1 min) at start: $load_start; $RUNS interleaved runs per cell, median wall and CPU."
echo
echo "| threads | swap MB/s | neutral MB/s | neutral time / swap time | swap CPU s | neutral CPU s | records flagged (neutral) |"
echo "|---:|---:|---:|---:|---:|---:|---:|"
for t in $THREADS; do
  # shellcheck disable=SC2086
  s_wall=$(median ${sw[$t]})
  # shellcheck disable=SC2086
  n_wall=$(median ${nw[$t]})
  # shellcheck disable=SC2086
  echo "| $t | $(mbps "$bytes" "$s_wall") | $(mbps "$bytes" "$n_wall") | $(ratio "$n_wall" "$s_wall") |" \
    "$(median ${scpu[$t]}) | $(median ${ncpu[$t]}) | ${nflag[$t]} |"
done
echo
echo "load average (1 min) at end: $(load1)"
