#!/usr/bin/env bash
# Peak memory of `evenhand run --mode augment --pack en-gender` on records of about 16 MB
# (bench/gen_big_records.py): one record with about a million short selected fields
# ("fields", --field '/a/*/t') and one record with one huge string ("string", --field /text),
# 1 and 8 records per input, at several thread counts, with the audit log written (--edits).
# Prints a Markdown table of peak RSS against --max-record-bytes.
#
# Environment: BENCH_THREADS (default "1 2 8"), BENCH_RECORDS (default "1 8"), BENCH_SHAPES
# (default "fields string"), BENCH_RUNS (default 1), BENCH_MAX_RECORD (default 16M, passed as
# --max-record-bytes), BENCH_EDITS (default 1: write --edits; 0: no audit log), EVENHAND,
# BENCH_QUIET_LOAD (as in passthrough.sh).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
BENCH_LOG="$WORK/record_memory.log"
THREADS="${BENCH_THREADS:-1 2 8}"
RECORDS="${BENCH_RECORDS:-1 8}"
SHAPES="${BENCH_SHAPES:-fields string}"
RUNS="${BENCH_RUNS:-1}"
MAX_RECORD="${BENCH_MAX_RECORD:-16M}"
EDITS="${BENCH_EDITS:-1}"

start_bench
mkdir -p "$DATA"
# max_bytes SIZE: --max-record-bytes as bytes (K, M, G are powers of 1024, as evenhand reads them).
max_bytes() {
  awk -v s="$1" 'BEGIN { u = substr(s, length(s)); n = s + 0
    if (u == "K") n *= 1024; else if (u == "M") n *= 1048576; else if (u == "G") n *= 1073741824
    printf "%d", n }'
}
max_b=$(max_bytes "$MAX_RECORD")
max_mb=$(awk -v b="$max_b" 'BEGIN { printf "%.1f", b / 1048576 }')

# input SHAPE N: bench/data/big-SHAPE-N.jsonl, made once.
input() {
  local f="$DATA/big-$1-$2.jsonl"
  if [[ ! -s "$f" ]]; then
    python3 "$BENCH_DIR/gen_big_records.py" --shape "$1" --records "$2" --out "$f.tmp" 2>/dev/null
    mv "$f.tmp" "$f"
  fi
  echo "$f"
}
field_of() { [[ "$1" == fields ]] && echo '/a/*/t' || echo /text; }

load_start=$(load1)
echo "# record_memory $(date -u +%FT%TZ) load=$load_start" >> "$BENCH_LOG"
echo "Record memory, $(date -u "+%F %H:%M UTC"), $(machine_line), pack en-gender"
echo "$(binary_line)"
echo "--max-record-bytes $MAX_RECORD ($max_mb MB); audit log: $([[ $EDITS == 1 ]] && echo yes || echo no);" \
  "load average (1 min) at start: $load_start; peak RSS is the largest of $RUNS run(s)."
echo
echo "| shape | records | threads | record MB | peak RSS MB | RSS / max-record-bytes | RSS / (max-record-bytes x threads) | wall s |"
echo "|---|---:|---:|---:|---:|---:|---:|---:|"
for shape in $SHAPES; do
  for n in $RECORDS; do
    in=$(input "$shape" "$n")
    rec_mb=$(awk -v b="$(head -n 1 "$in" | wc -c)" 'BEGIN { printf "%.1f", b / 1048576 }')
    warm "$in"
    for t in $THREADS; do
      rss=()
      walls=()
      for ((r = 1; r <= RUNS; r++)); do
        extra=()
        [[ "$EDITS" == 1 ]] && extra=(--edits "$WORK/big-$shape-$n-t$t.edits.jsonl")
        timed "augment $shape records $n threads $t run $r" "$EVENHAND" run --mode augment \
          --pack en-gender --in "$in" --out "$WORK/big-$shape-$n-t$t.jsonl" \
          --field "$(field_of "$shape")" --threads "$t" --max-record-bytes "$MAX_RECORD" \
          "${extra[@]}"
        rss+=("$T_RSS_MB")
        walls+=("$T_WALL")
      done
      peak=$(max "${rss[@]}")
      echo "| $shape | $n | $t | $rec_mb | $peak | $(ratio "$peak" "$max_mb") |" \
        "$(awk -v p="$peak" -v m="$max_mb" -v t="$t" 'BEGIN { printf "%.2f", p / (m * t) }') |" \
        "$(median "${walls[@]}") |"
    done
  done
done
echo
echo "Load average (1 min) at end: $(load1)."
