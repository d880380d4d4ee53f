#!/usr/bin/env python3
"""Scores evenhand's English pack on the hand-labelled real-text set (GUIDE.md), per half.

usage: score.py [--bin build/evenhand] [--check] [--keep DIR] [--dev]

Runs `evenhand run --pack en-gender --mode substitute --rate 1` on records.jsonl with an
audit log, then prints for the development and the held-out half (split.txt):
- name-swap precision and recall against names.tsv (`unsure` left out): a listed name counts
  as swapped when an applied edit starts at its byte offset;
- records fully right: expected.jsonl records whose output equals the expected text (for a
  `flag`, the original text);
- edit precision: applied edits in expected.jsonl records that agree with the expected text
  at their place (same span, same replacement), over all applied edits in those records.
With --check, exits 1 when a figure of either half is below its floor (FLOORS below).
With --dev (for tuning), prints the development half only, and lists its wrong name swaps,
missed persons and records not fully right, so that tuning never shows the held-out half.
Python standard library only.
"""
import difflib
import hashlib
import json
import re
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[2]

# Floors checked by --check, per half. They sit about three points below the figures of the
# person-evidence engine (README.md, "After person evidence", second round: dev 96.3 / 98.5 /
# 94.5 / 94.8, held-out 88.4 / 95.2 / 89.2 / 94.1), so the test fails on a change that makes real-text
# behaviour worse; raise them as the engine improves. Recall keeps a wider margin (five points)
# on purpose: work on name precision may fairly give up a little recall, not more. They are not
# the goals of issue 12 (precision 98%, recall 90%, records 95%, edit precision 99% on the
# held-out half), which the engine of 2026-12-05 does not reach but for recall.
FLOORS = {
    "dev": {"precision": 0.93, "recall": 0.93, "records": 0.91, "edit_precision": 0.91},
    "held": {"precision": 0.85, "recall": 0.90, "records": 0.86, "edit_precision": 0.91},
}
TOKEN = re.compile(r"\w+|\W", re.UNICODE)


def load_jsonl(path):
    return [json.loads(line) for line in path.read_text(encoding="utf-8").splitlines() if line]


def run_engine(binary, work, records=HERE / "records.jsonl"):
    """Runs evenhand on a records file (../real-text-guards shares this); (output, audit log)."""
    out, log = work / "out.jsonl", work / "edits.jsonl"
    cmd = [str(binary), "run", "--pack", "en-gender", "--mode", "substitute", "--rate", "1",
           "--in", str(records), "--field", "/text", "--out", str(out),
           "--edits", str(log), "--threads", "1", "--quiet"]
    subprocess.run(cmd, check=True)
    return load_jsonl(out), load_jsonl(log)


def applied_edits(log, ids):
    """record id -> list of (at, len, to) of the edits written to the output."""
    edits = {}
    for entry in log:
        if entry.get("action") not in ("replaced", "added"):
            continue
        rid = ids[entry["line"] - 1]
        edits.setdefault(rid, []).extend((e["at"], e["len"], e["to"]) for e in entry["edits"])
    return edits


def expected_changes(orig, want):
    """{(byte start, byte end): replacement} that turn orig into want, word by word."""
    a, b = TOKEN.findall(orig), TOKEN.findall(want)
    starts, pos = [], 0
    for tok in a:
        starts.append(pos)
        pos += len(tok.encode("utf-8"))
    starts.append(pos)
    changes = {}
    for op, i1, i2, j1, j2 in difflib.SequenceMatcher(None, a, b, autojunk=False).get_opcodes():
        if op == "equal":
            continue
        if op == "replace" and i2 - i1 == j2 - j1:
            for k in range(i2 - i1):
                if a[i1 + k] != b[j1 + k]:
                    changes[(starts[i1 + k], starts[i1 + k + 1])] = b[j1 + k]
        else:
            changes[(starts[i1], starts[i2])] = "".join(b[j1:j2])
    return changes


def context(text, off, width=60):
    b = text.encode("utf-8")
    left = b[max(0, off - width):off].decode("utf-8", "replace")
    right = b[off:off + width].decode("utf-8", "replace")
    return (left + "[[" + right).replace("\n", " ")


