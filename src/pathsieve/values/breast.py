"""Breast values: Nottingham grade (Elston–Ellis 1991), ER/PR (ASCO/CAP 2020) and HER2
(ASCO/CAP 2018).

Nottingham: each component (tubules, nuclei, mitoses) scores 1–3; the sum 3–5 is
grade 1, 6–7 grade 2, 8–9 grade 3.  Components that do not add up to a stated
score are flagged ``nottingham_sum_mismatch``; a stated grade that disagrees with
its score is flagged ``nottingham_grade_mismatch``.  The stated grade is kept.

ER/PR: >= 1 % of tumour nuclei staining is positive; 1–10 % is "low positive"
(``detail["low_positive"]``).  A stated status that disagrees with the stated
percentage is kept and flagged ``receptor_status_percent_mismatch``.

HER2: IHC 0 and 1+ negative, 2+ equivocal, 3+ positive; an ISH result decides an
equivocal IHC (amplified -> positive, not amplified -> negative).  IHC and ISH
that disagree outside that case are flagged ``her2_ihc_ish_discordant``; a stated
status that disagrees with the scores is kept and flagged
``her2_status_score_mismatch``.

>>> from pathsieve.values import extract_values
>>> t = "ER positive (95%, strong); PR 5% weak; HER2 2+ equivocal; ISH amplified."
>>> for v in extract_values(t, [(0, len(t), "diagnosis", "")]):
...     print(v.key, v.value, repr(v.text))
er_status positive 'ER positive (95%, strong)'
pr_status positive 'PR 5% weak'
her2_status positive 'HER2 2+ equivocal; ISH amplified'
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import Any

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
    near_before,
)
from .lexicon import ValueLexicon

__all__ = [
    "HER2Reader",
    "NottinghamReader",
    "ReceptorReader",
    "her2_status",
    "nottingham_grade_from_score",
    "receptor_status_from_percent",
]

_S = r"[^\S\n]{0,3}"


# ======================================================================= Nottingham
def nottingham_grade_from_score(score: int) -> int | None:
    """Elston–Ellis (1991): 3–5 -> 1, 6–7 -> 2, 8–9 -> 3; None outside 3–9.

    >>> [nottingham_grade_from_score(s) for s in (3, 5, 6, 7, 8, 9)]
    [1, 1, 2, 2, 3, 3]
    """
    if 3 <= score <= 5:
        return 1
    if 6 <= score <= 7:
        return 2
    if 8 <= score <= 9:
        return 3
    return None


class NottinghamReader:
    """Reads ``nottingham_grade`` (detail: score, tubules, nuclei, mitoses)."""

    keys = ("nottingham_grade",)

    def __init__(self, lex: ValueLexicon) -> None:
        self.numbers = Numbers(lex)
        fam = "nottingham"
        names = alternation(lex.phrases(fam, "names"), lex.phrases(fam, "name_abbreviations"))
        grade_words = lex.phrases(fam, "grade_words")
        score_words = lex.phrases(fam, "score_words")
        self._score_words = {" ".join(w.split()) for w in score_words}
        gw = alternation(grade_words)
        sw = alternation(score_words)
        roman = self.numbers.roman_pattern
        triple = (
            r"(?P<a>[1-3])\s{0,2}\+\s{0,2}(?P<b>[1-3])\s{0,2}\+\s{0,2}(?P<c>[1-3])(?!\d)"
            r"(?:\s{0,2}=\s{0,2}(?P<ts>[3-9])(?:\s{0,2}/\s{0,2}9)?(?!\d))?"
        )
        number = rf"(?P<n>[1-9]{END_DIGIT}|{roman}(?![^\W_]))"
        of = r"(?:\s{0,2}(?:/|of|out\s+of)\s{0,2}(?P<of>9|3|iii)(?![\d\w]))?"
        tail = (
            rf"(?:{_S}\))?(?P<kw>(?:{_S}(?:{gw}|{sw})){{0,2}})"
            rf"{_S}[:=\-]?\s{{0,3}}(?P<kw2>(?:{gw}|{sw}){_S}(?:of{_S})?[:=]?\s{{0,3}})?"
            rf"(?:\(?{triple}\)?|{number}{of})"
        )
        # "Nottingham grade 2 ...", and "Histologic grade (Nottingham): 2"
        self._headed = (Rx(rf"{names}{tail}"), Rx(rf"{gw}{_S}[(,]?{_S}{names}{tail}"))
        self._generic = Rx(
            rf"{alternation(lex.phrases(fam, 'generic_headings'))}{_S}[:=\-]?\s{{0,3}}"
            rf"(?:{gw}{_S}[:=]?\s{{0,3}})?(?P<n>[1-3]{END_DIGIT}|{roman}(?![^\W_]))"
            rf"(?:\s{{0,2}}(?:/|of|out\s+of)\s{{0,2}}(?:3|iii)(?![\d\w]))?"
        )
        self._context = lex.phrases(fam, "context")
        bare = lex.phrases(fam, "bare_grade_words")
        self._bare = Rx(
            rf"{alternation(bare)}{_S}[:=\-]?\s{{0,2}}(?P<n>[1-3]{END_DIGIT}|{roman}(?![^\W_]))"
            rf"(?:\s{{0,2}}(?:/|of|out\s+of)\s{{0,2}}(?:3|iii)(?![\d\w]))?"
        )
        self._at_bare = Anchors(bare)
        self._bare_requires = Rx(alternation(lex.phrases(fam, "bare_grade_requires")))
        self._bare_excluded = Rx(
            rf"{alternation(lex.phrases(fam, 'bare_grade_exclusions'))}[\s,]{{0,3}}$"
        )
        comp_value = rf"{_S}[:=\-]?\s{{0,3}}(?:\(?{_S}{sw}{_S}(?:of{_S})?[:=]?\s{{0,3}})?"
        tub = alternation(lex.phrases(fam, "tubules"))
        nuc = alternation(lex.phrases(fam, "nuclei"))
        mit = alternation(lex.phrases(fam, "mitoses"))
        self._components = Rx(
            rf"{tub}{comp_value}(?P<t>[1-3]){END_DIGIT}[\s\S]{{0,100}}?"
            rf"{nuc}{comp_value}(?P<u>[1-3]){END_DIGIT}[\s\S]{{0,100}}?"
            rf"{mit}{comp_value}(?P<m>[1-3]){END_DIGIT}"
            rf"(?:[^\S\n]{{0,3}}\)?[,;.]?\s{{0,3}}(?:[^\d\n]{{0,30}}?){sw}{_S}[:=]?\s{{0,3}}"
            rf"(?P<s>[3-9]){END_DIGIT}(?:\s{{0,2}}/\s{{0,2}}9)?)?"
        )
        self._trail_score = Rx(
            rf"\s{{0,3}}[(,;]\s{{0,3}}(?:(?:{sw}){_S}(?:of|=|:)?\s{{0,3}}(?P<s>[3-9]){END_DIGIT}"
            rf"(?:\s{{0,2}}(?:/|of|out\s+of)\s{{0,2}}9)?|(?P<s2>[3-9])\s{{0,2}}(?:/|of|out\s+of)\s{{0,2}}9"
            rf"|(?P<s3>[3-9])\s{{0,2}}points)(?!\d)\s{{0,2}}\)?"
        )
        self._trail_triple = Rx(
            rf"\s{{0,3}}[(,;:]?\s{{0,3}}(?:{sw}{_S}[:=]?\s{{0,3}})?{triple}\s{{0,2}}\)?"
        )
        self._at_names = Anchors(lex.phrases(fam, "names"), lex.phrases(fam, "name_abbreviations"))
        self._at_grade_words = Anchors(grade_words)
        self._at_generic = Anchors(lex.phrases(fam, "generic_headings"))
        self._at_tubules = Anchors(lex.phrases(fam, "tubules"))
        #: every form starts at one of these (see :func:`~.common.gate`)
        self.gate = gate(
            self._at_names, self._at_grade_words, self._at_generic, self._at_bare, self._at_tubules
        )

    def read(self, region: Region) -> list[Value]:
        if not (
            self._at_names.positions(region)
            or self._at_grade_words.positions(region)
            or self._at_generic.positions(region)
            or self._at_bare.positions(region)
            or self._at_tubules.positions(region)
        ):
            return []  # every form starts at one of these words
        heads: list[Found] = []
        for rx, at in zip(self._headed, (self._at_names, self._at_grade_words)):
            for m in rx.match_at(region, at.positions(region)):
                f = self._from_head(m, region)
                if f is not None:
                    heads.append(f)
        generic = self._at_generic.positions(region)
        bare = self._at_bare.positions(region)
        if (generic or bare) and region.report.mentions_any(self._context):
            for m in self._generic.match_at(region, generic):
                self._add_grade(heads, m, region)
            for m in self._bare.match_at(region, bare):
                # "Invasive carcinoma, no special type, grade 2" but not "nuclear grade 2"
                body = region.body
                sent = max(body.rfind(". ", 0, m.start()) + 1, body.rfind("\n", 0, m.start()) + 1)
                sent = max(sent, m.start() - 120)
                if self._bare_requires.search(region, sent, m.start()) is None:
                    continue
                if (
                    self._bare_excluded.search(region, max(0, m.start() - 25), m.start())
                    is not None
                ):
                    continue
                self._add_grade(heads, m, region)
        heads = keep_non_overlapping(sorted(heads, key=lambda f: (f.start, -f.end)))
        comps: list[Found] = []
        for m in self._components.match_at(region, self._at_tubules.positions(region)):
            d: dict[str, Any] = {
                "tubules": int(m["t"]),
                "nuclei": int(m["u"]),
                "mitoses": int(m["m"]),
            }
            if m["s"]:
                d["score"] = int(m["s"])
            comps.append(Found(m.start(), m.end(), None, (), d))
        # A heading and its component lines, near each other, are one statement.
        merged: list[Found] = []
        used: set[int] = set()
        for h in heads:
            for i, c in enumerate(comps):
                if i in used or "tubules" in h.detail:
                    continue
                gap = c.start - h.end if c.start >= h.end else h.start - c.end
                if -1 < gap <= 300 or (c.start < h.end and h.start < c.end):
                    used.add(i)
                    h = self._union(h, c)
            merged.append(h)
        merged += [c for i, c in enumerate(comps) if i not in used]
        merged = keep_non_overlapping(sorted(merged, key=lambda f: f.start))
        out: list[Value] = []
        for f in merged:
            v = self._finish(f)
            if v is not None:
                out.append(region.found("nottingham_grade", v))
        return out

    def _add_grade(self, heads: list[Found], m: re.Match[str], region: Region) -> None:
        g = self.numbers.parse_grade(m["n"])
        if g is not None and 1 <= g <= 3:
            f = Found(m.start(), m.end(), g, (), {"grade": g})
            self._trail(f, region)
            heads.append(f)

    def _from_head(self, m: re.Match[str], region: Region) -> Found | None:
        detail: dict[str, Any] = {}
        if m["a"]:
            detail.update(tubules=int(m["a"]), nuclei=int(m["b"]), mitoses=int(m["c"]))
            if m["ts"]:
                detail["score"] = int(m["ts"])
            return Found(m.start(), m.end(), None, (), detail)
        n = self.numbers.parse_grade(m["n"])
        if n is None:
            return None
        kw = " ".join(((m["kw"] or "") + " " + (m["kw2"] or "")).lower().split())
        says_score = any(w in kw.split() or w == kw for w in self._score_words) or m["of"] == "9"
        if n > 3 and not says_score and kw:
            return None  # "Nottingham grade 4" is no grade
        if says_score or n > 3:
            if not 3 <= n <= 9:
                return None
            detail["score"] = n
        else:
            if not 1 <= n <= 3:
                return None
            detail["grade"] = n
        f = Found(m.start(), m.end(), None, (), detail)
        self._trail(f, region)
        return f

    def _trail(self, f: Found, region: Region) -> None:
        """Read "(score 6/9)" or "(3+2+1)" right after a grade."""
        window_end = min(len(region.body), f.end + 60)
        t = self._trail_triple.match(region, f.end, window_end)
        if t and "tubules" not in f.detail:
            f.detail.update(tubules=int(t["a"]), nuclei=int(t["b"]), mitoses=int(t["c"]))
            if t["ts"]:
                f.detail.setdefault("score", int(t["ts"]))
            f.end = t.end()
            return
        s = self._trail_score.match(region, f.end, window_end)
        if s and "score" not in f.detail:
            f.detail["score"] = int(s["s"] or s["s2"] or s["s3"])
            f.end = s.end()

    @staticmethod
    def _union(a: Found, b: Found) -> Found:
        detail = dict(b.detail)
        for k, v in a.detail.items():
            detail.setdefault(k, v)
        return Found(min(a.start, b.start), max(a.end, b.end), None, (), detail)

    @staticmethod
    def _finish(f: Found) -> Found | None:
        d = f.detail
        flags: list[str] = []
        comps = [d.get("tubules"), d.get("nuclei"), d.get("mitoses")]
        comp_sum = (
            sum(c for c in comps if c is not None) if all(c is not None for c in comps) else None
        )
        score = d.get("score")
        if comp_sum is not None and score is not None and comp_sum != score:
            flags.append("nottingham_sum_mismatch")
        basis = score if score is not None else comp_sum
        implied = nottingham_grade_from_score(basis) if basis is not None else None
        grade = d.get("grade")
        if grade is not None and implied is not None and grade != implied:
            flags.append("nottingham_grade_mismatch")
        value = grade if grade is not None else implied
        if value is None:
            return None
        detail = {
            "score": score if score is not None else comp_sum,
            "tubules": d.get("tubules"),
            "nuclei": d.get("nuclei"),
            "mitoses": d.get("mitoses"),
            "grade_stated": grade is not None,
        }
        return Found(f.start, f.end, value, tuple(flags), detail)


# ======================================================================= percentages
_PCT_NUM = r"\d{1,3}(?:\.\d{1,2})?"


@dataclass(frozen=True, slots=True)
class Percent:
    """A stated percentage: a number, an optional upper bound, an optional < or >."""

    value: float
    upper: float | None = None
    qualifier: str = ""  # "<", ">" or ""

    @property
    def low(self) -> float:
        return 0.0 if self.qualifier == "<" else self.value

    @property
    def high(self) -> float:
        if self.qualifier == ">":
            return 100.0
        return self.upper if self.upper is not None else self.value


def receptor_status_from_percent(p: Percent) -> str | None:
    """ASCO/CAP 2020: >= 1 % positive, < 1 % negative; None when a range straddles 1 %.

    >>> receptor_status_from_percent(Percent(0.5)), receptor_status_from_percent(Percent(1))
    ('negative', 'positive')
    >>> receptor_status_from_percent(Percent(1, qualifier="<"))
    'negative'
    """
    if p.qualifier == "<":
        return "negative" if p.value <= 1 else None
    if p.qualifier == ">":
        return "positive" if p.value >= 1 else None
    if p.high < 1:
        return "negative"
    if p.low >= 1:
        return "positive"
    return None


def _is_low_positive(p: Percent) -> bool:
    # ASCO/CAP 2020: 1-10 % staining is reported as "low positive".
    return p.qualifier != ">" and p.low >= 1 and p.high <= 10


def _fmt_num(x: float) -> float | int:
    return int(x) if float(x).is_integer() else x


# ======================================================================= ER / PR
@dataclass(slots=True)
class _Window:
    start: int
    end: int


class _Windowed:
    """Shared by ER/PR and HER2: the stretch of text that belongs to one anchor."""

    def __init__(
        self, stop: str, detail_lines: tuple[str, ...], *, stop_at_semicolon: bool
    ) -> None:
        self._stop = Rx(stop)
        self._detail = Rx(rf"[^\S\n]{{0,12}}[-*•·]?[^\S\n]{{0,3}}{alternation(detail_lines)}")
        ends = r"\n|\.(?=\s|$)" + (r"|;" if stop_at_semicolon else "")
        self._end = Rx(ends)

    def window(self, region: Region, start: int, limit: int = 160) -> _Window:
        """From ``start`` to the end of its sentence or line, the next anchor, or ``limit``.

        A following line that begins with a detail word ("Percentage of cells ...")
        is taken in as well.
        """
        body = region.body
        hard = min(len(body), start + limit)
        pos = start
        end = hard
        while pos < hard:
            m = self._end.search(region, pos, hard)
            if m is None:
                end = hard
                break
            end = m.start()
            if m.group(0) == "\n" and self._detail.match(region, m.end(), hard):
                pos = m.end()
                continue
            break
        s = self._stop.search(region, start, end)
        if s is not None:
            end = s.start()
        return _Window(start, end)


class ReceptorReader:
    """Reads ``er_status`` and ``pr_status`` (detail: percent, intensity, low_positive)."""

    keys = ("er_status", "pr_status")

    def __init__(self, lex: ValueLexicon) -> None:
        fam = "receptors"
        er = alternation(lex.phrases(fam, "er_names"), lex.phrases(fam, "er_abbreviations"))
        pr = alternation(lex.phrases(fam, "pr_names"), lex.phrases(fam, "pr_abbreviations"))
        both = alternation(lex.phrases(fam, "both_names"), lex.phrases(fam, "both_abbreviations"))
        paren = r"(?:[^\S\n]{0,2}\([^()\n]{1,25}\))?"
        self._both_rx, self._er_rx = Rx(both), Rx(er)
        anchor = rf"(?P<anchor>{both}|{er}|{pr}){paren}"
        self._anchor = Rx(anchor)
        pos = lex.phrases(fam, "positive")
        neg = lex.phrases(fam, "negative")
        low = lex.phrases(fam, "low_positive")
        self._low_words = {" ".join(w.split()) for w in low}
        self._neg_words = {" ".join(w.split()) for w in neg}
        status = alternation((*pos, *neg, *low))
        self._status = Rx(status)
        self._before = Rx(
            rf"(?P<st>{status})(?:{_S}(?:for|of)){_S}(?:nuclear{_S})?(?:expression{_S}of{_S})?"
            + anchor
        )
        self._sign = Rx(r"[^\S\n]?\(?(?P<sign>\+|-|−)\)?(?![\w+\-/])")
        less = alternation(lex.phrases("numbers", "less_than"))
        more = alternation(lex.phrases("numbers", "greater_than"))
        self._percent = Rx(
            rf"(?:(?P<lt>{less})|(?P<gt>{more}))?{_S}(?<![\d.])(?P<a>{_PCT_NUM})"
            rf"(?:{_S}(?:-|–|to){_S}(?P<b>{_PCT_NUM}))?{_S}%"
        )
        self._intensity_map = {
            " ".join(k.split()): v for k, v in lex.str_map(fam, "intensity").items()
        }
        self._intensity = Rx(alternation(self._intensity_map))
        self._allred = Rx(
            rf"{alternation(lex.phrases(fam, 'allred'))}{_S}(?:score)?{_S}[:=]?\s{{0,3}}"
            rf"(?P<al>[0-8])(?!\d)(?:\s{{0,2}}/\s{{0,2}}8)?"
        )
        stop = alternation(
            (
                *lex.phrases(fam, "stop_names"),
                *lex.phrases(fam, "er_names"),
                *lex.phrases(fam, "pr_names"),
            ),
            (*lex.phrases(fam, "er_abbreviations"), *lex.phrases(fam, "pr_abbreviations")),
        )
        self._win = _Windowed(stop, lex.phrases(fam, "detail_lines"), stop_at_semicolon=True)
        self._at_names = Anchors(
            (
                *lex.phrases(fam, "er_names"),
                *lex.phrases(fam, "pr_names"),
                *lex.phrases(fam, "both_names"),
            ),
            (
                *lex.phrases(fam, "er_abbreviations"),
                *lex.phrases(fam, "pr_abbreviations"),
                *lex.phrases(fam, "both_abbreviations"),
            ),
        )
        self._at_status = Anchors((*pos, *neg, *low))
        #: every form starts at a name (see :func:`~.common.gate`)
        self.gate = gate(self._at_names)

    def read(self, region: Region) -> list[Value]:
        names = self._at_names.positions(region)
        if not names:
            return []
        out: list[Value] = []
        taken: list[tuple[int, int]] = []
        # "positive for estrogen receptor (90%)"
        for m in self._before.match_at(
            region, near_before(self._at_status.positions(region), names, 60)
        ):
            kinds = self._kinds(m, region)
            st = self._norm_status(m["st"])
            w = self._win.window(region, m.end(), 80)
            f = self._read_window(region, m.start(), m.end("anchor"), w, st)
            if f is not None:
                taken.append((m.start(), f.end))
                out.extend(region.found(k, f) for k in kinds)
        # "ER: positive (95%, strong)", "PR 5% weak", "ER+"
        for m in self._anchor.match_at(region, names):
            if any(a <= m.start() < b for a, b in taken):
                continue
            kinds = self._kinds(m, region)
            # the bracket after the name may hold the result ("ER (90%)"), but it may
            # also name the receptor again ("Progesterone receptor (PR): negative")
            w = self._win.window(region, m.end())
            f = self._read_window(region, m.start(), m.end("anchor"), w, None)
            if f is not None:
                out.extend(region.found(k, f) for k in kinds)
        return out

    def _kinds(self, m: re.Match[str], region: Region) -> tuple[str, ...]:
        at, end = m.start("anchor"), m.end("anchor")
        both = self._both_rx.match(region, at, end)
        if both is not None and both.end() == end:
            return ("er_status", "pr_status")
        er = self._er_rx.match(region, at, end)
        return ("er_status",) if er is not None and er.end() == end else ("pr_status",)

    def _norm_status(self, word: str) -> str:
        w = " ".join(word.lower().split()).replace("-", " ")
        if w in {x.replace("-", " ") for x in self._low_words}:
            return "low positive"
        return "negative" if w in {x.replace("-", " ") for x in self._neg_words} else "positive"

    def _read_window(
        self, region: Region, start: int, anchor_end: int, w: _Window, stated: str | None
    ) -> Found | None:
        end = anchor_end
        if stated is None:
            sm = self._sign.match(region, anchor_end, w.end)
            if sm:
                stated = "negative" if sm["sign"] != "+" else "positive"
                end = sm.end()
            else:
                st = self._status.search(region, anchor_end, w.end)
                # The status must come early: "ER ... (80 characters) ... positive" is
                # more likely about something else.
                if st is not None and st.start() - anchor_end <= 40:
                    stated = self._norm_status(st.group(0))
                    end = st.end()
        pm = self._percent.search(region, anchor_end, w.end)
        pct: Percent | None = None
        if pm is not None and (stated is not None or pm.start() - anchor_end <= 30):
            q = "<" if pm["lt"] else ">" if pm["gt"] else ""
            pct = Percent(float(pm["a"]), float(pm["b"]) if pm["b"] else None, q)
            end = max(end, pm.end())
        if stated is None and pct is None:
            return None
        detail: dict[str, Any] = {"percent": None, "intensity": None, "low_positive": False}
        flags: list[str] = []
        by_pct = receptor_status_from_percent(pct) if pct is not None else None
        if stated is None:
            if by_pct is None:
                return None
            value = by_pct
        else:
            value = "positive" if stated == "low positive" else stated
            if by_pct is not None and by_pct != value:
                flags.append("receptor_status_percent_mismatch")
        if pct is not None:
            detail["percent"] = _fmt_num(pct.value)
            if pct.upper is not None:
                detail["percent_max"] = _fmt_num(pct.upper)
            if pct.qualifier:
                detail["percent_qualifier"] = pct.qualifier
        if value == "positive" and (
            stated == "low positive" or (pct is not None and _is_low_positive(pct))
        ):
            detail["low_positive"] = True
        im = self._intensity.search(region, anchor_end, w.end)
        if im is not None:
            detail["intensity"] = self._intensity_map.get(" ".join(im.group(0).lower().split()))
            end = max(end, im.end())
        am = self._allred.search(region, anchor_end, w.end)
        if am is not None:
            detail["allred"] = int(am["al"])
            end = max(end, am.end())
        return Found(start, end, value, tuple(flags), detail)


# ======================================================================= HER2
_IHC_STATUS = {"0": "negative", "1+": "negative", "2+": "equivocal", "3+": "positive"}
_ISH_STATUS = {"amplified": "positive", "not amplified": "negative"}


def her2_status(
    ihc: str | None, ish: str | None, stated: str | None = None
) -> tuple[str | None, tuple[str, ...]]:
    """(status, flags) by ASCO/CAP 2018 from an IHC score, an ISH result and a stated word.

    >>> her2_status("2+", "amplified")
    ('positive', ())
    >>> her2_status("2+", None)
    ('equivocal', ())
    >>> her2_status("1+", None, "positive")
    ('positive', ('her2_status_score_mismatch',))
    """
    flags: list[str] = []
    derived: str | None = None
    if ihc is not None and ish is not None:
        if ihc == "2+":
            derived = _ISH_STATUS[ish]
        else:
            derived = _IHC_STATUS[ihc]
            if derived != _ISH_STATUS[ish]:
                flags.append("her2_ihc_ish_discordant")
                derived = "positive" if ihc == "3+" or ish == "amplified" else "negative"
    elif ihc is not None:
        derived = _IHC_STATUS[ihc]
    elif ish is not None:
        derived = _ISH_STATUS[ish]
    if stated is None or stated == derived:
        return derived, tuple(flags)
    if derived is None:
        return stated, tuple(flags)
    if stated == "equivocal" and ihc == "2+" and ish is not None:
        return derived, tuple(flags)  # the ISH result decides an equivocal IHC
    flags.append("her2_status_score_mismatch")
    return stated, tuple(flags)


@dataclass(slots=True)
class _Clause:
    start: int
    end: int
    ihc: str | None = None
    ish: str | None = None
    stated: str | None = None
    ish_stated: str | None = None
    ratio: float | None = None
    extra: dict[str, Any] = field(default_factory=dict)


class HER2Reader:
    """Reads ``her2_status`` (detail: ihc, ish, ratio)."""

    keys = ("her2_status",)

    def __init__(self, lex: ValueLexicon) -> None:
        fam = "her2"
        names = alternation(lex.phrases(fam, "names"), lex.phrases(fam, "name_abbreviations"))
        ihc_name = alternation(lex.phrases(fam, "ihc_names"), lex.phrases(fam, "ihc_abbreviations"))
        ish_name = alternation(lex.phrases(fam, "ish_names"), lex.phrases(fam, "ish_abbreviations"))
        self._anchor = Rx(
            # "HER2/CEP17 ratio" names a ratio, not a new statement about HER2
            rf"{names}(?![^\S\n]?[/:][^\S\n]?(?:cep|chr|d17))"
            rf"(?:[^\S\n]{{0,2}}\((?P<paren>[^()\n]{{1,30}})\))?"
        )
        self._ish_name = Rx(ish_name)
        self._ihc_name = Rx(ihc_name)
        score = alternation(lex.phrases(fam, "score_words"))
        self._ihc = Rx(
            rf"(?<![\d.+])(?P<i>[0-3])[^\S\n]?\+(?![\d+])"
            rf"|(?:{score}|{ihc_name}\)?)[^\S\n]{{0,3}}[:=]?[^\S\n]{{0,3}}(?P<z>0)(?![\d%+/]|[.,]\d)"
        )
        self._zero_first = Rx(r"[^\S\n]{0,2}[:=\-]?[^\S\n]{0,3}(?P<z>0)(?![\d%+/]|[.,]\d)")
        self._sign = Rx(r"[^\S\n]?\(?(?P<sign>\+|-|−)\)?(?![\w+\-/])")
        self._pos = {" ".join(w.split()) for w in lex.phrases(fam, "positive")}
        self._neg = {" ".join(w.split()) for w in lex.phrases(fam, "negative")}
        self._status = Rx(
            alternation(
                (
                    *lex.phrases(fam, "positive"),
                    *lex.phrases(fam, "negative"),
                    *lex.phrases(fam, "equivocal"),
                )
            )
        )
        amp = lex.phrases(fam, "amplified")
        notamp = lex.phrases(fam, "not_amplified")
        self._notamp = {" ".join(w.split()) for w in notamp}
        self._amp = Rx(alternation((*amp, *notamp)))
        self._ratio = Rx(
            rf"{alternation(lex.phrases(fam, 'ratio_words'))}{_S}(?:\([^()\n]{{0,20}}\){_S})?[:=]?{_S}"
            rf"(?:of{_S})?(?P<r>\d{{1,2}}(?:\.\d{{1,3}})?)(?![\d])"
        )
        stop = alternation(
            (*lex.phrases(fam, "stop_names"),), (*lex.phrases(fam, "stop_abbreviations"),)
        )
        self._win = _Windowed(stop, lex.phrases(fam, "detail_lines"), stop_at_semicolon=False)
        self._at_names = Anchors(lex.phrases(fam, "names"), lex.phrases(fam, "name_abbreviations"))
        #: every form starts at a name (see :func:`~.common.gate`)
        self.gate = gate(self._at_names)

    def read(self, region: Region) -> list[Value]:
        positions = self._at_names.positions(region)
        if not positions:
            return []
        body = region.body
        clauses: list[_Clause] = []
        anchors = list(self._anchor.match_at(region, positions))
        for i, m in enumerate(anchors):
            w = self._win.window(region, m.end())
            nxt = anchors[i + 1].start() if i + 1 < len(anchors) else len(body)
            c = self._clause(region, m, min(w.end, nxt))
            if c is not None:
                clauses.append(c)
        out: list[Value] = []
        for c in self._merge(clauses):
            value, flags = her2_status(c.ihc, c.ish, c.ish_stated or c.stated)
            if value is None:
                continue
            detail = {"ihc": c.ihc, "ish": c.ish, "ratio": c.ratio}
            out.append(region.value("her2_status", value, c.start, c.end, flags, detail))
        return out

    def _clause(self, region: Region, m: re.Match[str], wend: int) -> _Clause | None:
        a = m.end()
        c = _Clause(m.start(), a)
        paren = m["paren"] or ""
        ish_named = bool(paren and self._ish_name.search(region, m.start("paren"), m.end("paren")))
        ends = [a]
        im = self._ihc.search(region, a, wend)
        if im is not None:
            c.ihc = f"{im['i']}+" if im["i"] else "0"
            ends.append(im.end())
        else:
            z = self._zero_first.match(region, a, wend)
            if z is not None:
                c.ihc = "0"
                ends.append(z.end())
        st = self._status.search(region, a, wend)
        if st is not None and st.start() - a <= 60:
            c.stated = self._norm(st.group(0))
            ends.append(st.end())
        elif c.ihc is None:
            sg = self._sign.match(region, a, wend)
            if sg is not None:
                c.stated = "negative" if sg["sign"] != "+" else "positive"
                ends.append(sg.end())
        am = self._amp.search(region, a, wend)
        if am is not None:
            word = " ".join(am.group(0).lower().split())
            c.ish = "not amplified" if word in self._notamp else "amplified"
            ends.append(am.end())
        rm = self._ratio.search(region, a, wend)
        if rm is not None:
            c.ratio = float(rm["r"])
            ends.append(rm.end())
        if ish_named or (self._ish_name.search(region, a, wend) and c.ihc is None):
            # A clause about ISH: its status word is the ISH result.
            c.ish_stated, c.stated = c.stated, None
            if c.ish is None and c.ish_stated in ("positive", "negative"):
                c.ish = "amplified" if c.ish_stated == "positive" else "not amplified"
        if c.ihc is None and c.ish is None and c.stated is None:
            return None
        c.end = max(ends)
        return c

    def _norm(self, word: str) -> str:
        w = " ".join(word.lower().split())
        if w in self._pos:
            return "positive"
        if w in self._neg:
            return "negative"
        return "equivocal"

    @staticmethod
    def _merge(clauses: list[_Clause]) -> list[_Clause]:
        """An ISH-only clause joins a neighbouring IHC-only clause (either order)."""
        out: list[_Clause] = []
        for c in clauses:
            prev = out[-1] if out else None
            if (
                prev is not None
                and c.start - prev.end <= 300
                and (
                    (
                        prev.ihc is not None
                        and prev.ish is None
                        and c.ihc is None
                        and c.ish is not None
                    )
                    or (
                        prev.ish is not None
                        and prev.ihc is None
                        and c.ihc is not None
                        and c.ish is None
                    )
                )
            ):
                prev.end = c.end
                prev.ihc = prev.ihc or c.ihc
                prev.ish = prev.ish or c.ish
                prev.ish_stated = prev.ish_stated or c.ish_stated
                prev.stated = prev.stated or c.stated
                prev.ratio = prev.ratio if prev.ratio is not None else c.ratio
                continue
            out.append(c)
        return out
