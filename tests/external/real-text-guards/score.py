#!/usr/bin/env python3
"""Scores the English pack's guards on the hand-labelled sex-specific set (GUIDE.md), per half.

usage: score.py [--bin build/evenhand] [--check] [--dev]

Runs evenhand as ../real-text/score.py does (its run_engine, imported, not copied) on
records.jsonl with an audit log; a record is guarded when the log has an `"action":
"guarded"` line for it (every guarded record gets one, with or without gendered words). Prints
for the development and the held-out half (split.txt):
- guard recall: `sex` records guarded / `sex` records;
- false-guard rate: `not` records guarded / `not` records (`unsure` left out of both), and the
  same over the random sample alone (`kind: sample`: ordinary records that mention people;
  the keyword candidates are hard negatives chosen for words near the topic).
With --check, exits 1 when a figure of either half is on the wrong side of its floor (FLOORS).
With --dev (for tuning), prints the development half only and lists its missed and falsely
guarded records, so that tuning never shows the held-out half.
Python standard library only.
"""
import importlib.util
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[2]


def load_module(name, path):
    spec = importlib.util.spec_from_file_location(name, path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


names_score = load_module("names_score", HERE.parent / "real-text" / "score.py")
names_extract = load_module("names_extract", HERE.parent / "real-text" / "extract.py")

# Floors checked by --check. Recall floors sit about three points below the figures of the
# WordNet vocabulary (README.md: dev 86.0%, held-out 75.4%; before it, 33.3% and 30.4%, so the
# test fails on the pack without guards-wordnet.txt); they are not issue 13's goal (90% on the
# held-out half), which this vocabulary does not reach. The false-guard ceilings over all `not`
# records sit about one point above the figures (dev 2.6%, held-out 1.2%: metaphors among the
# keyword candidates, "gave birth to", "pregnant silence"); over the random sample of ordinary
# records the ceiling is the goal itself, 1%.
FLOORS = {
    "dev": {"recall": 0.83, "false_rate": 0.04, "sample_false_rate": 0.01},
    "held": {"recall": 0.72, "false_rate": 0.025, "sample_false_rate": 0.01},
}


def score_half(half, records, labels, guarded, errors=None):
    sex = hit = nots = false = sample = sample_false = 0
    for rid, rec in records.items():
        label = labels[rid][0]
        if rec["half"] != half or label == "unsure":
            continue
        g = guarded.get(rid)
        if label == "sex":
            sex += 1
            hit += g is not None
            if errors is not None and g is None:
                errors.append(f"missed  {rid} ({labels[rid][1]}): {rec['text'][:160]!r}")
        else:
            nots += 1
            false += g is not None
            sample += rec["kind"] == "sample"
            sample_false += rec["kind"] == "sample" and g is not None
            if errors is not None and g is not None:
                errors.append(f"false   {rid} [{g}]: {rec['text'][:160]!r}")
    ratio = lambda n, d: n / d if d else 1.0
    return {"recall": ratio(hit, sex), "false_rate": ratio(false, nots),
            "sample_false_rate": ratio(sample_false, sample),
            "counts": f"{hit}/{sex} sex-specific guarded, {false}/{nots} others guarded, "
                      f"{sample_false}/{sample} of the random sample"}


def main():
    args = sys.argv[1:]
    binary = Path(args[args.index("--bin") + 1]) if "--bin" in args else ROOT / "build/evenhand"
    split = dict(l.split("\t") for l in (HERE / "split.txt").read_text().splitlines())
    records = {}
    for r in names_score.load_jsonl(HERE / "records.jsonl"):
        half = names_extract.half(r["id"])
        if split[r["id"]] != half:
            sys.exit(f"score.py: split.txt disagrees with the hash rule for {r['id']}")
        records[r["id"]] = {"text": r["text"], "half": half, "kind": r["kind"]}
    labels = {}
    for line in (HERE / "labels.tsv").read_text(encoding="utf-8").splitlines():
        rid, label, note = line.split("\t")
        if label not in ("sex", "not", "unsure"):
            sys.exit(f"score.py: labels.tsv: bad label {label!r} for {rid}")
        labels[rid] = (label, note)
    if list(labels) != list(records):
        sys.exit("score.py: labels.tsv does not label exactly the records of records.jsonl")
    ids = list(records)
    with tempfile.TemporaryDirectory() as tmp:
        _, log = names_score.run_engine(binary, Path(tmp), HERE / "records.jsonl")
    guarded = {ids[e["line"] - 1]: f"{e['guard']}: {e['phrase']}" for e in log
               if e.get("action") == "guarded"}
    print(f"real-text-guards: {len(records)} records, "
          f"{sum(l == 'sex' for l, _ in labels.values())} sex-specific")
    failed, errors = [], [] if "--dev" in args else None
    for half in ("dev",) if errors is not None else ("dev", "held"):
        s = score_half(half, records, labels, guarded, errors)
        print(f"{half:>4}: guard recall {s['recall']:.1%}  false guards {s['false_rate']:.1%}"
              f" (random sample {s['sample_false_rate']:.1%})  ({s['counts']})")
        if s["recall"] < FLOORS[half]["recall"]:
            failed.append(f"{half} recall {s['recall']:.3f} < {FLOORS[half]['recall']}")
        for key in ("false_rate", "sample_false_rate"):
            if s[key] > FLOORS[half][key]:
                failed.append(f"{half} {key} {s[key]:.3f} > {FLOORS[half][key]}")
    for line in errors or []:
        print(line)
    if "--check" in args and failed:
        print("score.py: " + "; ".join(failed), file=sys.stderr)
        sys.exit(1)


if __name__ == "__main__":
    main()
