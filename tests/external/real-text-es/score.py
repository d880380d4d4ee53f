#!/usr/bin/env python3
"""Scores `evenhand run --pack es-gender` on the hand-labelled Spanish real-text set
(GUIDE.md), per half: records fully right (output equals `expected`, or the original text for
a `flag`) and edit precision (applied edits that, applied alone to the original, bring it
nearer to the expected text). The per-half scoring is ../real-text-neutral/score.py's
score_half and the loading, split rule and report are ../real-text/score.py's (imported, not
copied); only the engine command differs.

usage: score.py [--bin build/evenhand] [--check] [--dev]
With --check, exits 1 when a half is below its floor (FLOORS). With --dev (for tuning), prints
the development half only and its records not fully right.
"""
import importlib.util
import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[2]
sys.path.insert(0, str(HERE.parent / "real-text"))
import score as names_score  # noqa: E402  (load_jsonl, applied_edits, report_halves)

_spec = importlib.util.spec_from_file_location("neutral_score",
                                               HERE.parent / "real-text-neutral/score.py")
neutral_score = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(neutral_score)  # score_half

# Floors for --check, a few points below the first measured figures (engine of 2026-12-05, before
# any tuning for this set: dev 26.9% records (18/67) / 20.6% edits (22/107), held-out 30.6%
# (22/72) / 35.1% (46/131)), so that a change that makes Spanish rewriting of real text worse
# fails; one record is 1.5 (dev) and 1.4 (held-out) points, so the floors allow two more wrong
# records per half, not more. Raise them as the engine improves. The goal (held-out
# records >= 90%) is far from reached, and the floor is not the goal.
# Raised after the first Spanish rules (wife after a possessive, titles, pronouns of things,
# descriptors on attribution lines, tuned on the development half only): dev 55.2% (37/67) /
# 31.3% (21/67 edits), held-out 52.8% (38/72) / 53.6% (45/84), again two records below.
FLOORS = {"dev": {"records": 0.52, "edit_precision": 0.25},
          "held": {"records": 0.50, "edit_precision": 0.48}}


def run_engine(binary, work):
    out, log = work / "out.jsonl", work / "edits.jsonl"
    cmd = [str(binary), "run", "--pack", "es-gender", "--mode", "substitute", "--rate", "1",
           "--in", str(HERE / "records.jsonl"), "--field", "/text", "--out", str(out),
           "--edits", str(log), "--threads", "1", "--quiet"]
    subprocess.run(cmd, check=True)
    return names_score.load_jsonl(out), names_score.load_jsonl(log)


def main():
    neutral_score.score_set("real-text-es", HERE, FLOORS, run_engine)

if __name__ == "__main__":
    main()
