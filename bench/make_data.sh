#!/usr/bin/env bash
# Builds the benchmark corpora in bench/data/ (git-ignored), skipping files already present:
#   corpus-1x.jsonl.zst  mixed-shape JSONL, >= 200 MB uncompressed (seed 1)
#   corpus-4x.jsonl.zst  four 1x-size corpora with seeds 1..4, concatenated (>= 800 MB)
# Both are compressed with `zstd -3 -T0`. Set BENCH_MB to change the 1x size (default 210).
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
data="$here/data"
mb="${BENCH_MB:-210}"
mkdir -p "$data"

for tool in python3 zstd; do
  command -v "$tool" >/dev/null || { echo "make_data.sh: '$tool' is missing" >&2; exit 1; }
done

gen() {  # gen SEED: one 1x-size corpus on stdout (seed 1 is reused from the 1x file)
  if [[ "$1" == 1 && -s "$data/corpus-1x.jsonl.zst" ]]; then
    zstd -dc "$data/corpus-1x.jsonl.zst"
  else
    python3 "$here/gen_corpus.py" --shape mixed --mb "$mb" --seed "$1"
  fi
}

make_one() {  # make_one NAME SEEDS...: writes data/NAME atomically unless it exists
  local name="$1"; shift
  local out="$data/$name"
  if [[ -s "$out" ]]; then
    echo "make_data.sh: $name already present, skipping"
    return
  fi
  local t0=$SECONDS
  { for seed in "$@"; do gen "$seed"; done; } | zstd -3 -T0 -q -c > "$out.tmp"
  mv "$out.tmp" "$out"
  echo "make_data.sh: wrote $name ($(du -h "$out" | cut -f1) compressed, $((SECONDS - t0)) s)"
}

make_one corpus-1x.jsonl.zst 1
make_one corpus-4x.jsonl.zst 1 2 3 4
for f in "$data"/corpus-1x.jsonl.zst "$data"/corpus-4x.jsonl.zst; do
  echo "$(basename "$f"): $(zstd -dc "$f" | wc -c) bytes uncompressed"
done