def score_half(half, records, outputs, edits, names, expected, errors=None):
    tp = fp = persons = 0
    for rid, off, label in names:
        if records[rid]["half"] != half:
            continue
        swapped = any(at == off for at, _, _ in edits.get(rid, []))
        persons += label == "person"
        tp += swapped and label == "person"
        fp += swapped and label == "not_person"
        if errors is not None and swapped != (label == "person"):
            kind = "wrong swap" if swapped else "missed    "
            errors.append(f"{kind} {rid}: {context(records[rid]['text'], off)}")
    right = total = good_edits = all_edits = 0
    for exp in expected:
        rid = exp["id"]
        if records[rid]["half"] != half:
            continue
        orig = records[rid]["text"]
        want = orig if "flag" in exp else exp["expected"]
        total += 1
        ok = outputs[rid] in [want] + exp.get("alternatives", [])
        right += ok
        if errors is not None and not ok:
            errors.append(f"record     {rid}:\n   got  {outputs[rid]}\n   want {want}")
        changes = expected_changes(orig, want)
        for at, length, to in edits.get(rid, []):
            all_edits += 1
            good_edits += changes.get((at, at + length)) == to
    ratio = lambda n, d: n / d if d else 1.0
    return {"precision": ratio(tp, tp + fp), "recall": ratio(tp, persons),
            "records": ratio(right, total), "edit_precision": ratio(good_edits, all_edits),
            "counts": f"names: {tp} right swaps, {fp} wrong swaps, {persons} persons; "
                      f"records: {right}/{total}; edits: {good_edits}/{all_edits}"}


def report_halves(args, floors, score, describe):
    """Prints each half's figures (`describe(score(half, errors))`; with --dev the development
    half only, then its errors) and with --check exits 1 when a figure is below `floors`."""
    dev_only = "--dev" in args
    errors = [] if dev_only else None
    failed = []
    for half in ("dev",) if dev_only else ("dev", "held"):
        s = score(half, errors)
        print(f"{half:>4}: {describe(s)}")
        failed += [f"{half} {k} {s[k]:.3f} < {v}" for k, v in floors[half].items() if s[k] < v]
    for line in errors or []:
        print(line)
    if "--check" in args and failed:
        print("score.py: below floor: " + "; ".join(failed), file=sys.stderr)
        sys.exit(1)


def main():
    args = sys.argv[1:]
    binary = Path(args[args.index("--bin") + 1]) if "--bin" in args else ROOT / "build/evenhand"
    split = dict(line.split("\t") for line in (HERE / "split.txt").read_text().splitlines())
    records = {}
    for r in load_jsonl(HERE / "records.jsonl"):
        want = "dev" if hashlib.sha256(r["id"].encode()).hexdigest()[0] in "01234567" else "held"
        if split[r["id"]] != want:
            sys.exit(f"score.py: split.txt disagrees with the hash rule for {r['id']}")
        records[r["id"]] = {"text": r["text"], "half": want}
    ids = list(records)
    names, unsure = [], 0
    for line in (HERE / "names.tsv").read_text(encoding="utf-8").splitlines():
        if line.startswith("#"):
            continue
        rid, off, _, label, _ = line.split("\t")
        if label == "unsure":
            unsure += 1
        else:
            names.append((rid, int(off), label))
    found = [tuple(l.split("\t")[:2]) for l in (HERE / "names-found.tsv").read_text().splitlines()]
    labelled = [tuple(l.split("\t")[:2]) for l in (HERE / "names.tsv").read_text().splitlines()
                if not l.startswith("#")]
    if found != labelled:
        sys.exit("score.py: names.tsv does not label exactly the occurrences of names-found.tsv")
    expected = load_jsonl(HERE / "expected.jsonl")
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(args[args.index("--keep") + 1]) if "--keep" in args else Path(tmp)
        work.mkdir(parents=True, exist_ok=True)
        out, log = run_engine(binary, work)
    outputs = {rid: rec["text"] for rid, rec in zip(ids, out)}
    edits = applied_edits(log, ids)
    print(f"real-text: {len(records)} records, {len(names)} labelled names "
          f"({unsure} unsure left out), {len(expected)} expected records")
    report_halves(args, FLOORS, lambda half, errors: score_half(
        half, records, outputs, edits, names, expected, errors), lambda s: (
        f"name precision {s['precision']:.1%}  recall {s['recall']:.1%}  records fully right "
        f"{s['records']:.1%}  edit precision {s['edit_precision']:.1%}  ({s['counts']})"))


if __name__ == "__main__":
    main()
