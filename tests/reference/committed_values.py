"""Writes a reference script's numbers as JSON, or with --check compares them with the committed JSON.

Shared by the reference scripts in this folder: `flatten(doc)` yields (label, number) pairs in a fixed order;
with --check every number must equal the committed one to relative 1e-12 — one line per difference
("differs: …") and exit status 1 if there is any; without it the JSON is (re)written.
"""
import json
import os
import sys


def write_or_check(doc, out, flatten):
    if '--check' in sys.argv:
        with open(out) as f:
            old = json.load(f)
        a, b = list(flatten(doc)), list(flatten(old))
        if len(a) != len(b):
            print('differs: %d values now, %d committed' % (len(a), len(b)))
            sys.exit(1)
        bad = 0
        for (k, v), (_, u) in zip(a, b):
            if abs(v - u) > 1e-12 * max(1e-300, abs(u), abs(v)) and abs(v - u) > 1e-300:
                print('differs: %s now %r, committed %r' % (k, v, u))
                bad += 1
        sys.exit(1 if bad else 0)
    os.makedirs(os.path.dirname(out), exist_ok=True)
    with open(out, 'w') as f:
        json.dump(doc, f, indent=1)
        f.write('\n')
