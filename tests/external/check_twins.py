#!/usr/bin/env python3
"""Checks an augment run over samples/coro.jsonl against the corpus's own twins: every record
with a mention must be followed by its counterfactual, and that counterfactual's text must be
the sentence make_samples_es.py wrote for the other gender (correct by construction). Records
without a mention must be written once, unchanged. Prints a summary; exits 1 on any mismatch.

    check_twins.py INPUT.jsonl OUTPUT.jsonl TWINS.txt

Source of the JSON reading: Python 3 standard library json (RFC 8259).
"""
import json
import sys


def main():
    inp, out, twins_path = sys.argv[1:4]
    records = [json.loads(l) for l in open(inp, encoding="utf-8")]
    written = [json.loads(l) for l in open(out, encoding="utf-8")]
    twins = [l.rstrip("\n") for l in open(twins_path, encoding="utf-8")]
    assert len(twins) == len(records), "one twin per record"
    pos = bad = paired = 0
    for rec, twin in zip(records, twins):
        if pos >= len(written) or written[pos] != rec:
            print(f"{rec['id']}: original not written as read")
            return 1
        pos += 1
        if twin == rec["text"]:
            continue  # no mention: written once
        if pos >= len(written) or written[pos].get("id") != rec["id"]:
            print(f"{rec['id']}: no counterfactual after the original")
            bad += 1
            continue
        got = written[pos]["text"]
        pos += 1
        paired += 1
        if got != twin:
            print(f"{rec['id']}: got      {got}\n{' ' * len(rec['id'])}  expected {twin}")
            bad += 1
    if pos != len(written):
        print(f"{len(written) - pos} extra output lines")
        return 1
    print(f"check_twins: {paired} counterfactuals, {bad} wrong")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
