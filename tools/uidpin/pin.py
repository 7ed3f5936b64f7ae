#!/usr/bin/python3
"""Print the UIDs of the built-in demo's feeds as a built heliocal writes them.

For every feed of the demo, `heliocal events --feed ID --from FROM --to TO
--format json` lists its entries; each month of each feed becomes one line:

    <feed> <month> <entries> <first date> <first uid> <digest>

where the entries are the distinct (date, uid) pairs of the month (a note a
feed writes once for two kinds is listed under each, with one uid), sorted,
and the digest is the first 16 hex digits of the SHA-256 of their lines
"<date> <uid>\\n". feed/demouids_test.go computes the same from the
catalogue and holds it to feed/testdata/demo-uids-cad5212.txt, which this
script wrote from a build of cad5212:

    git worktree add --detach /tmp/h-cad5212 cad5212
    (cd /tmp/h-cad5212 && go build -o /tmp/heliocal-cad5212 ./cmd/heliocal)
    /usr/bin/python3 tools/uidpin/pin.py --heliocal /tmp/heliocal-cad5212 \\
        > feed/testdata/demo-uids-cad5212.txt

Standard library only.
"""

import argparse
import hashlib
import json
import subprocess
import sys

FROM, TO = "2026-11-05", "2027-12-04"  # the demo's window on 5 December 2026


def run(heliocal, *args):
    return subprocess.run([heliocal, *args], check=True, capture_output=True, text=True).stdout


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--heliocal", required=True, help="the heliocal binary to read the UIDs from")
    ap.add_argument("--commit", default="cad5212", help="the commit it was built from, for the header")
    a = ap.parse_args()
    feeds = [f["id"] for f in json.loads(run(a.heliocal, "check", "--format", "json"))["feeds"]]
    out = sys.stdout
    out.write(f"# UIDs of the built-in demo's feeds as {a.commit} wrote them, {FROM}..{TO}\n")
    out.write("# (tools/uidpin/pin.py): feed, month, entries, first date and uid, digest\n")
    for fid in feeds:
        listing = run(a.heliocal, "events", "--feed", fid, "--from", FROM, "--to", TO, "--format", "json")
        pairs = set()
        for e in json.loads(listing)["entries"]:
            pairs.add((e["date"], e["uid"]))
        months = {}
        for d, u in sorted(pairs):
            months.setdefault(d[:7], []).append((d, u))
        for m, ps in months.items():
            h = hashlib.sha256("".join(f"{d} {u}\n" for d, u in ps).encode()).hexdigest()[:16]
            out.write(f"{fid} {m} {len(ps)} {ps[0][0]} {ps[0][1]} {h}\n")


if __name__ == "__main__":
    main()
