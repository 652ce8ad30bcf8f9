#!/usr/bin/env python3
"""OCR damage: how often a histological type still reads after OCR-like damage to its name.

Takes the TCGA development reports (``../shared/data/tcga``, read in place, never
copied) whose histological type pathsieve reads right, damages *every* deciding
mention of that type with one kind of damage, labels the report again and counts
how often the type is still read right.  Real OCR damage is what the test split
holds and the development split shows too rarely to tune on; this measures the
readers against it without looking at the test split.

Kinds of damage (each applied once per name, at a random letter, seeded):

* ``look_alike`` -- a letter read as a look-alike glyph (``a``->``o``, ``l``->``1``,
  ``m``->``rn``, ``c``->``e``...);
* ``two_look_alikes`` -- two of them, in different words where the name has two;
* ``drop`` -- a letter lost;
* ``split`` -- a space inside a word (``adeno carcinoma``, ``squam ous``);
* ``glue`` -- the space between two words lost (``squamouscell carcinoma``);
* ``break`` -- a word broken over a line with a hyphen (``carci-\\nnoma``);
* ``first_lost`` -- the name's first letter lost (``quamous cell carcinoma``);
* ``header_misread`` -- the name left whole, the header of its section
  (``FINAL DIAGNOSIS``) with two look-alike glyphs (``FINAI DIAGNO5IS``);
* ``header_lost`` -- the header of its section blanked out;
* ``removed`` -- the name replaced by spaces: the floor, what other cues in the
  report (metastasis wording, grade groups, fields) still give.

The look-alike pairs are common OCR confusions (trade practice, no published
table).  Lung and cervix: the type is right when it is the predicted class of
``tcga.py``; colorectal and prostate: adenocarcinoma present or likely.

Prints a table (recovery per kind and scheme) and, as the last line, a JSON
summary.  Skips cleanly where the data is absent.

    .venv/bin/python benchmarks/ocr_damage.py                 # 120 reports a scheme
    .venv/bin/python benchmarks/ocr_damage.py --per-scheme 0  # every right report
    .venv/bin/python benchmarks/ocr_damage.py --show 5        # 5 failures of each kind
"""

from __future__ import annotations

import argparse
import json
import random
import re
import sys
import time
from collections import defaultdict
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import Any

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from tcga import DEFAULT_DATA, HISTOTYPES, Case, _histotype, load_split  # noqa: E402

#: look-alike glyphs an OCR engine gives for a letter (trade practice)
LOOK_ALIKES: dict[str, tuple[str, ...]] = {
    "a": ("o", "e", "u", "d"),
    "c": ("e", "o", "("),
    "d": ("cl", "a"),
    "e": ("c", "o", "a"),
    "i": ("l", "1", "!", "j"),
    "l": ("1", "I", "i", "t"),
    "m": ("rn", "nn", "in"),
    "n": ("ri", "u", "h"),
    "o": ("0", "a", "c", "e"),
    "r": ("t", "f", "n"),
    "s": ("5", "$", "e"),
    "t": ("l", "f", "i"),
    "u": ("ii", "v", "n", "a"),
    "q": ("g", "o"),
}
KINDS = (
    "look_alike",
    "two_look_alikes",
    "drop",
    "split",
    "glue",
    "break",
    "first_lost",
    "header_misread",
    "header_lost",
    "removed",
)
#: kinds that damage the header of each section holding a name, not the name: the
#: damage done to the header's text
HEADER_KINDS = {"header_misread": "two_look_alikes", "header_lost": "removed"}
SCHEMES = ("lung", "cervix", "colorectal", "prostate")
_WORD = re.compile(r"[A-Za-z]{4,}")


def _case_glyph(old: str, new: str) -> str:
    return new.upper() if old.isupper() and new.isalpha() else new


