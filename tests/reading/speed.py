"""Speed of the reading stages (a script, not a test; timings never fail a build).

    .venv/bin/python tests/reading/speed.py [--rounds N]

Measures, on invented ~600-character reports (``reports.make_corpus``) and,
when the shared TCGA development reports are present, on their text cut into
~900-character pieces (read in place, never copied): spaCy's default English
tokenizer against the report tokenizer, normalisation, and concept matching
with and without fuzzy matching.  Every figure is the best of many small
batches, in microseconds per 900 characters, so that other work on a shared
machine disturbs it less.  The last line is a JSON summary.
"""

from __future__ import annotations

import argparse
import csv
import json
import sys
import time
from collections.abc import Callable
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import spacy  # noqa: E402
from reports import make_corpus  # noqa: E402

from pathsieve.abbreviations import AbbreviationDictionary  # noqa: E402
from pathsieve.matcher import ConceptMatcher  # noqa: E402
from pathsieve.normalize import normalize  # noqa: E402
from pathsieve.ontology import load_ontology  # noqa: E402
from pathsieve.tokenizer import make_tokenizer  # noqa: E402
from pathsieve.vocab import lexicon_path, ontology_path  # noqa: E402

TCGA = Path("/work/shared/data/tcga/reports_dev.csv")


def measure(
    configs: dict[str, tuple[Callable[[str], object], list[str]]], rounds: int, batch: int = 150
) -> dict[str, float]:
    """Best microseconds per 900 characters over ``rounds`` small batches, configs interleaved."""
    best = {k: float("inf") for k in configs}
    for f, texts in configs.values():
        for t in texts[:300]:
            f(t)  # warm caches and lazy builds
    for r in range(rounds):
        for name, (f, texts) in configs.items():
            i = (r * batch) % max(1, len(texts) - batch)
            chunk = texts[i : i + batch]
            chars = sum(map(len, chunk))
            t0 = time.perf_counter()
            for t in chunk:
                f(t)
            best[name] = min(best[name], (time.perf_counter() - t0) / chars * 900 * 1e6)
    return best


def tcga_pieces() -> list[str]:
    if not TCGA.is_file():
        return []
    pieces = []
    with TCGA.open(newline="", encoding="utf-8") as fh:
        for row in csv.DictReader(fh):
            text = row["text"]
            while text:
                cut = text.find("\n", 900)
                cut = len(text) if cut < 0 else cut + 1
                pieces.append(text[:cut])
                text = text[cut:]
    return pieces


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--rounds", type=int, default=30)
    args = ap.parse_args()
    onto = load_ontology(
        ontology_path() if ontology_path().is_file() else HERE / "data" / "mini.obo"
    )
    abbrev_file = lexicon_path("abbreviations.tsv")
    shipped = ontology_path().is_file() and abbrev_file.is_file()
    abbrevs = (
        AbbreviationDictionary.load(abbrev_file) if shipped else AbbreviationDictionary.empty()
    )
    full = ConceptMatcher(onto, abbrevs, scheme_name="colorectal")
    exact_only = ConceptMatcher(onto, abbrevs, scheme_name="colorectal", fuzzy_cutoff=None)
    default_nlp = spacy.blank("en")
    report_nlp = spacy.blank("en")
    report_nlp.tokenizer = make_tokenizer(report_nlp)

    invented = make_corpus(2000)
    configs: dict[str, tuple[Callable[[str], object], list[str]]] = {
        "spacy default tokenizer": (default_nlp.tokenizer, invented),
        "report tokenizer": (report_nlp.tokenizer, invented),
        "normalize": (normalize, invented),
        "match (exact + abbreviations)": (exact_only.find, invented),
        "match (all, fuzzy on)": (full.find, invented),
    }
    pieces = tcga_pieces()
    if pieces:
        configs["TCGA: normalize"] = (normalize, pieces)
        configs["TCGA: match (exact + abbreviations)"] = (exact_only.find, pieces)
        configs["TCGA: match (all, fuzzy on)"] = (full.find, pieces)
    result = measure(configs, args.rounds)
    print(f"ontology: {onto.path} ({len(onto)} terms); dictionary: {len(abbrevs)} senses")
    for name, us in result.items():
        print(f"{name:38} {us:8.1f} us per 900 chars  ({1e6 / us:8.0f} per second)")
    ratio = result["spacy default tokenizer"] / result["report tokenizer"]
    print(f"report tokenizer is {ratio:.1f}x faster than spaCy's default")
    summary = {k: round(v, 1) for k, v in result.items()}
    summary["tokenizer_speedup"] = round(ratio, 1)
    print(json.dumps(summary))


if __name__ == "__main__":
    main()
