#!/usr/bin/env python3
"""Builds the seed corpora of the fuzz targets (tests/fuzz/fuzz_*.cpp) from the samples, the
built-in rule packs and the string literals of the tests, one directory per target under
--out. Large files (the possessive model, verbs.data, names.txt) are cut down to small but
well-formed pieces so that the fuzzer's inputs stay small. Deterministic; safe to re-run."""
import argparse
import codecs
import gzip
import hashlib
import json
import os
import re
import shutil
import warnings

warnings.simplefilter("ignore", DeprecationWarning)  # the tests use C++ escapes Python lacks

FLAG_BYTES = [0, 1, 2, 3, 4, 5, 12, 13, 16, 19, 32, 36, 45, 64, 128, 192, 255]


def literals(paths, raw_only=False):
    """The string literals of C++ files: raw R"(...)" ones, and plain ones unless raw_only."""
    out = []
    for p in paths:
        src = open(p, encoding='utf-8').read()
        out += [m.encode() for m in re.findall(r'R"\((.*?)\)"', src, re.S)]
        if raw_only:
            continue
        for m in re.findall(r'"((?:[^"\\\n]|\\.)*)"', src):
            if len(m) < 6:
                continue
            try:
                out.append(codecs.escape_decode(m.encode())[0])
            except ValueError:
                pass
    return out


def chunks(lines, n):
    return [b''.join(lines[i:i + n]) for i in range(0, len(lines), n)]


def read(path):
    with open(path, 'rb') as f:
        return f.read()


def trim_sections(text, keep, headers):
    """Keeps the first `keep` lines of each counted section ("words 18469") and fixes its count."""
    lines = text.split(b'\n')
    out, i = [], 0
    pattern = re.compile(rb'^(%s) (\d+)$' % b'|'.join(headers))
    while i < len(lines):
        m = pattern.match(lines[i])
        if not m:
            out.append(lines[i])
            i += 1
            continue
        n = int(m.group(2))
        body = lines[i + 1:i + 1 + n][:keep]
        out.append(m.group(1) + b' ' + str(len(body)).encode())
        out += body
        i += 1 + n
    return b'\n'.join(out)


def container(files):
    return b''.join(b'%% ' + name.encode() + b'\n' + data for name, data in files)


