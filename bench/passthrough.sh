#!/usr/bin/env bash
# Pass-through throughput: `evenhand run --mode passthrough` (decompress, frame, validate the
# selected JSON fields, recompress at zstd -3) against the plain pipeline
# `zstd -dc X | zstd -3 -c > Y.zst` on the same file. Prints a Markdown table.
#
# Environment: BENCH_RUNS (default 3), BENCH_THREADS (default "1 2"), BENCH_INPUTS (default
# "1x 4x"), BENCH_VERIFY=0 to skip the byte-identity check of the output, EVENHAND (binary),
# BENCH_QUIET_LOAD=0.5 to wait (up to BENCH_WAIT seconds, default 300) for a quiet machine.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
BENCH_LOG="$WORK/passthrough.log"
THREADS="${BENCH_THREADS:-1 2}"
INPUTS="${BENCH_INPUTS:-1x 4x}"
VERIFY="${BENCH_VERIFY:-1}"

inputs=()
for in in $INPUTS; do inputs+=("corpus-$in.jsonl.zst"); done
start_bench "${inputs[@]}"

load_start=$(load1)
echo "# passthrough $(date -u +%FT%TZ) load=$load_start" >> "$BENCH_LOG"
echo "Pass-through, $(date -u "+%F %H:%M UTC"), $(machine_line)"
echo "$(binary_line)"
echo "Load average (1 min) at start: $load_start; runs per cell: $RUNS (median wall time and"
echo "median CPU time, user + system; peak RSS is the largest of the runs)."
echo
echo "| input | MB (uncompressed) | threads | evenhand MB/s | zstd MB/s | ratio | evenhand peak RSS MB | evenhand CPU s | zstd CPU s | output identical |"
echo "|---|---:|---:|---:|---:|---:|---:|---:|---:|---|"

for in in $INPUTS; do
  X="$DATA/corpus-$in.jsonl.zst"
  bytes=$(raw_bytes "$X")
  warm "$X"
  declare -A walls=() rsss=() cpus=()
  zwalls=()
  zcpus=()
  # Interleave the baseline and every thread count so load drift hits them alike.
  for ((r = 1; r <= RUNS; r++)); do
    timed "zstd $in run $r" bash -c 'zstd -dc -q "$1" | zstd -3 -q -c > "$2"' _ \
      "$X" "$WORK/zstd-$in.jsonl.zst"
    zwalls+=("$T_WALL")
    zcpus+=("$T_CPU")
    for t in $THREADS; do
      timed "evenhand passthrough $in threads $t run $r" "$EVENHAND" run --mode passthrough \
        --in "$X" --out "$WORK/pt-$in-t$t.jsonl.zst" --field /text --field '/messages/*/content' \
        --threads "$t"
      walls[$t]="${walls[$t]:-} $T_WALL"
      rsss[$t]="${rsss[$t]:-} $T_RSS_MB"
      cpus[$t]="${cpus[$t]:-} $T_CPU"
    done
  done
  zw=$(median "${zwalls[@]}")
  for t in $THREADS; do
    # shellcheck disable=SC2086
    ew=$(median ${walls[$t]})
    # shellcheck disable=SC2086
    rss=$(max ${rsss[$t]})
    # shellcheck disable=SC2086
    ecpu=$(median ${cpus[$t]})
    same="not checked"
    if [[ "$VERIFY" == 1 ]]; then
      if cmp -s <(zstd -dc -q "$X") <(zstd -dc -q "$WORK/pt-$in-t$t.jsonl.zst"); then
        same="yes"
      else
        same="NO"
      fi
    fi
    e_mbps=$(mbps "$bytes" "$ew")
    z_mbps=$(mbps "$bytes" "$zw")
    echo "| $in | $(awk -v b="$bytes" 'BEGIN{printf "%.0f", b/1e6}') | $t | $e_mbps | $z_mbps |" \
      "$(ratio "$e_mbps" "$z_mbps") | $rss | $ecpu | $(median "${zcpus[@]}") | $same |"
    echo "$in threads=$t evenhand_walls=[${walls[$t]# }] zstd_walls=[${zwalls[*]}] rss=[${rsss[$t]# }]" \
      >> "$BENCH_LOG"
  done
  unset walls rsss cpus
done
echo
echo "Load average (1 min) at end: $(load1). Targets: ratio >= 0.7 at 2 threads; peak RSS <= 128 MB"
echo "and flat from 1x to 4x."
