#!/usr/bin/env python3
"""The straightforward gender-swap script a user would write without evenhand.

Reads JSONL (a .zst input is decompressed by the `zstd` command through a pipe), swaps
about a hundred gendered word pairs in "text" and in every "messages[*].content" with one
compiled alternation regex and a case-preserving replacement function, and writes each
record followed by its swapped copy when anything changed (a .zst output is compressed by
`zstd -3` through a pipe). It is the baseline for bench/augment.sh: no grammar, no
ambiguity handling ("her" always becomes "his"), one word at a time.

Usage: naive_swap.py IN.jsonl[.zst] OUT.jsonl[.zst]
"""

import json
import re
import subprocess
import sys

# (female, male) pairs; common practice word list written for this benchmark.
PAIRS = [
    ("she", "he"), ("her", "his"), ("her", "him"), ("hers", "his"), ("herself", "himself"),
    ("woman", "man"), ("women", "men"), ("girl", "boy"), ("girls", "boys"),
    ("lady", "gentleman"), ("ladies", "gentlemen"), ("mother", "father"),
    ("mothers", "fathers"), ("mom", "dad"), ("moms", "dads"), ("mum", "dad"),
    ("sister", "brother"), ("sisters", "brothers"), ("daughter", "son"),
    ("daughters", "sons"), ("aunt", "uncle"), ("aunts", "uncles"), ("niece", "nephew"),
    ("nieces", "nephews"), ("grandmother", "grandfather"), ("grandmothers", "grandfathers"),
    ("grandma", "grandpa"), ("granddaughter", "grandson"), ("granddaughters", "grandsons"),
    ("wife", "husband"), ("wives", "husbands"), ("girlfriend", "boyfriend"),
    ("girlfriends", "boyfriends"), ("bride", "groom"), ("brides", "grooms"),
    ("queen", "king"), ("queens", "kings"), ("princess", "prince"), ("princesses", "princes"),
    ("actress", "actor"), ("actresses", "actors"), ("waitress", "waiter"),
    ("waitresses", "waiters"), ("heroine", "hero"), ("heroines", "heroes"),
    ("businesswoman", "businessman"), ("businesswomen", "businessmen"),
    ("chairwoman", "chairman"), ("policewoman", "policeman"), ("spokeswoman", "spokesman"),
    ("stepmother", "stepfather"), ("stepdaughter", "stepson"), ("mrs", "mr"), ("ms", "mr"),
    ("madam", "sir"), ("duchess", "duke"), ("empress", "emperor"), ("miss", "master"),
    ("female", "male"), ("females", "males"), ("feminine", "masculine"),
    ("sorority", "fraternity"), ("nun", "monk"), ("nuns", "monks"), ("goddess", "god"),
    ("hostess", "host"), ("widow", "widower"), ("fiancee", "fiance"),
    ("mary", "john"), ("patricia", "robert"), ("jennifer", "michael"), ("linda", "william"),
    ("elizabeth", "david"), ("barbara", "richard"), ("susan", "joseph"),
    ("jessica", "thomas"), ("sarah", "charles"), ("karen", "christopher"),
    ("nancy", "daniel"), ("lisa", "matthew"), ("betty", "anthony"), ("margaret", "mark"),
    ("sandra", "donald"), ("ashley", "steven"), ("kimberly", "paul"), ("emily", "andrew"),
    ("donna", "joshua"), ("michelle", "kenneth"), ("carol", "kevin"), ("amanda", "brian"),
    ("melissa", "george"), ("deborah", "timothy"), ("stephanie", "ronald"),
    ("rebecca", "jason"), ("laura", "edward"), ("helen", "jeffrey"), ("emma", "alexander"),
    ("grace", "peter"), ("alice", "arthur"),
]

SWAP = {}
for female, male in PAIRS:
    SWAP.setdefault(female, male)
    SWAP.setdefault(male, female)

PATTERN = re.compile(r"\b(" + "|".join(sorted(SWAP, key=len, reverse=True)) + r")\b",
                     re.IGNORECASE)


def replace(match):
    word = match.group(0)
    new = SWAP[word.lower()]
    if word.isupper() and len(word) > 1:
        return new.upper()
    if word[0].isupper():
        return new[0].upper() + new[1:]
    return new


def swap_text(text):
    return PATTERN.sub(replace, text)


def swap_record(rec):
    """Returns the swapped copy of rec, or None when nothing changed."""
    changed = False
    new = dict(rec)
    text = rec.get("text")
    if isinstance(text, str):
        swapped = swap_text(text)
        if swapped != text:
            new["text"] = swapped
            changed = True
    messages = rec.get("messages")
    if isinstance(messages, list):
        new_messages = []
        for m in messages:
            if isinstance(m, dict) and isinstance(m.get("content"), str):
                swapped = swap_text(m["content"])
                if swapped != m["content"]:
                    m = dict(m, content=swapped)
                    changed = True
            new_messages.append(m)
        new["messages"] = new_messages
    return new if changed else None


def main(argv):
    if len(argv) != 3:
        print(__doc__.strip().splitlines()[-1], file=sys.stderr)
        return 2
    src, dst = argv[1], argv[2]
    reader = None
    if src.endswith(".zst"):
        reader = subprocess.Popen(["zstd", "-dc", src], stdout=subprocess.PIPE, bufsize=1 << 20)
        inp = reader.stdout
    else:
        inp = open(src, "rb")
    out_file = open(dst, "wb")
    writer = None
    if dst.endswith(".zst"):
        writer = subprocess.Popen(["zstd", "-3", "-q", "-c"], stdin=subprocess.PIPE,
                                  stdout=out_file, bufsize=1 << 20)
        out = writer.stdin
    else:
        out = out_file
    records = copies = 0
    for line in inp:
        if not line.strip():
            continue
        rec = json.loads(line)
        records += 1
        out.write(line if line.endswith(b"\n") else line + b"\n")
        new = swap_record(rec)
        if new is not None:
            copies += 1
            out.write(json.dumps(new, ensure_ascii=False).encode("utf-8") + b"\n")
    out.close()
    rc = 0
    if writer is not None:
        rc |= writer.wait()
    if reader is not None:
        rc |= reader.wait()
    out_file.close()
    print(f"naive_swap: {records} records, {copies} swapped copies", file=sys.stderr)
    return 1 if rc else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
