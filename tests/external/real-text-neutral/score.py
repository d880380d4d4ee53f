#!/usr/bin/env python3
"""Scores `evenhand run --pack en-gender --toward neutral` on the hand-labelled real-text set
(GUIDE.md), per half: records fully right (output equals `expected`, or the original text for
a `flag`) and edit precision (applied edits that agree with the expected text at their place).
Shares the loading, the split rule and the edit comparison with ../real-text/score.py.

usage: score.py [--bin build/evenhand] [--check] [--dev]
With --check, exits 1 when a half is below its floor (FLOORS). With --dev (for tuning), prints
the development half only and its records not fully right.
"""
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "real-text"))
import extract as names_extract  # noqa: E402  (half: the split rule)
import score as names_score  # noqa: E402  (load_jsonl, applied_edits, expected_changes)

ROOT = HERE.parents[2]
# Floors for --check (README.md gives the figures they follow).
FLOORS = {"dev": {"records": 0.0, "edit_precision": 0.0},
          "held": {"records": 0.0, "edit_precision": 0.0}}


def run_engine(binary, work):
    out, log = work / "out.jsonl", work / "edits.jsonl"
    cmd = [str(binary), "run", "--pack", "en-gender", "--toward", "neutral", "--mode",
           "substitute", "--rate", "1", "--in", str(HERE / "records.jsonl"), "--field", "/text",
           "--out", str(out), "--edits", str(log), "--threads", "1", "--quiet"]
    subprocess.run(cmd, check=True)
    return names_score.load_jsonl(out), names_score.load_jsonl(log)


def score_half(half, records, outputs, edits, expected, errors):
    right = total = good = applied = 0
    for exp in expected:
        rid = exp["id"]
        if records[rid]["half"] != half:
            continue
        orig = records[rid]["text"]
        want = orig if "flag" in exp else exp["expected"]
        total += 1
        ok = outputs[rid] == want
        right += ok
        if errors is not None and not ok:
            errors.append(f"record {rid}:\n   got  {outputs[rid]!r}\n   want {want!r}")
        changes = names_score.expected_changes(orig, want)
        for at, length, to in edits.get(rid, []):
            applied += 1
            good += changes.get((at, at + length)) == to
    ratio = lambda n, d: n / d if d else 1.0
    return {"records": ratio(right, total), "edit_precision": ratio(good, applied),
            "counts": f"records {right}/{total}, edits {good}/{applied}"}


def main():
    args = sys.argv[1:]
    binary = Path(args[args.index("--bin") + 1]) if "--bin" in args else ROOT / "build/evenhand"
    split = dict(l.split("\t") for l in (HERE / "split.txt").read_text().splitlines())
    records = {}
    for r in names_score.load_jsonl(HERE / "records.jsonl"):
        if split[r["id"]] != names_extract.half(r["id"]):
            sys.exit(f"score.py: split.txt disagrees with the hash rule for {r['id']}")
        records[r["id"]] = {"text": r["text"], "half": split[r["id"]]}
    ids = list(records)
    expected = names_score.load_jsonl(HERE / "expected.jsonl")
    with tempfile.TemporaryDirectory() as tmp:
        out, log = run_engine(binary, Path(tmp))
    outputs = {rid: rec["text"] for rid, rec in zip(ids, out)}
    edits = names_score.applied_edits(log, ids)
    print(f"real-text-neutral: {len(records)} records, {len(expected)} expected")
    dev_only = "--dev" in args
    errors = [] if dev_only else None
    failed = []
    for half in ("dev",) if dev_only else ("dev", "held"):
        s = score_half(half, records, outputs, edits, expected, errors)
        print(f"{half:>4}: records fully right {s['records']:.1%}  edit precision "
              f"{s['edit_precision']:.1%}  ({s['counts']})")
        failed += [f"{half} {k} {s[k]:.3f} < {v}" for k, v in FLOORS[half].items() if s[k] < v]
    for line in errors or []:
        print(line)
    if "--check" in args and failed:
        print("score.py: below floor: " + "; ".join(failed), file=sys.stderr)
        sys.exit(1)


if __name__ == "__main__":
    main()