def damage(name: str, kind: str, rng: random.Random) -> str:
    """``name`` (a mention's text) with one kind of damage; same text if none applies.

    >>> damage("adenocarcinoma", "removed", random.Random(1))
    '              '
    >>> damage("squamous cell carcinoma", "glue", random.Random(1)).count(" ")
    1
    >>> damage("Adenocarcinoma", "first_lost", random.Random(1))
    'denocarcinoma'
    """
    words = [m for m in _WORD.finditer(name)]
    if kind == "removed":
        return re.sub(r"[^\n]", " ", name)
    if kind == "first_lost":
        first = re.search(r"[A-Za-z]", name)
        return name if first is None else name[: first.start()] + name[first.end() :]
    if kind == "glue":
        spaces = [m.start() for m in re.finditer(r"(?<=[A-Za-z]) (?=[A-Za-z])", name)]
        if not spaces:
            return name
        at = rng.choice(spaces)
        return name[:at] + name[at + 1 :]
    if not words:
        return name
    if kind == "two_look_alikes":
        picks = rng.sample(words, 2) if len(words) >= 2 else [words[0], words[0]]
        out = name
        # later position first, so earlier offsets hold
        spots = sorted({_inner(w, rng) for w in picks}, reverse=True)
        for at in spots:
            out = _look_alike(out, at, rng)
        return out
    w = rng.choice(words)
    at = _inner(w, rng)
    if kind == "look_alike":
        return _look_alike(name, at, rng)
    if kind == "drop":
        return name[:at] + name[at + 1 :]
    if kind == "split":
        return name[:at] + " " + name[at:]
    if kind == "break":
        return name[:at] + "-\n" + name[at:]
    raise ValueError(f"unknown kind {kind!r}")


def _inner(word: re.Match[str], rng: random.Random) -> int:
    """A letter position inside ``word``, not its first letter."""
    return rng.randrange(word.start() + 1, word.end())


def _look_alike(text: str, at: int, rng: random.Random) -> str:
    old = text[at]
    options = LOOK_ALIKES.get(old.lower())
    if not options:
        # no look-alike for this letter: take the nearest letter that has one
        for step in range(1, 4):
            for j in (at + step, at - step):
                if 0 < j < len(text) and text[j].lower() in LOOK_ALIKES:
                    return _look_alike(text, j, rng)
        return text
    new = _case_glyph(old, rng.choice(options))
    return text[:at] + new + text[at + 1 :]


def _right(scheme: str, gold_type: str, result: Any) -> bool:
    if scheme in ("lung", "cervix"):
        return _histotype(result)[0] == gold_type
    st = result.case.states.get("adenocarcinoma")
    return st is not None and st.score >= 0.75


def _gold_type(c: Case) -> str | None:
    want = [k for k in HISTOTYPES if c.gold.get(k) == "present"]
    if c.scheme in ("lung", "cervix"):
        return want[0] if len(want) == 1 else None
    return "adenocarcinoma" if "adenocarcinoma" in want else None


def _targets(result: Any, gold_type: str) -> list[tuple[int, int]]:
    """Spans of the deciding, affirmed mentions that count for the gold type."""
    spans = set()
    for row in result.evidence:
        m = row.mention
        if (
            m is not None
            and row.decides
            and gold_type in row.labels
            and row.assertion.certainty in ("present", "likely")
        ):
            spans.add((m.start, m.end))
    # outermost spans only, in order
    out: list[tuple[int, int]] = []
    for s, e in sorted(spans, key=lambda se: (se[0], -se[1])):
        if out and s < out[-1][1]:
            continue
        out.append((s, e))
    return out


def header_spans(text: str, spans: list[tuple[int, int]]) -> list[tuple[int, int]]:
    """Spans of the headers of the sections that hold ``spans`` (as written)."""
    from pathsieve.sections import find_sections

    out: set[tuple[int, int]] = set()
    sections = find_sections(text)
    for s, _ in spans:
        for sec in sections:
            if sec.start <= s < sec.end and sec.header:
                at = text.find(sec.header, sec.start, sec.body_start)
                if at >= 0:
                    out.add((at, at + len(sec.header)))
    return sorted(out)


def apply(text: str, spans: list[tuple[int, int]], fn: Callable[[str], str]) -> str:
    """``text`` with every span replaced by ``fn`` of its text (right to left)."""
    for s, e in sorted(spans, reverse=True):
        text = text[:s] + fn(text[s:e]) + text[e:]
    return text


