#!/usr/bin/env bash
# Peak memory of `evenhand review --sample 20` and `evenhand report` against the length of the
# audit log: audit logs of the 1x corpus and of its first quarter (written once by `evenhand
# run --mode augment --pack en-gender --edits`), each reviewed and reported. Prints a table.
#
# Environment: BENCH_RUNS (default 3), BENCH_PACK (default en-gender), EVENHAND (binary),
# EVENHAND_BASELINE (optional: a second binary measured the same way, e.g. an older build),
# BENCH_QUIET_LOAD (as in passthrough.sh).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
BENCH_LOG="$WORK/review.log"
PACK="${BENCH_PACK:-en-gender}"
FIELDS=(--field /text --field '/messages/*/content')

start_bench corpus-1x.jsonl.zst
X="$DATA/corpus-1x.jsonl.zst"

# The corpora (the quarter: the 1x corpus's first quarter of lines) and their runs, made once.
Q="$WORK/corpus-q.jsonl.zst"
if [[ ! -s "$Q" || "$Q" -ot "$X" ]]; then
  lines=$(zstd -dc "$X" | wc -l)
  # head stops reading early: zstd -dc dies of SIGPIPE, which is expected here.
  (set +o pipefail; zstd -dc "$X" 2> /dev/null | head -n $((lines / 4)) | zstd -q -f -3 -o "$Q.tmp")
  mv "$Q.tmp" "$Q"
fi
declare -A corpus=([q]="$Q" [1x]="$X")
for k in q 1x; do
  log="$WORK/review-$k.edits.jsonl.zst"
  if [[ ! -s "$log" || "$log" -ot "${corpus[$k]}" ]]; then
    "$EVENHAND" run --mode augment --pack "$PACK" --in "${corpus[$k]}" \
      --out "$WORK/review-$k.out.jsonl.zst" "${FIELDS[@]}" --threads 2 \
      --manifest "$WORK/review-$k.manifest.json" --edits "$log" --quiet
  fi
done

load_start=$(load1)
echo "# review $(date -u +%FT%TZ) load=$load_start" >> "$BENCH_LOG"
bins=("$EVENHAND")
[[ -n "${EVENHAND_BASELINE:-}" ]] && bins+=("$EVENHAND_BASELINE")
declare -A rss=() wall=()
for ((r = 1; r <= RUNS; r++)); do
  for b in "${bins[@]}"; do
    for k in q 1x; do
      log="$WORK/review-$k.edits.jsonl.zst"
      timed "$b review $k run $r" "$b" review "$log" --sample 20 --seed 1 \
        --manifest "$WORK/review-$k.manifest.json" > "$WORK/review-$k.review.txt"
      rss[$b,review,$k]="${rss[$b,review,$k]:-} $T_RSS_MB"
      wall[$b,review,$k]="${wall[$b,review,$k]:-} $T_WALL"
      timed "$b report $k run $r" "$b" report --manifest "$WORK/review-$k.manifest.json" \
        --edits "$log" --out "$WORK/review-$k.report.html"
      rss[$b,report,$k]="${rss[$b,report,$k]:-} $T_RSS_MB"
      wall[$b,report,$k]="${wall[$b,report,$k]:-} $T_WALL"
    done
  done
done

records() { zstd -dc "$1" | wc -l; }
echo "Review memory, $(date -u "+%F %H:%M UTC"), $(machine_line), pack $PACK"
echo "$(binary_line)"
echo "Load average (1 min) at start: $load_start; $RUNS runs per cell; peak RSS is the largest"
echo "of the runs, wall the median."
echo
echo "| binary | log | corpus records | audit log lines | log MB | log MB (zstd) | review --sample 20 peak RSS MB | wall s | report peak RSS MB | wall s |"
echo "|---|---|---:|---:|---:|---:|---:|---:|---:|---:|"
for b in "${bins[@]}"; do
  for k in q 1x; do
    log="$WORK/review-$k.edits.jsonl.zst"
    # shellcheck disable=SC2086
    echo "| $(basename "$(dirname "$b")")/$(basename "$b") | $k | $(records "${corpus[$k]}") |" \
      "$(records "$log") | $(zstd -dc "$log" | wc -c | awk '{printf "%.1f", $1/1e6}') |" \
      "$(awk -v b="$(stat -c %s "$log")" 'BEGIN{printf "%.1f", b/1e6}') |" \
      "$(max ${rss[$b,review,$k]}) | $(median ${wall[$b,review,$k]}) |" \
      "$(max ${rss[$b,report,$k]}) | $(median ${wall[$b,report,$k]}) |"
  done
done
echo
echo "Load average (1 min) at end: $(load1). Target: peak RSS the same for both logs (memory"
echo "does not grow with the log)."
