"""Measure fuzzy matching: recall on misspellings, false hits on ordinary text.

Run as a script (it is not a test):

    .venv/bin/python tests/reading/fuzzy_calibration.py [--ontology PATH] [--tcga]

For every shortest-word length and cut-off it prints the recall on
``MISSPELLINGS`` and the number of ordinary words and sentences that produce a
fuzzy concept match, with the common-word filter OFF (so the cut-off and the
length alone are measured) and ON (the shipped configuration).  ``--tcga``
adds, for the chosen setting, the fuzzy corrections made on the shared TCGA
development reports (read in place, never copied) so they can be judged by
eye.  The last line is a JSON summary.
"""

from __future__ import annotations

import argparse
import json
import sys
from collections import Counter
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from fuzzy_cases import MISSPELLINGS, ORDINARY_SENTENCES, ORDINARY_WORDS  # noqa: E402

from pathsieve.abbreviations import AbbreviationDictionary  # noqa: E402
from pathsieve.matcher import FUZZY_CUTOFF, FUZZY_MIN_LENGTH, ConceptMatcher  # noqa: E402
from pathsieve.ontology import Ontology, load_ontology  # noqa: E402
from pathsieve.vocab import ontology_path  # noqa: E402

CUTOFFS = tuple(range(70, 101, 2))
MIN_LENGTHS = (5, 6, 7, 8)


def default_ontology() -> Ontology:
    """The shipped ontology when it exists, else the reading tests' mini ontology."""
    p = ontology_path()
    return load_ontology(p if p.is_file() else HERE / "data" / "mini.obo")


def expected_cases(onto: Ontology) -> list[tuple[str, str, str]]:
    """(written, concept id, kind) for the misspellings whose concept the ontology has."""
    out = []
    for written, name, kind in MISSPELLINGS:
        ids = onto.lookup(name)
        if ids:
            out.append((written, ids[0], kind))
    return out


def recall(m: ConceptMatcher, cases: list[tuple[str, str, str]]) -> tuple[float, list[str]]:
    missed = []
    for written, cid, _ in cases:
        text = f"Diagnosis: {written}, see comment."
        start = text.index(written)
        hit = any(
            x.concept_id == cid and x.start < start + len(written) and x.end > start
            for x in m.find(text)
        )
        if not hit:
            missed.append(written)
    return 1 - len(missed) / max(len(cases), 1), missed


def false_hits(m: ConceptMatcher) -> list[str]:
    bad = []
    for text in [*ORDINARY_WORDS, *ORDINARY_SENTENCES]:
        for x in m.find(text):
            if x.match == "fuzzy":
                bad.append(f"{x.text!r} -> {x.label}")
    return bad


def calibrate(onto: Ontology, *, common: bool) -> list[dict[str, object]]:
    cases = expected_cases(onto)
    abbrevs = AbbreviationDictionary.empty()
    rows = []
    for min_len in MIN_LENGTHS:
        for cutoff in CUTOFFS:
            m = ConceptMatcher(
                onto,
                abbrevs,
                fuzzy_cutoff=float(cutoff),
                fuzzy_min_length=min_len,
                common_words=None if common else frozenset(),
            )
            r, missed = recall(m, cases)
            bad = false_hits(m)
            rows.append(
                {
                    "min_length": min_len,
                    "cutoff": cutoff,
                    "recall": round(r, 3),
                    "false_hits": len(bad),
                    "missed": missed,
                    "false": bad,
                }
            )
    return rows


def tcga_sample(onto: Ontology, limit: int = 400) -> Counter[str]:
    """Fuzzy corrections made on the shared TCGA development reports (for judging by eye)."""
    import csv

    path = Path("/work/shared/data/tcga/reports_dev.csv")
    if not path.is_file():
        return Counter()
    m = ConceptMatcher(onto, AbbreviationDictionary.empty())
    seen: Counter[str] = Counter()
    with path.open(newline="", encoding="utf-8") as fh:
        for i, row in enumerate(csv.DictReader(fh)):
            if i >= limit:
                break
            for x in m.find(row["text"]):
                if x.match == "fuzzy":
                    seen[f"{x.text!r} -> {x.label} ({x.score:.0f})"] += 1
    return seen


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--ontology", type=Path)
    ap.add_argument("--tcga", action="store_true")
    args = ap.parse_args()
    onto = load_ontology(args.ontology) if args.ontology else default_ontology()
    cases = expected_cases(onto)
    print(
        f"ontology {onto.path}: {len(cases)} of {len(MISSPELLINGS)} misspellings apply; "
        f"{len(ORDINARY_WORDS)} ordinary words, {len(ORDINARY_SENTENCES)} sentences"
    )
    summary: dict[str, object] = {}
    for common in (False, True):
        rows = calibrate(onto, common=common)
        print(f"\ncommon-word filter {'ON' if common else 'OFF'}: recall / false hits")
        print("cutoff " + " ".join(f"  len>={n:<2}     " for n in MIN_LENGTHS))
        for cutoff in CUTOFFS:
            cells = [
                f"{r['recall']:.3f} / {r['false_hits']:<3}"
                for n in MIN_LENGTHS
                for r in rows
                if r["min_length"] == n and r["cutoff"] == cutoff
            ]
            print(f"{cutoff:>6} " + "  ".join(cells))
        chosen = next(
            r for r in rows if r["min_length"] == FUZZY_MIN_LENGTH and r["cutoff"] == FUZZY_CUTOFF
        )
        print(f"chosen (len>={FUZZY_MIN_LENGTH}, cutoff {FUZZY_CUTOFF}): missed {chosen['missed']}")
        print(f"  false hits: {chosen['false']}")
        summary["filter_on" if common else "filter_off"] = {
            "recall": chosen["recall"],
            "false_hits": chosen["false_hits"],
            "curve": [(r["min_length"], r["cutoff"], r["recall"], r["false_hits"]) for r in rows],
        }
    if args.tcga:
        sample = tcga_sample(onto)
        print(f"\nTCGA dev fuzzy corrections (distinct {len(sample)}):")
        for k, n in sample.most_common():
            print(f"  {n:4}  {k}")
        summary["tcga_distinct_fuzzy"] = len(sample)
    summary["min_length"], summary["cutoff"] = FUZZY_MIN_LENGTH, FUZZY_CUTOFF
    print(json.dumps(summary))


if __name__ == "__main__":
    main()
