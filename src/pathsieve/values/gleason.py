"""Gleason score and grade group (ISUP 2014 consensus; WHO 2016 grade groups).

A score is normalised to ``"P+S=T"``.  The total is primary + secondary; a stated
total that disagrees is kept as written and flagged ``gleason_sum_mismatch``
(and no grade group is derived from it).  Every consistent score also yields a
``grade_group`` value with ``detail["derived"] = True`` on the same offsets.

>>> from pathsieve.values import extract_values
>>> t = "Adenocarcinoma, Gleason score 3+4=7."
>>> [(v.key, v.value, v.text) for v in extract_values(t, [(0, len(t), "diagnosis", "")])]
[('gleason_score', '3+4=7', 'Gleason score 3+4=7'), ('grade_group', 2, 'Gleason score 3+4=7')]
"""

from __future__ import annotations

import re

from ..records import Value
from .common import (
    END_DIGIT,
    Anchors,
    Found,
    Numbers,
    Region,
    Rx,
    alternation,
    gate,
    keep_non_overlapping,
)
from .lexicon import ValueLexicon

__all__ = ["GleasonReader", "grade_group", "grade_group_from_total"]


def grade_group(primary: int, secondary: int) -> int | None:
    """The ISUP 2014 / WHO 2016 grade group of a pattern pair (None outside the table).

    The table: score <= 6 -> 1; 3+4=7 -> 2; 4+3=7 -> 3; 8 -> 4; 9-10 -> 5.  A score of
    7 made of other patterns (2+5, 5+2) has no row in the table.

    >>> grade_group(3, 4), grade_group(4, 3), grade_group(5, 4)
    (2, 3, 5)
    """
    if not (1 <= primary <= 5 and 1 <= secondary <= 5):
        return None
    total = primary + secondary
    if total == 7:
        return {(3, 4): 2, (4, 3): 3}.get((primary, secondary))
    return grade_group_from_total(total)


def grade_group_from_total(total: int) -> int | None:
    """Grade group from a total alone; None for 7 (3+4 and 4+3 differ) or out of range.

    >>> grade_group_from_total(6), grade_group_from_total(7), grade_group_from_total(9)
    (1, None, 5)
    """
    if 2 <= total <= 6:
        return 1
    if total == 8:
        return 4
    if total in (9, 10):
        return 5
    return None


_S = r"[^\S\n]{0,3}"  # a few spaces, not a line break
# Between a field name and its value: a separator, then perhaps a stray OCR mark
# or two ("Primary pattern:' 4", "Secondary pattern :,Grade 3").
_FIELD_SEP = r"[^\S\n]{0,3}[:=.\-]?[^\S\n]{0,2}[.,'\"`]{0,2}\s{0,5}"
_PAIR = r"(?P<p>[1-5])\s{0,3}\+\s{0,3}(?P<s>[1-5])(?!\d)"
_NEXT = END_DIGIT
_ADJACENT = re.compile(r"[\s,;:()\[\]/-]*")
_FIELD_GAP = re.compile(r"[\s:=]+")


