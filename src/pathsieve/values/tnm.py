"""Pathological T, N and M categories (AJCC Cancer Staging Manual, 8th edition).

Values keep their prefixes and suffixes: ``"ypT0"``, ``"rpT2"``, ``"pT1b(m)"``,
``"pN0(i+)"``, ``"pN1mi"``, ``"pN1(sn)"``, ``"pM1c"``.  Rules:

- A category without its own prefix inside a staging string takes the prefix of
  the string ("pT3 N1b MX" -> pT3, pN1b); a string with no prefix at all
  ("T3N0") is read as pathological with the flag ``prefix_assumed``.
- ``MX``/``pMX`` is not a valid category since the 7th edition: no ``pm`` value.
- M0 is a clinical category (there is no pM0): "M0" and "pM0" give ``"cM0"``,
  the latter flagged ``pm0_not_valid``.
- Clinical strings ("cT2 N0", "clinically T2N0") are not read.
- A category written with two subcategories ("pT3c/d", "pN1a/b") is read as
  the category they share ("pT3"), flagged ``subcategory_uncertain``.
- OCR digits inside a category ("pNO", "pTIc", "pNlb") are read with the flag
  ``ocr_corrected``; only where the letter N/T/M makes the category certain: a
  prefix, a staging heading ("Pathological stage TINIMX"), or a string that goes
  on glued or after a slash ("T2aNOMIa", "pT2bNOM-n/a", "T2a2/NO") or with UICC's
  L/V/R descriptors ("pT2 NO LO VO RO").

>>> from pathsieve.values import extract_values
>>> t = "Pathologic stage: pT3 N1b MX"
>>> [(v.key, v.value, v.text) for v in extract_values(t, [(0, len(t), "diagnosis", "")])]
[('pt', 'pT3', 'pT3'), ('pn', 'pN1b', 'N1b')]
"""

from __future__ import annotations

import re
from bisect import bisect_left
from collections.abc import Iterator
from typing import Any

from ..records import Value
from .common import Anchors, Found, Region, Rx, alternation, keep_non_overlapping
from .lexicon import ValueLexicon

__all__ = ["TNMReader"]

_PFX = r"(?:[yY][pP]|[rR][pP]|[aA][pP]|[yY][cC]|[pP]|[cC])"
_PATHOLOGICAL = frozenset({"p", "yp", "rp", "ap"})
#: How far past a T/N/M letter its look-ahead (in ``TNMReader._cands``) may read.
_LOOKAHEAD = 4