def seeds(src):
    s = {t: [] for t in ('records', 'tokenize', 'pack', 'possessive_model', 'verbs_data',
                          'targets_data', 'noun_phrase_data', 'rewrite', 'audit_log',
                          'person_context')}
    samples = os.path.join(src, 'samples')
    rules = os.path.join(src, 'rules')
    tests = os.path.join(src, 'tests')
    jsonl = [read(os.path.join(samples, f)).splitlines(True) for f in ('helpdesk.jsonl', 'coro.jsonl')]
    texts = [read(os.path.join(samples, f)) for f in ('club-letters.txt', 'club-notes.txt')]
    corpus_tests = [os.path.join(tests, 'corpus', f) for f in sorted(os.listdir(os.path.join(tests, 'corpus')))
                    if f.endswith('.cpp')]
    json_literals = [l for l in literals(corpus_tests) if l.lstrip().startswith((b'{', b'['))]
    text_tests = [os.path.join(tests, d, f) for d in ('text', 'rewrite')
                  for f in sorted(os.listdir(os.path.join(tests, d))) if f.endswith('.cpp')]
    # Distinct test strings with a space in them (sentences rather than names), longest first,
    # at most 300: the short ctest runs must get through their seeds.
    sentences = sorted({l for l in literals(text_tests) if b' ' in l}, key=lambda l: (-len(l), l))[:300]

    # records: flag byte, size-limit byte, then a stream.
    streams = [c for lines in jsonl for c in chunks(lines[:40], 4)] + [b'\n'.join(json_literals)]
    streams += [t[:3000] for t in texts] + [b'\xef\xbb\xbf' + jsonl[0][0] + b'\r\n\n  \n' + jsonl[1][0]]
    for i, st in enumerate(streams):
        s['records'].append(bytes([FLAG_BYTES[i % len(FLAG_BYTES)], 255 if i % 3 else 60]) + st)
    s['records'] += [bytes([0, 255]) + l for l in json_literals]

    # tokenize: the texts of the samples' fields, the sample texts' paragraphs, test strings.
    for lines in jsonl:
        for line in lines[:60]:
            rec = json.loads(line)
            for m in rec.get('messages', []):
                s['tokenize'].append(m['content'].encode())
            if 'text' in rec:
                s['tokenize'].append(rec['text'].encode())
    for t in texts:
        s['tokenize'] += t.split(b'\n\n')[:30]
    s['tokenize'] += sentences
    s['tokenize'] += [read(os.path.join(rules, p, 'protect.txt')) for p in ('en-gender', 'es-gender')]

    # pack: the built-in packs' .txt files (names.txt cut to its first pairs), whole and alone.
    for pack in ('en-gender', 'es-gender'):
        d = os.path.join(rules, pack)
        files = []
        for f in sorted(os.listdir(d)):
            if not f.endswith('.txt'):
                continue
            data = read(os.path.join(d, f))
            if f == 'names.txt':
                head = data.split(b'[names]\n')
                data = b'[names]\n' + b''.join(head[1].splitlines(True)[:60])
            files.append((f, data))
        header = [x for x in files if x[0] == 'pack.txt']
        s['pack'].append(container(header + [x for x in files if x[0] != 'pack.txt']))
        for f in files:
            if f[0] != 'pack.txt':
                s['pack'].append(container(header + [f]))

    model = read(os.path.join(rules, 'en-gender', 'possessive.model'))
    for keep in (5, 60, 400):
        s['possessive_model'].append(trim_sections(model, keep, [b'words', b'possessed', b'features']))

    verbs = read(os.path.join(rules, 'en-gender', 'verbs.data')).splitlines(True)
    body = [l for l in verbs if not l.startswith(b'#')]
    for step in (1, 37, 211):
        s['verbs_data'].append(b''.join(body[:1] + body[1::step][:300]))
    s['verbs_data'].append(b''.join(verbs[:40] + body[:50]))

    # person_context: slices of person-context.data (format line, every n-th record), alone and
    # followed by "%%" and a sample paragraph or test sentence to judge.
    context = read(os.path.join(rules, 'en-gender', 'person-context.data')).splitlines(True)
    records = [l for l in context if not l.startswith(b'#')]
    paragraphs = [p for t in texts for p in t.split(b'\n\n')[:10]] + sentences[:40]
    for i, step in enumerate((97, 251, 1009)):
        part = b''.join(records[:1] + records[1::step])
        s['person_context'].append(part)
        s['person_context'] += [part + b'%%\n' + p for p in paragraphs[i::3]]
    s['person_context'].append(b''.join(context[:60] + records[1:200]))

    s['targets_data'].append(read(os.path.join(rules, 'en-gender', 'targets.data')))

    es = os.path.join(rules, 'es-gender')
    data_files = [(f, read(os.path.join(es, f))) for f in sorted(os.listdir(es)) if f.endswith('.data')]
    s['noun_phrase_data'].append(container(data_files))
    s['noun_phrase_data'] += [container([f]) for f in data_files]

    # rewrite: flag byte (pack, direction, format, framing, mode), then a corpus.
    for i, lines in enumerate(jsonl):
        for j, c in enumerate(chunks(lines[:48], 3)):
            s['rewrite'].append(bytes([(i * 2 + (j % 2)) | (16 if j % 3 == 0 else 0)]) + c)
    for t in texts:
        for j, para in enumerate(t.split(b'\n\n')[:20]):
            s['rewrite'].append(bytes([4 | 8 * (j % 2) | (j % 2)]) + para)
    s['rewrite'] += [bytes([4 | (i % 4)]) + l for i, l in enumerate(sentences) if b'\n' not in l]

    log = [l for l in literals([os.path.join(tests, 'review', 'audit_log_test.cpp')], True)]
    s['audit_log'].append(b'\n'.join(log) + b'\n')
    s['audit_log'] += [l + b'\n' for l in log]
    s['audit_log'].append(gzip.compress(b'\n'.join(log) + b'\n', mtime=0))
    return s


def main():
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument('--source', required=True, help='the repository')
    ap.add_argument('--out', required=True, help='directory to fill (one folder per target)')
    a = ap.parse_args()
    for target, items in seeds(a.source).items():
        d = os.path.join(a.out, target)
        shutil.rmtree(d, ignore_errors=True)
        os.makedirs(d)
        for data in items:
            with open(os.path.join(d, hashlib.sha1(data).hexdigest()), 'wb') as f:
                f.write(data)
        if not items:
            raise SystemExit('make_seeds: no seeds for ' + target)


if __name__ == '__main__':
    main()
