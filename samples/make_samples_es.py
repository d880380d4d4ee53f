#!/usr/bin/env python3
"""Writes evenhand's Spanish demo corpus, coro.jsonl, into the folder that holds this script.

Everything is invented: the Coro Vecinal de Valdelince (a neighbourhood choir of a town that
does not exist), its singers and their families. The output is deterministic: one fixed seed,
no clock, no environment look-ups, so a re-run rewrites a byte-identical file.

    python3 samples/make_samples_es.py           # writes coro.jsonl and prints counts
    python3 samples/make_samples_es.py --check   # exits 1 if coro.jsonl is not what it writes
    python3 samples/make_samples_es.py --twins   # prints each record's text for the other
                                                 # gender, one a line (for tests)

Standard library only. Every sentence is written in correct agreement for the gender drawn,
so that a rewrite must keep it correct.
"""

import json
import os
import random
import sys

SEED = 20250311
HERE = os.path.dirname(os.path.abspath(__file__))
RECORDS = 120

# (female, male) person nouns, singular, with the article each takes.
KIN = [("hermana", "hermano"), ("madre", "padre"), ("abuela", "abuelo"), ("tía", "tío"),
       ("hija", "hijo"), ("prima", "primo"), ("vecina", "vecino"), ("nieta", "nieto"),
       ("cuñada", "cuñado"), ("nuera", "yerno"), ("suegra", "suegro")]
ROLES = [("directora", "director"), ("profesora", "profesor"), ("presidenta", "presidente"),
         ("secretaria", "secretario"), ("maestra", "maestro"), ("pianista", "pianista"),
         ("cantante", "cantante"), ("periodista", "periodista")]
# Adjectives known to the pack (adjectives.data), (feminine, masculine).
ADJ_AFTER = [("nueva", "nuevo"), ("alta", "alto"), ("simpática", "simpático"),
             ("trabajadora", "trabajador"), ("inglesa", "inglés"), ("famosa", "famoso"),
             ("amable", "amable"), ("inteligente", "inteligente"), ("mayor", "mayor")]
PRED = [("cansada", "cansado"), ("contenta", "contento"), ("nerviosa", "nervioso"),
        ("tranquila", "tranquilo"), ("emocionada", "emocionado"), ("orgullosa", "orgulloso"),
        ("ocupada", "ocupado"), ("feliz", "feliz"), ("optimista", "optimista")]
PIECES = ["el himno de las fiestas", "una canción de cuna", "el villancico nuevo",
          "la habanera del puerto", "un bolero antiguo", "la jota de la plaza"]
DAYS = ["lunes", "martes", "jueves", "sábado", "domingo"]
PLACES = ["la casa de la cultura", "la iglesia de San Roque", "el salón del ayuntamiento",
          "la plaza mayor", "el auditorio del colegio"]


def pick(rng, pair, g):
    return pair[0] if g == "f" else pair[1]


def art(g, plural=False):
    return ("las" if plural else "la") if g == "f" else ("los" if plural else "el")


def cap(s):
    return s[0].upper() + s[1:]


def record(rng, i):
    """The record's text for the gender drawn, and its twin: the same sentence about a person
    of the other gender, in correct agreement (what a counterfactual rewrite must give)."""
    g = rng.choice("fm")
    choice = (rng.choice(KIN), rng.choice(ROLES), rng.choice(ADJ_AFTER), rng.choice(PRED),
              rng.choice(DAYS), rng.choice(PLACES), rng.choice(PIECES))
    return render(i, g, choice), render(i, "m" if g == "f" else "f", choice)


def render(i, g, choice):
    kin_p, role_p, adj_p, pred_p, day, place, piece = choice
    kin, role, adj, pred = (pick(None, x, g) for x in (kin_p, role_p, adj_p, pred_p))
    pron = "ella" if g == "f" else "él"
    clitic = "la" if g == "f" else "lo"
    un = "una" if g == "f" else "un"
    dem = "esta" if g == "f" else "este"
    de = "de la" if g == "f" else "del"
    kind = i % 8
    if kind == 0:
        text = f"{cap(art(g))} {role} {adj} del coro está {pred} antes del concierto del {day}."
    elif kind == 1:
        text = (f"Mi {kin} canta en el coro desde hace años; el {day} {pron} estaba muy {pred} "
                f"en {place}.")
    elif kind == 2:
        text = f"Vi a mi {kin} y {clitic} saludé antes de cantar {piece}."
    elif kind == 3:
        text = f"{cap(dem)} {role} está {pred}: el {day} ensayamos {piece} en {place}."
    elif kind == 4:
        text = f"La partitura {de} {role} está en {place}; la casa del coro abre el {day}."
    elif kind == 5:
        text = f"{cap(un)} {kin} {adj} parecía {pred} después de escuchar {piece}."
    elif kind == 6:
        text = f"El ensayo del {day} es en {place}; traed agua y la carpeta para {piece}."
    else:
        same = "misma" if g == "f" else "mismo"
        text = f"{cap(pron)} {same} dirigió {piece}, y {art(g)} {role} quedó {pred}."
    return text


def build():
    """The corpus, and the expected counterfactual text of each record (the twin)."""
    rng = random.Random(SEED)
    lines, twins = [], []
    for i in range(RECORDS):
        text, twin = record(rng, i)
        lines.append(json.dumps({"id": f"coro-{i + 1:04d}", "text": text}, ensure_ascii=False))
        twins.append(twin)
    return "\n".join(lines) + "\n", twins


def main():
    path = os.path.join(HERE, "coro.jsonl")
    data, twins = build()
    if "--twins" in sys.argv[1:]:
        sys.stdout.write("".join(t + "\n" for t in twins))
        return 0
    if "--check" in sys.argv[1:]:
        with open(path, encoding="utf-8") as f:
            same = f.read() == data
        print("coro.jsonl is " + ("what the script writes" if same else "out of date"))
        return 0 if same else 1
    with open(path, "w", encoding="utf-8") as f:
        f.write(data)
    print(f"coro.jsonl: {RECORDS} records")
    return 0


if __name__ == "__main__":
    sys.exit(main())
