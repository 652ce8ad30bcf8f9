"""Assertion benchmark: pathsieve's engine against the negspacy baseline.

Reads the annotated development corpus (one sentence, one target concept and
three reference judgements a row), finds the concept in its sentence (it is
written in upper case there), asks pathsieve's assertion engine about that
span and, on the same spans, negspacy's ``negex`` component with its
``en_clinical`` termset (the reference NegEx baseline). Prints precision,
recall and F1 side by side for negation, historical, hypothetical and
other-experiencer, the errors by category with a few examples, and, as the
last line, a JSON summary.

    .venv/bin/python benchmarks/assertion.py [--corpus PATH] [--examples N]

Exits 0 with ``{"skipped": true}`` when the corpus is absent.
"""

from __future__ import annotations

import argparse
import csv
import json
import re
import sys
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

from pathsieve.assertion import AssertionEngine
from pathsieve.records import Assertion

__all__ = [
    "DEFAULT_CORPUS",
    "Row",
    "load_corpus",
    "locate",
    "main",
    "prf",
    "run_engine",
    "run_negspacy",
]

REPO = Path(__file__).resolve().parents[1]
DEFAULT_CORPUS = REPO.parent / "shared" / "data" / "negex-dev" / "context_dev.tsv"


@dataclass(frozen=True, slots=True)
class Row:
    report: str
    concept: str
    sentence: str
    start: int
    end: int
    located: str  # how the span was found: upper, nocase, partial
    negated: bool
    historical: bool
    hypothetical: bool
    other: bool


def resolve_corpus(arg: str | None) -> Path:
    """The corpus path: as given (cwd, then repo root), or the shared default."""
    if not arg:
        return DEFAULT_CORPUS
    p = Path(arg)
    if p.is_absolute() or p.exists():
        return p
    return REPO / p


def _flex(words: Sequence[str], *, upper: bool) -> str:
    return r"\s+".join(re.escape(w.upper() if upper else w) for w in words)


def locate(concept: str, sentence: str) -> tuple[int, int, str] | None:
    """Find the concept's span in its sentence.

    The corpus writes the target in upper case; match that case-sensitively,
    any whitespace run between words.  Some rows keep the concept's original
    case, and a few sentences were cut inside the concept: fall back to a
    case-insensitive match, then to the longest leading (or trailing) run of
    the concept's words.
    """
    words = concept.split()
    if not words:
        return None
    m = re.search(_flex(words, upper=True), sentence)
    if m:
        return m.start(), m.end(), "upper"
    m = re.search(_flex(words, upper=False), sentence, re.IGNORECASE)
    if m:
        return m.start(), m.end(), "nocase"
    for k in range(len(words) - 1, 0, -1):
        for part in (words[:k], words[-k:]):
            m = re.search(r"(?<!\w)" + _flex(part, upper=False), sentence, re.IGNORECASE)
            if m:
                return m.start(), m.end(), "partial"
    return None


def load_corpus(path: Path) -> tuple[list[Row], int]:
    """Rows whose concept could be located, and the count of rows skipped."""
    rows: list[Row] = []
    skipped = 0
    with path.open(encoding="utf-8", newline="") as f:
        reader = csv.DictReader(f, delimiter="\t", quoting=csv.QUOTE_NONE)
        for rec in reader:
            found = locate(rec["concept"], rec["sentence"])
            if found is None:
                skipped += 1
                continue
            s, e, how = found
            rows.append(
                Row(
                    report=rec["report"],
                    concept=rec["concept"],
                    sentence=rec["sentence"],
                    start=s,
                    end=e,
                    located=how,
                    negated=rec["negation"].strip() == "Negated",
                    historical=rec["temporality"].strip() == "Historical",
                    hypothetical=rec["temporality"].strip() == "Not particular",
                    other=rec["experiencer"].strip() in ("Other", "Family member"),
                )
            )
    return rows, skipped


def run_engine(rows: Sequence[Row], engine: AssertionEngine | None = None) -> list[Assertion]:
    engine = engine or AssertionEngine.load()
    return [engine.assess(r.sentence, [(r.start, r.end)])[0] for r in rows]


