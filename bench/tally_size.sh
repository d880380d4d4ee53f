#!/usr/bin/env bash
# How a tally (`evenhand tally`) grows with the corpus: tallies synthetic corpora of several
# sizes (gen_corpus.py, mixed shape, seed 1) and prefixes of the real-text records under
# tests/external, and prints a Markdown table: records, input MB, tally bytes, signatures.
# Sizes in MB: TALLY_MB (default "1 4 16 64"). Corpora are kept in bench/work/tally-size/.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/.." && pwd)"
bin="${EVENHAND:-$root/build/evenhand}"
work="${BENCH_WORK:-$here/work}/tally-size"
mkdir -p "$work"
[[ -x "$bin" ]] || { echo "tally_size.sh: $bin not found (build first)" >&2; exit 1; }

row() {  # row LABEL FILE FIELDS...: tallies FILE and prints one table row
  local label="$1" file="$2"; shift 2
  "$bin" tally -q --pack en-gender --in "$file" "$@" --out "$work/t.json"
  python3 - "$label" "$file" "$work/t.json" <<'PY'
import json, os, sys
label, corpus, tally = sys.argv[1:]
t = json.load(open(tally))
size = os.path.getsize(tally)
sigs = len(t["signatures"])
print(f"| {label} | {t['records']:,} | {os.path.getsize(corpus) / 1e6:.2f} | {size:,} | {sigs:,} | {size / max(sigs, 1):.0f} |")
PY
}

echo "| corpus | records | input MB | tally bytes | signatures | bytes per signature |"
echo "|---|---:|---:|---:|---:|---:|"
real="$root/tests/external/real-text/records.jsonl"
total=$(wc -l < "$real")
for n in 50 150 "$total"; do
  head -n "$n" "$real" > "$work/real-$n.jsonl"
  row "real-text, first $n records" "$work/real-$n.jsonl" --field /text
done
row "samples/helpdesk.jsonl" "$root/samples/helpdesk.jsonl" --field /text --field '/messages/*/content'
for mb in ${TALLY_MB:-1 4 16 64}; do
  f="$work/synthetic-$mb.jsonl"
  [[ -s "$f" ]] || python3 "$here/gen_corpus.py" --shape mixed --mb "$mb" --seed 1 --out "$f"
  row "synthetic, $mb MB" "$f" --field /text --field '/messages/*/content'
done
