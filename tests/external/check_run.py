#!/usr/bin/env python3
"""Checks one evenhand run from the outside, with Python's json module as the reference
JSON parser (RFC 8259) and an RFC 6901 pointer resolver written here.

usage: check_run.py INPUT OUTPUT EDITS MODE [ROUNDTRIP_OUTPUT]

- every output line is valid UTF-8 and valid JSON;
- records that were not rewritten are byte-identical to their input lines;
- applying the audit log's edits (byte offsets in the decoded strings) to each input record
  gives exactly the counterfactual that was written;
- no edit touches a URL, e-mail address, @handle or `code` span (found here with regular
  expressions independent of evenhand's scanners);
- with ROUNDTRIP_OUTPUT (the result of rewriting OUTPUT's counterfactuals again with
  --mode substitute --rate 1): every record whose edits were all one-to-one (no "context"
  decision) comes back byte-identical.
Exits 1 with a message on the first failure.
"""
import json
import re
import sys

PROTECTED = [
    re.compile(r"(?:https?|ftp)://[^\s<>\"']+|www\.[^\s<>\"']+"),
    re.compile(r"[A-Za-z0-9._%+-]+@[A-Za-z0-9.-]+\.[A-Za-z]{2,}"),
    re.compile(r"(?<![A-Za-z0-9_.])@[A-Za-z0-9_]+"),
    re.compile(r"`[^`\n]+`"),
]


def fail(msg):
    print("check_run: " + msg, file=sys.stderr)
    sys.exit(1)


def pointer_tokens(p):
    if p == "":
        return []
    if not p.startswith("/"):
        fail("bad pointer " + p)
    return [t.replace("~1", "/").replace("~0", "~") for t in p[1:].split("/")]


def resolve(doc, p):
    cur = doc
    for t in pointer_tokens(p):
        cur = cur[int(t)] if isinstance(cur, list) else cur[t]
    return cur


def assign(doc, p, value):
    toks = pointer_tokens(p)
    cur = doc
    for t in toks[:-1]:
        cur = cur[int(t)] if isinstance(cur, list) else cur[t]
    last = toks[-1]
    if isinstance(cur, list):
        cur[int(last)] = value
    else:
        cur[last] = value


def lines_of(path):
    with open(path, "rb") as f:
        data = f.read()
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    out = data.split(b"\n")
    if out and out[-1] == b"":
        out.pop()
    return out


def main():
    inp, outp, editsp, mode = sys.argv[1:5]
    roundtrip = sys.argv[5] if len(sys.argv) > 5 else None
    inputs = [l for l in lines_of(inp)]
    outputs = lines_of(outp)
    audit = {}
    for raw in lines_of(editsp):
        a = json.loads(raw.decode("utf-8"))
        if a["action"] in ("added", "replaced"):
            audit[a["line"]] = a
    for i, o in enumerate(outputs):
        try:
            json.loads(o.decode("utf-8"))
        except (UnicodeDecodeError, json.JSONDecodeError) as e:
            fail(f"output line {i + 1} is not valid UTF-8 JSON: {e}")
    k = 0
    one_to_one = {}
    for n, raw in enumerate(inputs, start=1):
        if raw.strip() == b"":
            continue
        a = audit.get(n)
        if a is None or mode == "augment":
            if k >= len(outputs) or outputs[k].rstrip(b"\r") != raw.rstrip(b"\r"):
                fail(f"input line {n}: original not written byte-identical at output line {k + 1}")
            k += 1
        if a is None:
            continue
        doc = json.loads(raw.decode("utf-8"))
        by_field = {}
        for e in a["edits"]:
            by_field.setdefault(e["field"], []).append(e)
        for field, es in by_field.items():
            s = resolve(doc, field).encode("utf-8")
            for e in es:
                span = (e["at"], e["at"] + e["len"])
                if s[span[0]:span[1]].decode("utf-8") != e["from"]:
                    fail(f"input line {n}: edit 'from' {e['from']!r} not at byte {e['at']} of {field}")
                text = s.decode("utf-8")
                for rx in PROTECTED:
                    for m in rx.finditer(text):
                        b0 = len(text[: m.start()].encode("utf-8"))
                        b1 = len(text[: m.end()].encode("utf-8"))
                        if span[0] < b1 and b0 < span[1]:
                            fail(f"input line {n}: edit {e['from']!r} inside protected {m.group(0)!r}")
            for e in sorted(es, key=lambda e: e["at"], reverse=True):
                s = s[: e["at"]] + e["to"].encode("utf-8") + s[e["at"] + e["len"]:]
            assign(doc, field, s.decode("utf-8"))
        if k >= len(outputs):
            fail(f"input line {n}: counterfactual missing")
        got = json.loads(outputs[k].decode("utf-8"))
        if got != doc:
            fail(f"input line {n}: replaying the audit log does not give output line {k + 1}")
        # Context decisions and agreement fixes (which may correct the input, "a actor")
        # need not map back; lexicon and name edits must.
        one_to_one[k] = (n, all(e["why"] in ("lexicon", "name") for e in a["edits"]))
        k += 1
    if k != len(outputs):
        fail(f"{len(outputs) - k} output lines not accounted for")
    checked = 0
    if roundtrip:
        back = lines_of(roundtrip)
        if len(back) != len(outputs):
            fail("round-trip output has a different number of lines")
        for k, (n, clean) in one_to_one.items():
            if clean:
                checked += 1
                if back[k].rstrip(b"\r") != inputs[n - 1].rstrip(b"\r"):
                    fail(f"input line {n}: rewriting the counterfactual again does not give it back")
    print(f"check_run: ok: {len(outputs)} output lines, {len(audit)} rewritten, "
          f"{checked} round trips")


if __name__ == "__main__":
    main()