def run_negspacy(rows: Sequence[Row]) -> list[bool]:
    """negspacy's Negex (en_clinical termset) on the same spans, one sentence a doc."""
    import spacy
    from negspacy.negation import Negex  # noqa: F401  (registers the "negex" factory)
    from negspacy.termsets import termset
    from spacy.language import Language
    from spacy.tokens import Doc

    if "bench_target_span" not in Language.factories:

        @Language.component("bench_target_span")
        def _target(doc: Doc) -> Doc:
            start, end = doc.user_data["target"]
            span = doc.char_span(start, end, label="CONCEPT", alignment_mode="expand")
            doc.ents = [span] if span is not None else []
            # each corpus row is one sentence
            for i, tok in enumerate(doc):
                tok.is_sent_start = i == 0
            return doc

    nlp = spacy.blank("en")
    nlp.add_pipe("bench_target_span")
    nlp.add_pipe("negex", config={"neg_termset": termset("en_clinical").get_patterns()})
    out: list[bool] = []
    for r in rows:
        doc = nlp.make_doc(r.sentence)
        doc.user_data["target"] = (r.start, r.end)
        for _, proc in nlp.pipeline:
            doc = proc(doc)
        ents = list(doc.ents)
        out.append(bool(ents) and bool(ents[0]._.negex))
    return out


def prf(gold: Sequence[bool], pred: Sequence[bool]) -> dict[str, float | int]:
    tp = sum(g and p for g, p in zip(gold, pred))
    fp = sum(p and not g for g, p in zip(gold, pred))
    fn = sum(g and not p for g, p in zip(gold, pred))
    p = tp / (tp + fp) if tp + fp else 0.0
    r = tp / (tp + fn) if tp + fn else 0.0
    f = 2 * p * r / (p + r) if p + r else 0.0
    return {"tp": tp, "fp": fp, "fn": fn, "p": p, "r": r, "f1": f}


CATEGORIES: dict[str, tuple[Callable[[Row], bool], Callable[[Assertion], bool]]] = {
    "negated": (lambda r: r.negated, lambda a: a.certainty == "absent"),
    "historical": (lambda r: r.historical, lambda a: a.temporality == "historical"),
    "hypothetical": (lambda r: r.hypothetical, lambda a: a.temporality == "hypothetical"),
    "other": (lambda r: r.other, lambda a: a.experiencer == "other"),
}


def _show(r: Row, a: Assertion, width: int = 160) -> str:
    lo = max(0, r.start - 70)
    snippet = " ".join(r.sentence[lo : r.start + width - 70].split())
    hits = ", ".join(f"{h.category}:{h.text!r}" for h in a.triggers) or "no trigger"
    return f"    [{hits}] {snippet}"


# An invented report (fictional laboratory) of the size the product targets:
# about 900 characters, three parts, ten mentions.
SPEED_REPORT = """\
FINAL DIAGNOSIS:
A. Colon, sigmoid, polypectomy:
   - Tubular adenoma.
   - Negative for high-grade dysplasia and malignancy.
B. Colon, ascending, biopsy:
   - Sessile serrated lesion without cytologic dysplasia.
   - No evidence of invasive carcinoma.
C. Rectum, biopsy:
   - Hyperplastic polyp; focal low-grade dysplasia cannot be excluded.

COMMENT: The findings in part B are consistent with a sessile serrated lesion.
Clinical history of colon cancer in the patient's father; rule out Lynch syndrome.
Levels were examined. Previously diagnosed adenoma (Fictional Lakes Laboratory,
accession FL-00-0000) is noted for correlation.

MICROSCOPIC DESCRIPTION: Sections show colonic mucosa with crypt serration,
no granulomas, and no architectural distortion. The polyp in part C shows
serrated crypts limited to the upper half of the mucosa.
"""
SPEED_TERMS = (
    "Tubular adenoma", "high-grade dysplasia", "malignancy", "Sessile serrated lesion",
    "cytologic dysplasia", "invasive carcinoma", "low-grade dysplasia", "colon cancer",
    "Lynch syndrome", "granulomas",
)  # fmt: skip