class TNMReader:
    """Reads ``pt``, ``pn`` and ``pm``."""

    keys = ("pt", "pn", "pm")

    def __init__(self, lex: ValueLexicon) -> None:
        self._ocr = dict(lex.str_map("tnm", "ocr_digits"))
        ocr = "[" + "".join(re.escape(c) for c in self._ocr) + "]"
        # After an OCR letter the category must end the string or meet the next one,
        # so "pT2 No evidence of ..." is not read as pN0.
        # (the next category may be OCR'd too, "TINIMX"; UICC's L, V and R descriptors
        # may follow, "pT2 NO LO VO RO")
        ocr_tail = (
            rf"[ \t]{{0,3}}(?:[,;:.)(/\n]|$|[pPcC]?[NM][ ]?(?:[0-3Xx]|{ocr})"
            rf"|[LVR][ ]?(?:[0-2]|{ocr})(?![A-Za-z0-9]))"
        )
        ocr_end = rf"(?={ocr_tail})"
        # A category with its own prefix ("pNO", "pNl") is certain enough that any
        # word end may follow it: "pNO RO", "pNO Stage IB", "pNI VI".
        ocr_word_end = r"(?![A-Za-z0-9])"
        t_cat = (
            rf"(?P<tc>(?i:is)(?![a-z])|[Xx]|a(?![A-Za-z])"
            rf"|(?P<td>[0-4]|{ocr}(?=[a-dA-D](?![a-z])|{ocr_tail}))(?P<tsub>mi(?![a-z])|[a-dA-D](?:[1-3](?!\d))?|[ ][a-d](?:[12](?!\d))?(?![A-Za-z0-9]))?)"
            r"(?P<tm>[ ]?\((?:m|\d{1,2})\))?"
            r"(?P<talt>/[a-dA-D](?![A-Za-z]))?(?=$|[^A-Za-z0-9]|[NM])"
        )

        def n_category(end: str) -> str:
            return (
                rf"(?P<nc>[Xx]|(?P<nd>[0-3]|{ocr}(?:(?=[a-cA-C](?![A-Za-z0-9]))|{end}))"
                r"(?P<nsub>mi(?![a-z])|[a-cA-C](?![a-z]))?)"
                r"(?P<nsuf>(?:[ ]?\((?:i[+-]|mol[+-]|sn|f)\)){0,2})"
                r"(?P<nalt>/[a-cA-C](?![A-Za-z]))?(?=$|[^A-Za-z0-9]|[MRLV])"
            )

        # An N glued to its T ("pT2NO", "T2NO squamous cell carcinoma") is certain
        # enough for a word end to follow its OCR letter, as after a prefix.
        letters = "".join(re.escape(c) for c in self._ocr)
        # ... or to it by a slash ("T2a2/NO FIGO IIA2"); M, R, L or V may follow it
        # glued ("pT2bNOM-n/a").
        glued = rf"(?<=[0-9a-dA-D{letters}/]N{ocr})"
        n_cat = n_category(rf"(?:{glued}(?=[MRLV]|{ocr_word_end})|{ocr_end})")
        m_cat = (
            rf"(?P<mc>[Xx]|(?P<md>[01]|{ocr}(?:(?=[a-dA-D](?![A-Za-z0-9]))|{ocr_end}))"
            r"(?P<msub>[a-dA-D](?![a-z]))?)"
            r"(?=$|[^A-Za-z0-9]|[RLV])"
        )
        t_tok = rf"(?P<tpre>{_PFX})?(?(tpre)[ ]?)T[ ]?{t_cat}"
        n_tok = rf"(?P<npre>{_PFX})?(?(npre)[ ]?)N[ ]?{n_cat}"
        m_tok = rf"(?P<mpre>{_PFX})?(?(mpre)[ ]?)M[ ]?{m_cat}"
        sep = r"[ \t,;/]{0,3}"
        nodes = r"(?:\(\d{1,3}/\d{1,3}\)[ \t,;]{0,3})?"
        lb = r"(?<![A-Za-z0-9])"
        # a category "not otherwise specified" ("T2,NOS N0 M0") goes on to the next
        nos = r"(?:[ ]?,[ ]?NOS(?![A-Za-z]))?"
        self._string = re.compile(
            # no boundary needed before N and M: the T category already ended ("pT2bN0M0")
            rf"{lb}(?P<T>{t_tok}){nos}(?:{sep}(?P<N>{n_tok}))?(?:{sep}{nodes}(?P<M>{m_tok}))?"
        )
        # Alone, an N or M needs its prefix: "No" and "MX" are too often other words.
        self._n_alone = re.compile(
            rf"{lb}(?P<N>(?P<npre>{_PFX})[ ]?N[ ]?{n_category(ocr_word_end)})"
        )
        self._m_alone = re.compile(rf"{lb}(?P<M>(?P<mpre>{_PFX})[ ]?M[ ]?{m_cat})")
        # The letters T, N and M find the places worth trying (a plain-character scan
        # is far faster than trying the full pattern everywhere).
        self._cands = {
            "T": re.compile(rf"T(?=[ ]?(?:[0-4Xxa]|[iI][sS]|{ocr}))"),
            "N": re.compile(rf"N(?=[ ]?(?:[0-3Xx]|{ocr}))"),
            "M": re.compile(rf"M(?=[ ]?(?:[01Xx]|{ocr}))"),
        }

        def heading(name: str) -> tuple[Rx, Anchors]:
            words = lex.phrases("tnm", name)
            return Rx(rf"{alternation(words)}[ \t]{{0,3}}[:=\-]?[ \t]{{0,5}}"), Anchors(words)

        self._heads = (
            (*heading("t_headings"), re.compile(rf"(?P<T>{t_tok})"), "T"),
            (*heading("n_headings"), re.compile(rf"(?P<N>{n_tok})"), "N"),
            (*heading("m_headings"), re.compile(rf"(?P<M>{m_tok})"), "M"),
        )
        self._stage_head = Rx(rf"{alternation(lex.phrases('tnm', 'stage_headings'))}[^\n]{{0,40}}$")
        # a column heading "Pathological T" on one of the two lines above a row
        columns = []
        for phrase in lex.phrases("tnm", "table_headings"):
            *words, letter = phrase.split()
            lead = r"[ \t]*".join(re.escape(w) for w in words)
            columns.append(rf"(?i:{lead})[ \t]?{re.escape(letter.upper())}(?![a-z])")
        self._table_head = re.compile("|".join(columns)) if columns else None
        self._clinical = re.compile(
            rf"{alternation(lex.phrases('tnm', 'clinical_words'))}[^\n]{{0,12}}$", re.IGNORECASE
        )

    # -----------------------------------------------------------------------------
    def read(self, region: Region) -> list[Value]:
        body = region.body
        if "T" not in body and "N" not in body and "M" not in body:
            return []
        letters = {axis: self._letters(region, axis) for axis in "TNM"}
        heads = [at.positions(region) for _, at, _, _ in self._heads]
        if not any(letters.values()) and not any(heads):
            return []  # every form starts at a heading or at a category's letter
        found: list[tuple[str, Found]] = []
        # Priority: headings, staging strings, lone prefixed N and M.
        for (head, _, token, axis), at in zip(self._heads, heads):
            for h in head.match_at(region, at):
                m = token.match(body, h.end())
                if m is not None:
                    f = self._category(m, axis, inherited="p", assumed=False)
                    if f is not None:
                        found.append((axis, f))
        for m in self._candidates(self._string, letters["T"], body):
            found.extend(self._staging(m, region))
        for pattern, axis in ((self._n_alone, "N"), (self._m_alone, "M")):
            for m in self._candidates(pattern, letters[axis], body):
                if not m[axis.lower() + "pre"]:
                    continue
                f = self._category(m, axis, inherited=None, assumed=False)
                if f is not None:
                    found.append((axis, f))
        keys = {"T": "pt", "N": "pn", "M": "pm"}
        kept = keep_non_overlapping([f for _, f in found])
        ids = {id(f) for f in kept}
        out = []
        for axis, f in found:
            if id(f) in ids and f.value is not None:
                out.append(region.found(keys[axis], f))
        return out

    def _letters(self, region: Region, letter: str) -> list[int]:
        """Where a T/N/M letter starts a category in the region (region-relative).

        The letters are found once in the whole report; the look-ahead after a letter
        near the region's end is checked again on the region (it may not run past it).
        """
        memo = region.report.cache
        key = (id(self), letter)
        every = memo.get(key)
        if every is None:
            every = memo[key] = [
                c.start() for c in self._cands[letter].finditer(region.report.text)
            ]
        if not every:
            return every
        rs, re_ = region.start, region.end
        lo = bisect_left(every, rs)
        hi = bisect_left(every, re_, lo)
        if lo == hi:
            return []
        scan = self._cands[letter].match
        body = region.body
        return [
            c - rs for c in every[lo:hi] if c + _LOOKAHEAD < re_ or scan(body, c - rs) is not None
        ]

    @staticmethod
    def _candidates(
        pattern: re.Pattern[str], letters: list[int], body: str
    ) -> Iterator[re.Match[str]]:
        """Matches of ``pattern`` around each T/N/M letter (a prefix starts up to 3 before)."""
        last = 0
        for i in letters:
            if i < last:
                continue
            for start in range(max(last, i - 3), i + 1):
                m = pattern.match(body, start)
                if m is not None and m.end() > i:
                    yield m
                    last = m.end()
                    break

    def _staging(self, m: re.Match[str], region: Region) -> list[tuple[str, Found]]:
        body = region.body
        pre = (m["tpre"] or "").lower()
        line_start = body.rfind("\n", 0, m.start()) + 1
        # "pTNM: T2 N0 MX": the heading says pathological
        headed = not pre and (
            self._stage_head.search(region, max(line_start, m.start() - 60), m.start())
            or self._under_table_head(body, line_start)
        )
        if not m["N"] and not m["M"] and not pre and not headed:
            return []  # a lone "T2" is too often something else (MRI, vertebra)
        if pre and pre not in _PATHOLOGICAL:
            # a clinical string: its parts are not pathological categories; keep the
            # span so that "cN0" is not read alone either
            return [("T", Found(m.start(), m.end(), None))]
        if not pre and not headed:
            if self._clinical.search(body, line_start, m.start()):
                return [("T", Found(m.start(), m.end(), None))]
            digits = [d for d in (m["td"], m["nd"], m["md"]) if d]
            if any(d in self._ocr for d in digits) and (
                len(digits) < 2 or all(d in self._ocr for d in digits)
            ):
                # OCR letters where no prefix makes the string certain: only inside a
                # string of two or more categories with a real digit ("T2NOMX", "T4N2Ml")
                return []
        inherited = pre or "p"
        assumed = not pre and not headed
        out: list[tuple[str, Found]] = []
        for axis in ("T", "N", "M"):
            if m[axis]:
                f = self._category(m, axis, inherited=inherited, assumed=assumed)
                if f is not None:
                    out.append((axis, f))
        return out

    def _under_table_head(self, body: str, line_start: int) -> bool:
        """Whether one of the two lines above ``line_start`` heads a pathological T column."""
        if self._table_head is None or line_start == 0:
            return False
        above = body.rfind("\n", 0, line_start - 1)
        above = body.rfind("\n", 0, above) if above > 0 else -1
        lo = max(above + 1, line_start - 400)
        return self._table_head.search(body, lo, line_start) is not None

    def _digit(self, ch: str, flags: list[str]) -> str:
        if ch in self._ocr:
            flags.append("ocr_corrected")
            return self._ocr[ch]
        return ch

    def _category(
        self, m: re.Match[str], axis: str, *, inherited: str | None, assumed: bool
    ) -> Found | None:
        a = axis.lower()
        raw = m[axis]
        written = (m[a + "pre"] or "").lower()
        if written and written not in _PATHOLOGICAL and not (axis == "M" and written == "c"):
            return Found(m.start(axis), m.end(axis), None)
        prefix = written or inherited
        if prefix is None:
            return None
        flags: list[str] = []
        if assumed and not written:
            flags.append("prefix_assumed")
        cat = m[a + "c"]
        value: str | None
        if axis == "T":
            value = self._t_value(m, flags)
        elif axis == "N":
            value = self._n_value(m, flags)
        else:
            value = self._m_value(cat, m["md"], m["msub"], written, flags)
            prefix = "c" if value is not None and value.startswith("M0") else prefix
        if value is None:
            return None
        detail: dict[str, Any] = {"prefix": written, "raw": raw}
        return Found(m.start(axis), m.end(axis), f"{prefix}{value}", tuple(flags), detail)

    def _t_value(self, m: re.Match[str], flags: list[str]) -> str | None:
        cat = m["tc"]
        mult = (m["tm"] or "").replace(" ", "")
        if cat.lower() == "is":
            return "Tis" + mult
        if cat in ("X", "x"):
            return "TX"
        if cat == "a":
            return "Ta" + mult
        digit = self._digit(m["td"], flags)
        sub = (m["tsub"] or "").replace(" ", "").lower()
        if m["talt"]:
            # "pT3c/d": one of two subcategories -- the category both share
            if len(sub) != 1 or not sub.isalpha():
                return None
            sub = ""
            flags.append("subcategory_uncertain")
        if digit == "0" and sub:
            return None  # T0 has no subcategories
        if sub == "mi" and digit != "1":
            return None  # only T1mi exists
        if len(sub) == 2 and sub[1].isdigit() and sub[0] not in "ab":
            return None  # numbered subdivisions exist for a/b only (e.g. cervix T1a1, T1b2)
        return f"T{digit}{sub}{mult}"

    def _n_value(self, m: re.Match[str], flags: list[str]) -> str | None:
        cat = m["nc"]
        suffix = (m["nsuf"] or "").replace(" ", "").lower()
        if cat in ("X", "x"):
            return "NX" + suffix
        digit = self._digit(m["nd"], flags)
        sub = (m["nsub"] or "").lower()
        if m["nalt"]:
            if len(sub) != 1 or not sub.isalpha():
                return None
            sub = ""
            flags.append("subcategory_uncertain")
        if digit == "0" and sub:
            return None
        if sub == "mi" and digit != "1":
            return None  # only N1mi exists
        if digit != "0" and any(s in suffix for s in ("(i", "(mol")):
            return None  # isolated tumour cells / molecular findings qualify N0 only
        return f"N{digit}{sub}{suffix}"

    def _m_value(
        self, cat: str, digit_raw: str | None, sub_raw: str | None, written: str, flags: list[str]
    ) -> str | None:
        if cat in ("X", "x"):
            return None  # MX is not a valid category (AJCC 7th and 8th editions)
        digit = self._digit(digit_raw or "", flags)
        sub = (sub_raw or "").lower()
        if digit == "0":
            if sub:
                return None
            if written in _PATHOLOGICAL:
                flags.append("pm0_not_valid")  # pM0 does not exist; M0 is clinical
            return "M0"
        return f"M{digit}{sub}"
