#!/usr/bin/env python3
"""Scores `evenhand run --pack en-gender --toward neutral` on the hand-labelled real-text set
(GUIDE.md), per half: records fully right (output equals `expected`, or the original text for
a `flag`) and edit precision: applied edits that, applied alone to the original, bring it
closer to the expected text (fewer differing words). The names set's test (same span, same
replacement) does not fit here: one edit may take several words ("he or she" -> "they") while
the word-by-word difference joins the pair with the verb after it.
Shares the loading, the split rule and the edit comparison with ../real-text/score.py.

usage: score.py [--bin build/evenhand] [--check] [--dev]
With --check, exits 1 when a half is below its floor (FLOORS). With --dev (for tuning), prints
the development half only and its records not fully right.
"""
import difflib
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "real-text"))
import extract as names_extract  # noqa: E402  (half: the split rule)
import score as names_score  # noqa: E402  (load_jsonl, applied_edits, TOKEN, report_halves)

ROOT = HERE.parents[2]
# Floors for --check, a few points below the figures after issue 13's neutral rules and the
# unpaired_person flag (README.md: dev 98.4% records / 98.3% edits, held-out 81.4% / 89.8%),
# so that a change that makes neutral rewriting of real text worse fails; with 62 and 43
# labelled records one record is 1.6 and 2.3 points, so the floors allow two (dev) and one
# (held-out) more wrong records, not more. The held-out floor went down from 0.83 when the
# flag came in: it writes two held-out records unchanged (flagged) that the labels rewrite.
# Raise them as the engine improves. The goal (held-out records >= 90%) is not
# reached, and the floor is not the goal.
FLOORS = {"dev": {"records": 0.95, "edit_precision": 0.95},
          "held": {"records": 0.79, "edit_precision": 0.87}}


def run_engine(binary, work):
    out, log = work / "out.jsonl", work / "edits.jsonl"
    cmd = [str(binary), "run", "--pack", "en-gender", "--toward", "neutral", "--mode",
           "substitute", "--rate", "1", "--in", str(HERE / "records.jsonl"), "--field", "/text",
           "--out", str(out), "--edits", str(log), "--threads", "1", "--quiet"]
    subprocess.run(cmd, check=True)
    return names_score.load_jsonl(out), names_score.load_jsonl(log)


def distance(a, b):
    """Words (and spaces, punctuation) that differ between texts a and b."""
    ta, tb = names_score.TOKEN.findall(a), names_score.TOKEN.findall(b)
    ops = difflib.SequenceMatcher(None, ta, tb, autojunk=False).get_opcodes()
    return sum(max(i2 - i1, j2 - j1) for op, i1, i2, j1, j2 in ops if op != "equal")


def helps(orig, want, at, length, to):
    """True when the edit (byte offset, byte length, replacement) alone brings orig nearer."""
    b = orig.encode("utf-8")
    edited = (b[:at] + to.encode("utf-8") + b[at + length:]).decode("utf-8")
    return distance(edited, want) < distance(orig, want)


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
        for at, length, to in edits.get(rid, []):
            applied += 1
            good += helps(orig, want, at, length, to)
    ratio = lambda n, d: n / d if d else 1.0
    return {"records": ratio(right, total), "edit_precision": ratio(good, applied),
            "counts": f"records {right}/{total}, edits {good}/{applied}"}


def score_set(label, here, floors, run_engine):
    """Runs `run_engine(binary, work)` on the set in folder `here` and reports both halves
    against `floors` (the command line's --bin, --check and --dev)."""
    args = sys.argv[1:]
    binary = Path(args[args.index("--bin") + 1]) if "--bin" in args else ROOT / "build/evenhand"
    split = dict(l.split("\t") for l in (here / "split.txt").read_text().splitlines())
    records = {}
    for r in names_score.load_jsonl(here / "records.jsonl"):
        if split[r["id"]] != names_extract.half(r["id"]):
            sys.exit(f"score.py: split.txt disagrees with the hash rule for {r['id']}")
        records[r["id"]] = {"text": r["text"], "half": split[r["id"]]}
    ids = list(records)
    expected = names_score.load_jsonl(here / "expected.jsonl")
    with tempfile.TemporaryDirectory() as tmp:
        out, log = run_engine(binary, Path(tmp))
    outputs = {rid: rec["text"] for rid, rec in zip(ids, out)}
    edits = names_score.applied_edits(log, ids)
    print(f"{label}: {len(records)} records, {len(expected)} expected")
    names_score.report_halves(
        args, floors,
        lambda half, errors: score_half(half, records, outputs, edits, expected, errors),
        lambda s: f"records fully right {s['records']:.1%}  edit precision "
                  f"{s['edit_precision']:.1%}  ({s['counts']})")


def main():
    score_set("real-text-neutral", HERE, FLOORS, run_engine)

if __name__ == "__main__":
    main()
