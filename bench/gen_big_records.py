#!/usr/bin/env python3
"""Synthetic JSONL records of about 16 MB each, for the memory benchmark (record_memory.sh).

Two shapes, both full of short gendered phrases so that nearly every field is edited:
  fields  {"id": "big-N", "a": [{"t": "she said"}, {"t": "he ran"}, ...]}
          about a million short string fields, selected with --field '/a/*/t'
  string  {"id": "big-N", "text": "She said that he ran. Her cat ..."}
          one huge string field, selected with --field /text

Every record is just under --bytes (default 15,900,000, below the default --max-record-bytes
of 16 MiB). Output is deterministic (no randomness: the phrases are cycled). The data is
invented and meant only for measurements.
"""

import argparse
import sys

# Short phrases with gendered words (ordinary English words; invented sentences).
PHRASES = [
    "she said", "he ran", "his dog", "her cat", "a man", "my aunt", "the king", "she is",
    "him too", "a girl", "her son", "he was", "my wife", "his mom", "Mrs. Lee", "she ate",
]


def fields_record(n, limit, out):
    head = '{"id":"big-%d","a":[' % n
    parts = [head]
    size = len(head) + 2  # the closing "]}"
    i = 0
    while True:
        item = '{"t":"%s"}' % PHRASES[i % len(PHRASES)]
        extra = len(item) + (1 if i else 0)
        if size + extra > limit:
            break
        if i:
            parts.append(",")
        parts.append(item)
        size += extra
        i += 1
    parts.append("]}\n")
    out.write("".join(parts))
    return i


def string_record(n, limit, out):
    head = '{"id":"big-%d","text":"' % n
    parts = [head]
    size = len(head) + 2  # the closing "}
    i = 0
    while True:
        phrase = PHRASES[i % len(PHRASES)]
        word = (phrase[0].upper() + phrase[1:] + ". ") if i % 4 == 0 else (phrase + " ")
        if size + len(word) > limit:
            break
        parts.append(word)
        size += len(word)
        i += 1
    parts.append('"}\n')
    out.write("".join(parts))
    return i


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawTextHelpFormatter)
    ap.add_argument("--shape", choices=["fields", "string"], default="fields")
    ap.add_argument("--records", type=int, default=1)
    ap.add_argument("--bytes", type=int, default=15_900_000, help="upper bound per record")
    ap.add_argument("--out", default="-")
    a = ap.parse_args()
    out = sys.stdout if a.out == "-" else open(a.out, "w", encoding="utf-8", newline="")
    make = fields_record if a.shape == "fields" else string_record
    counts = [make(n, a.bytes, out) for n in range(a.records)]
    if out is not sys.stdout:
        out.close()
    unit = "fields" if a.shape == "fields" else "phrases"
    print("gen_big_records: %d records, %d %s each" % (a.records, counts[0] if counts else 0, unit),
          file=sys.stderr)


if __name__ == "__main__":
    main()