def speed(engine: AssertionEngine, seconds: float = 1.0) -> tuple[float, int]:
    """Reports per second on the invented report (one core), and its mention count."""
    text = SPEED_REPORT
    spans = [(text.index(t), text.index(t) + len(t)) for t in SPEED_TERMS]
    cuts = [text.index("B. Colon"), text.index("C. Rectum"), text.index("COMMENT")]
    done = 0
    t0 = time.perf_counter()
    while (elapsed := time.perf_counter() - t0) < seconds:
        for _ in range(100):
            engine.assess(text, spans, boundaries=cuts)
        done += 100
    return done / elapsed, len(spans)


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--corpus", help=f"annotated TSV (default {DEFAULT_CORPUS})")
    ap.add_argument("--examples", type=int, default=4, help="error examples per category")
    ap.add_argument("--no-baseline", action="store_true", help="skip the negspacy run")
    args = ap.parse_args(argv)

    path = resolve_corpus(args.corpus)
    engine = AssertionEngine.load()
    rate, n_mentions = speed(engine)
    speed_line = (
        f"speed: {rate:,.0f} reports/s on one core "
        f"(invented {len(SPEED_REPORT)}-character report, {n_mentions} mentions)"
    )
    if not path.is_file():
        print(f"assertion benchmark: corpus not found at {path}; skipping")
        print(speed_line)
        print(json.dumps({"skipped": True, "reports_per_s": round(rate)}))
        return 0

    rows, unlocated = load_corpus(path)
    t0 = time.perf_counter()
    ours = run_engine(rows, engine)
    t_ours = time.perf_counter() - t0
    base: list[bool] | None = None
    t_base = 0.0
    if not args.no_baseline:
        t0 = time.perf_counter()
        base = run_negspacy(rows)
        t_base = time.perf_counter() - t0

    located = {k: sum(r.located == k for r in rows) for k in ("upper", "nocase", "partial")}
    print(f"corpus: {path}")
    print(f"rows: {len(rows)} assessed, {unlocated} concept not found; located {located}")
    print(
        f"time: pathsieve {t_ours * 1000:.0f} ms ({len(rows) / max(t_ours, 1e-9):,.0f} spans/s)"
        + (f", negspacy {t_base * 1000:.0f} ms" if base is not None else "")
    )
    print(speed_line)
    print()
    print(f"{'category':<14}{'gold':>6}  {'pathsieve P / R / F1':<26}{'negspacy P / R / F1':<24}")
    summary: dict[str, object] = {"rows": len(rows)}
    ours_f1: dict[str, float] = {}
    base_f1: dict[str, float | None] = {}
    for name, (gold_of, pred_of) in CATEGORIES.items():
        gold = [gold_of(r) for r in rows]
        s = prf(gold, [pred_of(a) for a in ours])
        ours_f1[name] = round(float(s["f1"]), 4)
        ours_txt = f"{s['p']:.3f} / {s['r']:.3f} / {s['f1']:.3f}"
        if name == "negated" and base is not None:
            b = prf(gold, base)
            base_f1[name] = round(float(b["f1"]), 4)
            base_txt = f"{b['p']:.3f} / {b['r']:.3f} / {b['f1']:.3f}"
        else:
            base_f1[name] = None
            base_txt = "n/a"
        print(f"{name:<14}{sum(gold):>6}  {ours_txt:<26}{base_txt:<24}")
    print()
    print("errors (pathsieve):")
    errors: dict[str, dict[str, int]] = {}
    for name, (gold_of, pred_of) in CATEGORIES.items():
        fps = [(r, a) for r, a in zip(rows, ours) if pred_of(a) and not gold_of(r)]
        fns = [(r, a) for r, a in zip(rows, ours) if gold_of(r) and not pred_of(a)]
        errors[name] = {"fp": len(fps), "fn": len(fns)}
        print(f"  {name}: {len(fps)} false positive(s), {len(fns)} false negative(s)")
        for label, items in (("FP", fps), ("FN", fns)):
            for r, a in items[: args.examples]:
                print(f"   {label} {r.concept!r}")
                print(_show(r, a))
    if base is not None:
        gold = [r.negated for r in rows]
        only_base = sum(b == g != (a.certainty == "absent") for g, b, a in zip(gold, base, ours))
        only_ours = sum((a.certainty == "absent") == g != b for g, b, a in zip(gold, base, ours))
        print(
            f"\nnegation: right only for pathsieve {only_ours}, right only for negspacy {only_base}"
        )
    summary.update({"pathsieve_f1": ours_f1, "negspacy_f1": base_f1, "errors": errors})
    summary["spans_per_s"] = round(len(rows) / max(t_ours, 1e-9))
    summary["reports_per_s"] = round(rate)
    print(json.dumps(summary, sort_keys=True))
    return 0


if __name__ == "__main__":
    sys.exit(main())