def run(
    cases: Iterable[Case], per_scheme: int, seed: int, show: int
) -> tuple[dict[str, Any], list[str]]:
    from pathsieve import Labeler

    labelers = {s: Labeler(s) for s in SCHEMES}
    picked: dict[str, list[tuple[Case, str, list[tuple[int, int]]]]] = defaultdict(list)
    for c in cases:
        if c.scheme not in labelers or not c.text.strip():
            continue
        gold_type = _gold_type(c)
        if gold_type is None:
            continue
        if per_scheme and len(picked[c.scheme]) >= per_scheme:
            continue
        result = labelers[c.scheme].label_report(c.text)
        if not _right(c.scheme, gold_type, result):
            continue
        spans = _targets(result, gold_type)
        if spans:
            picked[c.scheme].append((c, gold_type, spans))

    tallies: dict[tuple[str, str], list[int]] = defaultdict(lambda: [0, 0])
    failures: list[str] = []
    shown: dict[str, int] = defaultdict(int)
    t0 = time.perf_counter()
    for kind in KINDS:
        for scheme in SCHEMES:
            for c, gold_type, spans in picked[scheme]:
                # one random stream per case and kind: runs are repeatable case by case
                rng = random.Random(f"{seed}:{kind}:{c.case_id}")
                how = HEADER_KINDS.get(kind, kind)
                where = header_spans(c.text, spans) if kind in HEADER_KINDS else spans
                written: list[str] = []  # the damaged spans, right to left

                def hurt(
                    t: str, r: random.Random = rng, k: str = how, w: list[str] = written
                ) -> str:
                    w.append(damage(t, k, r))
                    return w[-1]

                damaged = apply(c.text, where, hurt)
                ok = _right(scheme, gold_type, labelers[scheme].label_report(damaged))
                tally = tallies[(kind, scheme)]
                tally[0] += 1
                tally[1] += ok
                if not ok and kind != "removed" and shown[kind] < show:
                    shown[kind] += 1
                    names = [repr(w) for w in reversed(written)][:3]
                    failures.append(f"{kind:<16} {c.case_id}  {gold_type}  {', '.join(names)}")
    seconds = time.perf_counter() - t0

    def rate(n_hit: list[int]) -> float | None:
        return round(n_hit[1] / n_hit[0], 4) if n_hit[0] else None

    by_kind: dict[str, Any] = {}
    for kind in KINDS:
        total = [sum(tallies[(kind, s)][0] for s in SCHEMES), 0]
        total[1] = sum(tallies[(kind, s)][1] for s in SCHEMES)
        by_kind[kind] = {
            "all": rate(total),
            **{s: rate(tallies[(kind, s)]) for s in SCHEMES},
            "n": total[0],
        }
    damaged_kinds = [k for k in KINDS if k != "removed"]
    n_all = sum(by_kind[k]["n"] for k in damaged_kinds)
    hit_all = sum(sum(tallies[(k, s)][1] for s in SCHEMES) for k in damaged_kinds)
    summary = {
        "benchmark": "ocr_damage",
        "seed": seed,
        "reports": {s: len(picked[s]) for s in SCHEMES},
        "recovery": by_kind,
        "recovery_damaged_all": round(hit_all / n_all, 4) if n_all else None,
        "floor_removed": by_kind["removed"]["all"],
        "seconds": round(seconds, 1),
    }
    return summary, failures


def main(argv: Iterable[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--data", type=Path, default=DEFAULT_DATA, help="folder of the TCGA files")
    ap.add_argument(
        "--per-scheme", type=int, default=120, help="reports per scheme (0: every right one)"
    )
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--show", type=int, default=0, help="list N failures of each kind")
    args = ap.parse_args(list(argv) if argv is not None else None)
    if not (args.data / "reports_dev.csv").exists():
        print(f"TCGA data not present under {args.data}; skipped")
        print(json.dumps({"benchmark": "ocr_damage", "skipped": True}))
        return 0
    summary, failures = run(load_split("dev", args.data), args.per_scheme, args.seed, args.show)
    print(
        "OCR damage to the type name, TCGA dev reports read right when undamaged: "
        + ", ".join(f"{s} {n}" for s, n in summary["reports"].items())
    )
    print()
    print(f"{'damage':<18}" + "".join(f"{s:>12}" for s in ("all", *SCHEMES)))
    for kind in KINDS:
        row = summary["recovery"][kind]
        cells = "".join(
            f"{row[s]:>12.3f}" if row[s] is not None else f"{'-':>12}" for s in ("all", *SCHEMES)
        )
        print(f"{kind:<18}{cells}")
    print()
    print(
        f"damaged names read right: {summary['recovery_damaged_all']:.3f} "
        f"(floor with the name removed: {summary['floor_removed']:.3f}); "
        f"{summary['seconds']} s"
    )
    if failures:
        print()
        print("failures (dev)")
        for line in failures:
            print("  " + line)
    print(json.dumps(summary))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
