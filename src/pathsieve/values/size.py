"""Tumour size in millimetres (the greatest dimension; cm x 10 = mm).

Precision over recall: a size is read only where the text says it is the
tumour's or the lesion's -- a synoptic heading ("Tumor size: 2.5 cm",
"Greatest dimension: 3.1 cm"), a tumour noun that measures something ("the
tumor measures 2.5 x 1.8 x 1.0 cm", "carcinoma, 2.3 cm") or a size that
qualifies a tumour noun ("a 2.1 cm mass").  Specimen and container dimensions,
distances ("2 cm from the margin"), aggregates of fragments, staging definitions
("tumor 2 cm or less") and OCR-mangled units ("2.4 em") are not read.

>>> from pathsieve.values import extract_values
>>> t = "The tumor measures 2.5 x 1.8 x 1.0 cm."
>>> v = extract_values(t, [(0, len(t), "gross", "")])[0]
>>> v.key, v.value, v.text, v.detail["dimensions_mm"]
('tumor_size_mm', 25.0, 'tumor measures 2.5 x 1.8 x 1.0 cm', (25.0, 18.0, 10.0))
"""

from __future__ import annotations

import re

from ..records import Value
from .common import (
    Anchors,
    Found,
    Numbers,
    Region,
    Rx,
    Sizes,
    alternation,
    gate,
    keep_non_overlapping,
)
from .lexicon import ValueLexicon

__all__ = ["SizeReader"]

_S = r"[^\S\n]{0,3}"


class SizeReader:
    """Reads ``tumor_size_mm`` (detail: dimensions_mm)."""

    keys = ("tumor_size_mm",)

    def __init__(self, lex: ValueLexicon) -> None:
        fam = "size"
        self.sizes = Sizes(lex)
        self.numbers = Numbers(lex)
        dims = rf"(?P<dims>{self.sizes.dims})"
        approx = alternation(lex.phrases(fam, "approx_words"))
        less_more = alternation(
            (*lex.phrases("numbers", "less_than"), *lex.phrases("numbers", "greater_than"))
        )
        after = rf"(?!{_S}(?:{alternation(lex.phrases(fam, 'after_exclusions'))}))"
        noun = alternation(lex.phrases(fam, "tumor_nouns"))
        noun_ok = rf"(?!{_S}{alternation(lex.phrases(fam, 'noun_exclusions'))})"
        measure = alternation(lex.phrases(fam, "measure_words"))
        self._qualified = Rx(rf"{less_more}{_S}$")
        # "Tumor size: 2.5 x 1.8 x 1.0 cm", "TUMOR SIZE | Greatest dimension: 1.2 cm"
        self._heading = Rx(
            rf"{alternation(lex.phrases(fam, 'headings'))}(?:{_S}\([^()\n]{{0,20}}\))?[^\d]{{0,40}}?"
            rf"(?:{approx}{_S})?{dims}{after}"
        )
        # "Greatest dimension: 3.1 cm" as a synoptic field
        self._field = Rx(
            rf"{alternation(lex.phrases(fam, 'field_headings'))}{_S}(?:\([^()\n]{{0,20}}\){_S})?[:=]\s{{0,5}}"
            rf"(?:{approx}{_S})?{dims}{after}"
        )
        self._field_exclusion = Rx(alternation(lex.phrases(fam, "field_exclusions")))
        # "the tumor measures 2.5 cm", "a mass measuring 2.1 cm", "carcinoma, 2.3 cm"
        # a short description may come between: "Dominant nodule, right posterior, 2.3 cm"
        described = rf"(?:{_S},{_S}(?:[a-z\-]{{2,15}}{_S}){{1,3}}(?=,))?"
        self._noun_first = Rx(
            rf"{noun}{noun_ok}{described}(?:{_S}[,:(]?{_S}{measure}){{0,3}}{_S}[,:(]?\s{{0,3}}"
            rf"(?:{approx}{_S})?{dims}{after}"
        )
        self._preceding = Rx(
            rf"{alternation(lex.phrases(fam, 'preceding_exclusions'))}{_S}(?:the{_S})?$"
        )
        stop = alternation(lex.phrases(fam, "gap_stopwords"))
        # "a 2.1 cm mass", "2.5 x 2.0 cm tan, firm tumor", "2.1-cm nodule"
        self._size_first = Rx(
            rf"(?:{approx}{_S})?{dims}(?:-|\s{{1,3}})(?:(?!{stop})[a-z][a-z\-]{{0,20}},?\s{{1,3}}){{0,3}}?"
            rf"{noun}{noun_ok}"
        )
        self._at_headings = Anchors(lex.phrases(fam, "headings"))
        self._at_fields = Anchors(lex.phrases(fam, "field_headings"))
        self._at_nouns = Anchors(lex.phrases(fam, "tumor_nouns"))
        #: every form starts at, or shortly before, one of these (see :func:`~.common.gate`)
        self.gate = gate(self._at_headings, self._at_fields, self._at_nouns)

    def read(self, region: Region) -> list[Value]:
        headings = self._at_headings.positions(region)
        fields = self._at_fields.positions(region)
        nouns = self._at_nouns.positions(region)
        if not (headings or fields or nouns):
            return []  # every form starts at, or shortly before, one of these words
        body = region.body
        found: list[Found] = []
        for m in self._heading.match_at(region, headings):
            self._add(found, m, region)
        for m in self._field.match_at(region, fields):
            # "Lymph node ... greatest dimension: 1.2 cm" is not the tumour
            prev_line = body.rfind("\n", 0, max(0, body.rfind("\n", 0, m.start())))
            if self._field_exclusion.search(region, max(0, prev_line), m.start()) is not None:
                continue
            self._add(found, m, region)
        for m in self._noun_first.match_at(region, nouns):
            if self._preceding.search(region, max(0, m.start() - 30), m.start()) is not None:
                continue
            self._add(found, m, region)
        # a size before its noun starts with a number: try it only shortly before one
        for m in self._size_first.match_at(region, self.numbers.positions_near(region, nouns, 90)):
            self._add(found, m, region)
        kept = keep_non_overlapping(found)
        kept.sort(key=lambda f: f.start)
        return [region.found("tumor_size_mm", f) for f in kept]

    def _add(self, found: list[Found], m: re.Match[str], region: Region) -> None:
        if (
            self._qualified.search(region, max(0, m.start("dims") - 20), m.start("dims"))
            is not None
        ):
            return  # "greater than 2 cm" is a definition, not a measurement
        parsed = self.sizes.parse(m["dims"])
        if parsed is None:
            return
        greatest, dims = parsed
        if greatest <= 0:
            return
        found.append(Found(m.start(), m.end(), greatest, (), {"dimensions_mm": dims}))