class GleasonReader:
    """Reads ``gleason_score`` and ``grade_group`` from one region."""

    keys = ("gleason_score", "grade_group")

    def __init__(self, lex: ValueLexicon) -> None:
        self.numbers = Numbers(lex)
        names = alternation(
            lex.phrases("gleason", "names"), lex.phrases("gleason", "name_abbreviations")
        )
        kind = alternation(lex.phrases("gleason", "kind_words"))
        total_words = lex.phrases("gleason", "total_words")
        self._total_words = {" ".join(w.split()) for w in total_words}
        total = alternation(total_words)
        tail = (
            rf"(?:\s{{0,3}}(?P<paren>\()?\s{{0,2}}(?:[=_]|[,;]?{_S}{total}{_S}(?:[=:]|of|is)?)"
            rf"\s{{0,3}}(?P<t>10|[2-9]){_NEXT}(?:\s{{0,2}}/\s{{0,2}}10(?!\d))?(?(paren)\s{{0,2}}\))?)?"
        )
        # Head, then either "P+S[=T]" or "T[/10] (P+S)" or a bare total.
        self._headed = Rx(
            rf"(?P<head>{names})(?P<kind>(?:{_S}{kind}){{0,2}})[^\d]{{0,60}}?"
            rf"(?:{_PAIR}{tail}"
            rf"|(?P<t2>10|[2-9]){_NEXT}(?:\s{{0,2}}/\s{{0,2}}10(?!\d))?"
            rf"(?:\s{{0,3}}[(\[,]\s{{0,2}}(?P<p2>[1-5])\s{{0,3}}\+\s{{0,3}}(?P<s2>[1-5])(?!\d)\s{{0,2}}[)\]]?)?)"
        )
        # A field word may be run onto the field name ("Primarypattern: 3"), and
        # either may be glued to the word before it in OCR text ("...free of
        # tumorPRIMARY GLEASON GRADE: 3"): no word boundary is asked for on those
        # sides (no common word ends in "primary"/"secondary"/"tertiary" or starts
        # with "pattern"/"grade" after them).
        field = alternation(lex.phrases("gleason", "field_words"), left=False)
        # ... or lost to OCR: one or two short tokens with no digit on the field's
        # own line ("Secondary p.<;lttern: 4", "Primary Pattern: G ade 3").
        garbled = r"[^\s\d]{1,12}(?:[^\S\n][^\s\d]{1,6})?"
        value = rf"{_FIELD_SEP}(?:(?:{field}|{garbled}){_S}[:=]?\s{{0,3}})?"
        # A pattern out of five, its slash sometimes read as a one ("4/5", "415").
        out_of = r"(?:[1Il]5(?!\d)|" + _NEXT + ")"
        prim = alternation(lex.phrases("gleason", "primary"), left=False, right=False)
        sec = alternation(lex.phrases("gleason", "secondary"), left=False, right=False)
        ter = alternation(lex.phrases("gleason", "tertiary"), left=False, right=False)
        syn_total = alternation(lex.phrases("gleason", "synoptic_total"))
        self._synoptic = Rx(
            rf"{prim}{value}(?P<p>[1-5]){out_of}[\s\S]{{0,80}}?"
            rf"{sec}{value}(?P<s>[1-5]){out_of}"
            rf"(?:[\s\S]{{0,80}}?{ter}{value}(?P<t3>[1-5]){out_of})?"
            rf"(?:[\s\S]{{0,100}}?{syn_total}{_S}(?:\([^()\n]{{0,40}}\))?{_S}[:=]?\s{{0,5}}"
            rf"(?P<t>10|[2-9]){_NEXT})?"
        )
        # A pair with its total and no name, after a word that introduces a grade
        # ("Prostatic adenocarcinoma, 5+4=9"; "G eason score 3+4=7" with the name
        # lost to OCR): read only when the stated total is the sum, so the pair
        # checks itself, and only in a report that speaks of the prostate or of
        # Gleason patterns (see ``_scores``).
        unnamed = alternation(lex.phrases("gleason", "unnamed_heads"))
        self._unnamed = Rx(
            rf"(?P<head>{unnamed})[^\S\n]{{0,3}}[,:=]?\s{{0,3}}(?:"
            rf"(?P<p>[1-5])\s{{0,2}}\+\s{{0,2}}(?P<s>[1-5])\s{{0,2}}=\s{{0,2}}(?P<t>10|[2-9]){_NEXT}"
            rf"|(?P<t2>10|[2-9])\s{{0,2}}\(\s{{0,2}}(?P<p2>[1-5])\s{{0,2}}\+\s{{0,2}}(?P<s2>[1-5])\s{{0,2}}\))"
        )
        self._at_unnamed = Anchors(lex.phrases("gleason", "unnamed_heads"))
        self._context = lex.phrases("grade_group", "context")
        self._main = Rx(alternation(lex.phrases("gleason", "main_words")))
        self._digit = re.compile(r"\d")
        self._tertiary = Rx(rf"[^.\n;]{{0,40}}?{ter}[^\d\n]{{0,25}}?(?P<t3>[1-5]){_NEXT}")
        # no word boundary after the name: "GG1" is as common as "GG 1"
        gg_names = alternation(
            lex.phrases("grade_group", "names"),
            lex.phrases("grade_group", "name_abbreviations"),
            right=False,
        )
        ambiguous = alternation(lex.phrases("grade_group", "ambiguous_names"))
        self._ambiguous = Rx(ambiguous)
        self._gg = Rx(
            rf"(?:{gg_names}|{ambiguous}){_S}[:=\-]?\s{{0,3}}(?:(?:is|of){_S})?"
            rf"(?P<g>[1-5]{END_DIGIT}|{self.numbers.roman_pattern})(?!\s?\+)"
            rf"(?:\s{{0,2}}(?P<paren>\()?(?:/|of|out\s+of)\s{{0,2}}(?:5|v)(?![\d\w])(?(paren)\)))?"
        )
        self._gg_context = lex.phrases("grade_group", "context")
        self._at_name = Anchors(
            lex.phrases("gleason", "names"), lex.phrases("gleason", "name_abbreviations")
        )
        self._at_primary = Anchors(lex.phrases("gleason", "primary"))
        self._at_gg = Anchors(
            (*lex.phrases("grade_group", "names"), *lex.phrases("grade_group", "ambiguous_names")),
            lex.phrases("grade_group", "name_abbreviations"),
        )
        #: every form starts at one of these (see :func:`~.common.gate`)
        self.gate = gate(self._at_primary, self._at_name, self._at_gg, self._at_unnamed)

    # -----------------------------------------------------------------------------
    def read(self, region: Region) -> list[Value]:
        if not (
            self._at_primary.positions(region)
            or self._at_name.positions(region)
            or self._at_gg.positions(region)
            or self._at_unnamed.positions(region)
        ):
            return []  # every form starts at one of these words
        scores = self._scores(region)
        out: list[Value] = []
        for f in scores:
            gg = f.detail.pop("_gg", None)
            if f.value is not None:
                out.append(region.found("gleason_score", f))
            if gg is not None:
                detail = {"derived": True, "from_total": f.value is None}
                for mark in ("fields", "main"):
                    if f.detail.get(mark):
                        detail[mark] = True
                out.append(region.value("grade_group", gg, f.start, f.end, (), detail))
        out.extend(self._stated_groups(region, scores))
        return out

    def _scores(self, region: Region) -> list[Found]:
        body = region.body
        found: list[Found] = []
        for m in self._synoptic.match_at(region, self._at_primary.positions(region)):
            p, s = int(m["p"]), int(m["s"])
            t = int(m["t"]) if m["t"] else None
            t3 = int(m["t3"]) if m["t3"] else None
            f = self._score(m.start(), m.end(), p, s, t, t3)
            # named fields say which pattern is primary; a "P+S" string may not
            # (see ``aggregate._pick_values``)
            f.detail["fields"] = True
            found.append(f)
        for m in self._headed.match_at(region, self._at_name.positions(region)):
            end = m.end()
            if m["p"]:
                p, s = int(m["p"]), int(m["s"])
                t = int(m["t"]) if m["t"] else None
            elif m["p2"]:
                p, s, t = int(m["p2"]), int(m["s2"]), int(m["t2"])
            else:
                # A bare total ("Gleason score 6") gives a grade group when the total
                # alone decides it, but no "P+S=T" value.
                kind = " ".join(m["kind"].lower().split())
                if not kind or not any(w in kind for w in self._total_words):
                    continue
                between = body[m.end("kind") : m.start("t2")]
                if "\n" in between and _FIELD_GAP.sub("", between):
                    # a total on another line is read after a field name only
                    # ("Total Gleason score:\n8"), not after other words or OCR
                    # debris ("Gleason score is\n.3f-4")
                    continue
                gg = grade_group_from_total(int(m["t2"]))
                if gg is not None:
                    found.append(Found(m.start(), end, None, (), {"_gg": gg}))
                continue
            t3 = None
            tm = self._tertiary.match(region, end, min(len(body), end + 100))
            if tm:
                t3, end = int(tm["t3"]), tm.end()
            found.append(self._score(m.start(), end, p, s, t, t3))
        if region.report.mentions_any(self._context):
            for m in self._unnamed.match_at(region, self._at_unnamed.positions(region)):
                p, s, t = (int(m[g]) for g in (("p", "s", "t") if m["p"] else ("p2", "s2", "t2")))
                if p + s == t:
                    found.append(self._score(m.start(), m.end(), p, s, t, None))
        kept = keep_non_overlapping(found)
        kept.sort(key=lambda f: f.start)
        for f in kept:
            # "predominant pattern Gleason score 8 (4+4)", "Gleason grade predominant
            # pattern 7 (3+4)": a word before the numbers, on the same line, marks
            # the main score of several
            if f.value is not None and self._main_word(region, f.start):
                f.detail["main"] = True
        return kept

    def _main_word(self, region: Region, start: int) -> bool:
        body = region.body
        line_start = body.rfind("\n", 0, start) + 1
        lo = max(line_start, start - 30)
        m = self._digit.search(body, start)
        hi = m.start() if m else start
        return self._main.search(region, lo, hi) is not None

    @staticmethod
    def _score(start: int, end: int, p: int, s: int, t: int | None, t3: int | None) -> Found:
        flags: list[str] = []
        total = p + s if t is None else t
        detail: dict[str, object] = {
            "primary": p,
            "secondary": s,
            "total": total,
            "tertiary": t3,
            "total_stated": t is not None,
        }
        if t is not None and t != p + s:
            # ISUP 2014: the score is the sum of the two patterns; report, never correct.
            flags.append("gleason_sum_mismatch")
        else:
            gg = grade_group(p, s)
            if gg is None:
                flags.append("grade_group_undefined")
            detail["_gg"] = gg
        return Found(start, end, f"{p}+{s}={total}", tuple(flags), detail)

    def _stated_groups(self, region: Region, scores: list[Found]) -> list[Value]:
        out: list[Value] = []
        for m in self._gg.match_at(region, self._at_gg.positions(region)):
            amb = self._ambiguous.match(region, m.start())
            if amb is not None and not region.report.mentions_any(self._gg_context):
                continue  # "ISUP grade" of a kidney tumour is a nucleolar grade
            g = self.numbers.parse_grade(m["g"])
            if g is None or not 1 <= g <= 5:
                continue
            flags: list[str] = []
            detail: dict[str, object] = {"derived": False}
            near = self._nearest_score(scores, region.body, m.start(), m.end())
            if near is not None:
                expected = grade_group(near.detail["primary"], near.detail["secondary"])
                detail["gleason"] = near.value
                if expected is not None and expected != g:
                    flags.append("grade_group_mismatch")
            out.append(region.value("grade_group", g, m.start(), m.end(), flags, detail))
        return out

    @staticmethod
    def _nearest_score(scores: list[Found], body: str, start: int, end: int) -> Found | None:
        """A consistent score written right beside a stated grade group, either side,
        with only brackets or punctuation between ("3+4=7 (Grade Group 2)")."""
        for f in scores:
            if f.value is None or "gleason_sum_mismatch" in f.flags:
                continue
            if f.end <= start:
                between = body[f.end : start]
            elif f.start >= end:
                between = body[end : f.start]
            else:
                continue
            if len(between) <= 12 and _ADJACENT.fullmatch(between):
                return f
        return None
