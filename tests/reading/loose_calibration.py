"""Measure the loose reading of names: what it adds on real and generated text.

Run as a script (it is not a test):

    .venv/bin/python tests/reading/loose_calibration.py [--cutoffs 80 85 90] [--show 85]

For each cut-off it runs the matcher with the loose reading off and on over the
TCGA development reports (read in place from ``../shared/data/tcga``, never
copied; the test split is never read), the demo reports and generated reports,
and counts the mentions that only the loose reading makes.  ``--show`` lists
those mentions (written -> concept, with the note) for one cut-off, to be
judged by eye.  The last line is a JSON summary.
"""

from __future__ import annotations

import argparse
import csv
import json
import sys
import time
from collections.abc import Sequence
from pathlib import Path

from pathsieve.abbreviations import AbbreviationDictionary
from pathsieve.matcher import LOOSE_CUTOFF, ConceptMatcher
from pathsieve.ontology import load_ontology

ROOT = Path(__file__).resolve().parents[2]
TCGA_DEV = ROOT.parent / "shared" / "data" / "tcga" / "reports_dev.csv"
DEMO = ROOT / "examples" / "demo_reports.csv"

# (case id, scheme or None, text)
Row = tuple[str, str | None, str]


def _read(path: Path) -> list[Row]:
    csv.field_size_limit(sys.maxsize)
    with path.open(newline="", encoding="utf-8") as f:
        return [(r["case_id"], r.get("scheme") or None, r["text"]) for r in csv.DictReader(f)]


def _generated(n: int) -> list[Row]:
    sys.path.insert(0, str(ROOT / "benchmarks"))
    import corpus  # the benchmarks' generator of invented reports

    return [(r.case_id, None, r.text) for r in corpus.generate(n, seed=0, organ="mixed")]


def added(rows: Sequence[Row], cutoff: float) -> tuple[list[tuple[str, str, str, str]], float]:
    """Mentions only the loose reading makes: (case, written, concept label, note), seconds."""
    onto = load_ontology()
    abbreviations = AbbreviationDictionary.load()
    pairs: dict[str | None, tuple[ConceptMatcher, ConceptMatcher]] = {}
    out: list[tuple[str, str, str, str]] = []
    spent = 0.0
    for case, scheme, text in rows:
        if scheme not in pairs:
            pairs[scheme] = (
                ConceptMatcher(onto, abbreviations, scheme_name=scheme, loose_cutoff=None),
                ConceptMatcher(onto, abbreviations, scheme_name=scheme, loose_cutoff=cutoff),
            )
        off, on = pairs[scheme]
        before = {(m.start, m.end, m.concept_id) for m in off.find(text)}
        t0 = time.perf_counter()
        found = on.find(text)
        spent += time.perf_counter() - t0
        out += [
            (case, m.text, m.label, m.note)
            for m in found
            if (m.start, m.end, m.concept_id) not in before and "read as" in m.note
        ]
    return out, spent


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cutoffs", type=float, nargs="+", default=[80.0, 82.0, LOOSE_CUTOFF, 88.0])
    ap.add_argument("--show", type=float, default=LOOSE_CUTOFF, help="list the mentions")
    ap.add_argument("-n", type=int, default=2000, help="generated reports")
    args = ap.parse_args(argv)
    sets: dict[str, list[Row]] = {"generated": _generated(args.n)}
    if DEMO.is_file():
        sets["demo"] = _read(DEMO)
    if TCGA_DEV.is_file():
        sets["tcga_dev"] = _read(TCGA_DEV)
    summary: dict[str, dict[str, int]] = {}
    for name, rows in sets.items():
        for cutoff in sorted({*args.cutoffs, args.show}):
            mentions, spent = added(rows, cutoff)
            summary.setdefault(name, {})[f"{cutoff:g}"] = len(mentions)
            print(f"{name}: cut-off {cutoff:g}: {len(mentions)} added ({spent:.1f} s)")
            if cutoff == args.show:
                for case, written, label, note in mentions:
                    print(f"  {case}  {written!r} -> {label}  [{note}]")
    print(json.dumps({"benchmark": "loose_calibration", "added": summary}))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
