#!/usr/bin/env python3
"""Pulls real Spanish fortunes with a gendered person word of the es-gender pack, or a
capitalised first-name-like pair of words, out of the installed Debian packages fortunes-es
and fortunes-es-off (whose files are rot13-encoded; decoded here), and writes records.jsonl (id, source, text) and split.txt for the
Spanish set (GUIDE.md). Deterministic: same packages, same output. Shares the split rule
with ../real-text/extract.py (imported, not copied).

usage: extract.py [--check]   (with --check, compares with the committed files, exit 1 on a
difference)

A fortune of at most MAX_BYTES bytes is a candidate when it holds a person word (a pronoun or
noun row of rules/es-gender/words.txt; determiners, possessives and quantifiers are left out
because they also agree with things) or two capitalised words in a row not at the start of a
line (a name: "-- Javier Marías"). In each file, fortunes with a person word are taken first,
in file order, up to the file's budget, then name-only fortunes up to their budget.
"""
import codecs
import re
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[2]
sys.path.insert(0, str(HERE.parent / "real-text"))
import extract as names_set  # noqa: E402  (half: the split rule)

FORTUNES = Path("/usr/share/games/fortunes")
MAX_BYTES = 200
# (package, file under /usr/share/games/fortunes, budget with a person word, name-only budget)
FILES = [("fortunes-es", "es/familia", 16, 1), ("fortunes-es", "es/sentimientos", 14, 1),
         ("fortunes-es", "es/humanos", 12, 1), ("fortunes-es", "es/vida", 10, 1),
         ("fortunes-es", "es/sabiduria", 8, 1), ("fortunes-es", "es/refranes", 28, 0),
         ("fortunes-es", "es/varios", 14, 1), ("fortunes-es-off", "off/es/off/proverbios", 22, 0),
         ("fortunes-es-off", "off/es/off/varios", 12, 0)]
NAME = re.compile(r"(?<![\n.!?¿¡]\s)(?<!^)(?<=\s)[A-ZÁÉÍÓÚÑ][a-záéíóúñü]+ [A-ZÁÉÍÓÚÑ][a-záéíóúñü]+")


def person_words():
    """Lower-case words of the pronoun and noun rows of the pack's words.txt."""
    words, skipping = set(), False
    for line in (ROOT / "rules/es-gender/words.txt").read_text(encoding="utf-8").splitlines():
        cols = [c.split("@")[0].strip() for c in line.split("|")]
        if len(cols) != 2 or line.startswith("#"):
            continue
        skipping = (skipping or cols[0] == "la") and cols[0] != "mujer"
        if not skipping:
            words |= {c for c in cols if c != "-" and " " not in c}
    return words


def candidates(words, package, fname):
    raw = (FORTUNES / (fname + ".fortunes")).read_text(encoding="utf-8", errors="replace")
    if fname.startswith("off/"):  # the offensive files are stored rot13-encoded, as fortune does
        raw = codecs.decode(raw, "rot13")
    for i, chunk in enumerate(raw.split("\n%\n")):
        text = re.sub(r"^(?:%\n)+", "", chunk.strip("\n"))  # a file may hold an empty fortune
        if not text or len(text.encode("utf-8")) > MAX_BYTES:
            continue
        person = any(w.lower() in words for w in re.findall(r"\w+", text))
        named = bool(NAME.search(text))
        if person or named:
            rid = f"{package}-{fname.rsplit('/', 1)[1]}-{i:04d}"
            yield rid, f"{package}:{fname.rsplit('/', 1)[1]}", text, person


def build():
    words, records = person_words(), []
    for package, fname, n_person, n_name in FILES:
        items = list(candidates(words, package, fname))
        keep = {x[0] for x in [x for x in items if x[3]][:n_person]
                + [x for x in items if not x[3]][:n_name]}
        records += [x[:3] for x in items if x[0] in keep]
    return names_set.set_files([{"id": r, "source": s, "text": t} for r, s, t in records])


def main():
    outputs = build()
    if not names_set.write_or_check(HERE, outputs):
        return
    print(f"extract.py: {outputs['records.jsonl'].count(chr(10))} records")


if __name__ == "__main__":
    main()
