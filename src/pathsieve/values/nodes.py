"""Lymph-node counts: ``lymph_nodes_positive`` and ``lymph_nodes_examined``.

Both values of one statement share its offsets ("2/15 lymph nodes" gives two
values on the same span).  More positive than examined nodes is reported with
the flag ``nodes_positive_exceed_examined`` on both values, never corrected.

Not read, on purpose: counts of one nodal station or group ("Number of N2 lymph
nodes examined: 7", "sentinel lymph nodes: 2") since they are partial; a
positive count with no total in prose ("carcinoma in three lymph nodes").
"No lymph nodes identified" gives ``lymph_nodes_examined = 0`` only.

>>> from pathsieve.values import extract_values
>>> t = "Metastatic carcinoma in two of fifteen lymph nodes (2/15)."
>>> [(v.key, v.value, v.text) for v in extract_values(t, [(0, len(t), "diagnosis", "")])]
[('lymph_nodes_positive', 2, 'two of fifteen lymph nodes (2/15)'), ('lymph_nodes_examined', 15, 'two of fifteen lymph nodes (2/15)')]
"""

from __future__ import annotations

import re
from typing import Any

from ..records import Value
from .common import (
    Anchors,
    Found,
    Numbers,
    Region,
    Rx,
    alternation,
    keep_non_overlapping,
    near,
    near_before,
)
from .lexicon import ValueLexicon

__all__ = ["NodeReader"]

_S = r"[^\S\n]{0,3}"
_PAREN_DIGITS = r"(?:\s{0,2}\(\s{0,2}\d{1,3}\s{0,2}\))?"  # "two (2)"
_ADJ = r"(?:\s{1,3}[a-z][a-z\-]{1,20}){0,3}?"  # "intrapulmonary peribronchial"
_CLAUSE_BREAK = re.compile(r"[.;\n]\s|\n|;|\d")  # what a statement and its fraction may not span


class NodeReader:
    """Reads lymph-node counts (positive / examined)."""

    keys = ("lymph_nodes_positive", "lymph_nodes_examined")

    def __init__(self, lex: ValueLexicon) -> None:
        fam = "nodes"
        self.numbers = Numbers(lex)
        count = self.numbers.count
        node = alternation(lex.phrases(fam, "node_words"), lex.phrases(fam, "node_abbreviations"))
        self._node = Rx(node)
        pos = alternation(lex.phrases(fam, "positive"))
        exam_words = lex.phrases(fam, "examined")
        self._exam_words = {" ".join(w.split()) for w in exam_words}
        exam = alternation(exam_words)
        neg_find = alternation(lex.phrases(fam, "negative_findings"))
        neg_after = alternation(lex.phrases(fam, "negative_after"))
        neg_adj = alternation(lex.phrases(fam, "negative_adjectives"))
        qual = alternation(lex.phrases(fam, "count_qualifiers"))
        heads = alternation(lex.phrases(fam, "count_heads"))
        # "2/15", "(0/14)"
        self._frac = Rx(
            r"(?P<p>\d(?<![\d/.:]\d)\d{0,2})\s{0,2}/\s{0,2}(?P<e>\d{1,3})(?![\d/%]|[.:]\d)"
        )
        self._pn = re.compile(r"(?<![A-Za-z0-9])(?:y?p)?N[0-3OX](?:mi|[a-c])?(?![A-Za-z0-9])")
        tail = (
            rf"{_S}(?:\([^()\n]{{0,20}}\){_S})?(?:[:=]|is|are|were|:{_S}is)\s{{0,5}}(?P<n>{count})"
            r"(?![\d/]|\s?(?:mm|cm|%))"
        )
        # "Number of lymph nodes examined: 12", "Lymph nodes positive: 0"
        self._count_node = Rx(
            rf"(?:(?P<head>{heads}){_S})?(?:{qual}{_S})?{node}{_S}(?P<kind>{exam}|{pos}){tail}"
        )
        # "Number examined: 22", "Number involved: 0" (under a lymph-node heading)
        self._count_bare = Rx(rf"{heads}{_S}(?P<kind>{exam}|{pos}){tail}")
        # "Number of positive lymph nodes: 2"
        self._count_before = Rx(
            rf"{heads}{_S}(?P<kind>{exam}|{pos}){_S}(?:{qual}{_S})?{node}{tail}"
        )
        # "Lymph nodes: 3 positive"
        self._colon = Rx(
            rf"{node}{_S}:\s{{0,3}}(?P<n>{count}){_S}(?P<kind>{pos}|{exam})(?!\s{{0,3}}(?:out\s+)?of)"
        )
        # "no tumor seen in twenty eight lymph nodes"
        self._neg_in = Rx(
            rf"{neg_find}(?:\s{{1,3}}[a-z]{{2,15}}){{0,3}}?\s{{1,3}}in\s{{1,3}}(?:all\s{{1,3}})?"
            rf"(?:the\s{{1,3}})?(?P<e>{count}){_PAREN_DIGITS}{_ADJ}\s{{1,3}}{node}"
        )
        # Every form that starts with a count, in one pattern (one attempt per number):
        frac_paren = r"(?:\s{0,2}\(\s{0,2}\d{1,3}\s{0,2}/\s{0,2}\d{1,3}\s{0,2}\))?"
        findings = alternation(lex.phrases(fam, "finding_nouns"))
        self._counted = Rx(
            rf"(?P<c>{count}){_PAREN_DIGITS}(?:"
            # "two of fifteen lymph nodes", "ONE (1) OF ONE (1) LYMPH NODE"
            rf"(?P<of>\s{{1,3}}(?:out\s{{1,3}})?of\s{{1,3}}(?:the\s{{1,3}})?(?:total\s{{1,3}})?"
            rf"(?P<of_e>{count}){_PAREN_DIGITS}{_ADJ}\s{{1,3}}{node})"
            # "3 positive out of 21 (lymph nodes)"
            rf"|(?P<po>\s{{1,3}}{pos}(?:\s{{1,3}}{node})?\s{{1,3}}(?:out\s{{1,3}})?of\s{{1,3}}"
            rf"(?:the\s{{1,3}})?(?:total\s{{1,3}})?(?P<po_e>{count})(?:{_ADJ}\s{{1,3}}{node})?)"
            # "0 involved / 18 examined" (and the other order)
            rf"|(?P<sl>{_S}(?P<ka>{pos}|{exam}){_S}[/,;]{_S}(?:and{_S})?(?P<b>{count}){_S}(?P<kb>{pos}|{exam}))"
            # "two lymph nodes, negative for carcinoma", "Fifteen ... lymph nodes tumor-free"
            rf"|(?P<na>{_ADJ}\s{{1,3}}{node}{frac_paren}[\s,;:\-]{{0,4}}(?:(?:are|is|were|all)\s{{1,3}})?"
            rf"{neg_after}(?:{_S}{findings})?)"
            # "six benign lymph nodes"
            rf"|(?P<nj>\s{{1,3}}{neg_adj}(?:\s{{1,3}}[a-z][a-z\-]{{1,20}}){{0,2}}?\s{{1,3}}{node})"
            r")"
        )
        # "no lymph nodes identified"
        self._none = Rx(
            rf"n(?<![^\W_].)o\s{{1,3}}{node}\s{{1,3}}(?:(?:are|were|is)\s{{1,3}})?{exam}"
        )
        self._neg_before = Rx(neg_find)
        self._neg_after_word = Rx(rf"[\s,;:\-]{{0,4}}{neg_after}")
        self._partial = Rx(rf"{heads}\s{{1,3}}\S+\s{{1,3}}$")
        self._at_node = Anchors(
            lex.phrases(fam, "node_words"), lex.phrases(fam, "node_abbreviations")
        )
        self._at_neg = Anchors(lex.phrases(fam, "negative_findings"))
        self._at_heads = Anchors(lex.phrases(fam, "count_heads"))
        self._at_qual = Anchors(lex.phrases(fam, "count_qualifiers"))
        self._at_no = Anchors(("no",))

    # -----------------------------------------------------------------------------
    def read(self, region: Region) -> list[Value]:
        nodes = self._at_node.positions(region)
        body = region.body
        if not nodes and "/" not in body:
            return []
        n = len(body)
        around_node = self.numbers.positions_near(region, nodes, 110, 80)
        heads = self._at_heads.positions(region)
        found: list[Found] = []
        later: list[Found] = []  # negative statements rank after the counts proper
        for m in self._counted.match_at(region, around_node):
            if m["of"]:
                f = self._from_of(m, region)
            elif m["po"]:
                p, e = self._n(m["c"]), self._n(m["po_e"])
                ok = p is not None and e is not None and self._node_near(region, m.start(), m.end())
                f = Found(m.start(), m.end(), None, (), {"p": p, "e": e}) if ok else None
            elif m["sl"]:
                f = self._from_slash(m, region)
            else:
                e = self._n(m["c"])
                if e is None or (m["na"] and self._is_partial(region, m.start())):
                    continue
                later.append(Found(m.start(), m.end(), None, (), {"p": 0, "e": e, "neg": True}))
                continue
            if f is not None:
                found.append(f)
        for m in self._neg_in.match_at(
            region, near_before(self._at_neg.positions(region), nodes, 150)
        ):
            e = self._n(m["e"])
            if e is not None:
                found.append(Found(m.start(), m.end(), None, (), {"p": 0, "e": e, "neg": True}))
        found.extend(later)
        starts = sorted({*heads, *self._at_qual.positions(region), *nodes})
        for rx, at in (
            (self._count_before, heads),
            (self._colon, nodes),
            (self._count_node, starts),
        ):
            for m in rx.match_at(region, at):
                f = self._from_count(m, region)
                if f is not None:
                    found.append(f)
        for m in self._count_bare.match_at(region, near(heads, nodes, 200, 150)):
            # "Number examined: 22" counts only under a lymph-node heading
            if self._node_near(region, m.start(), m.start(), before=150):
                f = self._from_count(m, region)
                if f is not None:
                    found.append(f)
        for m in self._none.match_at(region, near_before(self._at_no.positions(region), nodes, 6)):
            found.append(Found(m.start(), m.end(), None, (), {"p": None, "e": 0}))
        for m in self._frac.finditer(region):
            s, e = m.start(), m.end()
            if s > 0 and body[s - 1] == "(" and e < n and body[e] == ")":
                s, e = s - 1, e + 1
            if self._fraction_context(region, s, e):
                found.append(
                    Found(s, e, None, (), {"p": int(m["p"]), "e": int(m["e"]), "frac": True})
                )
        kept = keep_non_overlapping(found)
        kept.sort(key=lambda f: f.start)
        kept = self._drop_partial_negatives(self._merge(kept, body))
        self._flag_pairs(kept)
        out: list[Value] = []
        for f in kept:
            p, e = f.detail.get("p"), f.detail.get("e")
            flags = list(f.flags)
            if p is not None and e is not None and p > e:
                flags.append("nodes_positive_exceed_examined")
            if p is not None:
                out.append(region.value("lymph_nodes_positive", p, f.start, f.end, flags))
            if e is not None:
                out.append(region.value("lymph_nodes_examined", e, f.start, f.end, flags))
        return out

    def _n(self, text: str | None) -> int | None:
        return None if text is None else self.numbers.parse(text)

    def _from_of(self, m: re.Match[str], region: Region) -> Found | None:
        p, e = self._n(m["c"]), self._n(m["of_e"])
        if p is None or e is None:
            return None
        body = region.body
        sent_start = max(
            body.rfind(".", 0, m.start()), body.rfind("\n", 0, m.start()), m.start() - 80, 0
        )
        line_end = body.find("\n", m.end())
        after_end = min(len(body) if line_end < 0 else line_end, m.end() + 40)
        negative = (
            self._neg_before.search(region, sent_start, m.start()) is not None
            or self._neg_after_word.match(region, m.end(), after_end) is not None
        )
        if negative and p not in (0, e):
            return None  # "no tumor in two of five nodes" is not a count anyone can read
        if negative:
            p = 0  # "no malignancy in one of one lymph node" -> 0/1
        return Found(m.start(), m.end(), None, (), {"p": p, "e": e})

    def _from_slash(self, m: re.Match[str], region: Region) -> Found | None:
        a, b = self._n(m["c"]), self._n(m["b"])
        ka = " ".join(m["ka"].lower().split()) in self._exam_words
        kb = " ".join(m["kb"].lower().split()) in self._exam_words
        if a is None or b is None or ka == kb or not self._node_near(region, m.start(), m.end()):
            return None
        p, e = (b, a) if ka else (a, b)
        return Found(m.start(), m.end(), None, (), {"p": p, "e": e})

    def _from_count(self, m: re.Match[str], region: Region) -> Found | None:
        n = self._n(m["n"])
        if n is None or self._is_partial(region, m.start()):
            return None
        kind = " ".join(m["kind"].lower().split())
        if kind in self._exam_words:
            return Found(m.start(), m.end(), None, (), {"p": None, "e": n, "count": "e"})
        return Found(m.start(), m.end(), None, (), {"p": n, "e": None, "count": "p"})

    def _is_partial(self, region: Region, start: int) -> bool:
        """ "Number of N2 lymph nodes ..." read from "lymph nodes": a station count."""
        line_start = region.body.rfind("\n", 0, start) + 1
        return self._partial.search(region, line_start, start) is not None

    def _node_near(self, region: Region, start: int, end: int, before: int = 60) -> bool:
        n = len(region.body)
        return (
            self._node.search(region, max(0, start - before), start) is not None
            or self._node.search(region, end, min(n, end + 40)) is not None
        )

    def _fraction_context(self, region: Region, start: int, end: int) -> bool:
        """A bare "(0/14)" is a node count only beside lymph nodes or a pN category."""
        body = region.body
        line_start = body.rfind("\n", 0, start) + 1
        line_end = body.find("\n", end)
        line_end = len(body) if line_end < 0 else line_end
        lo = max(line_start, start - 60)
        if self._node.search(region, lo, start) is not None or self._pn.search(body, lo, start):
            return True
        pos = end
        while pos < line_end and body[pos] in " )":
            pos += 1
        return self._node.match(region, pos, min(line_end, end + 40)) is not None

    @staticmethod
    def _merge(found: list[Found], body: str) -> list[Found]:
        """Join a statement and a fraction in the same clause: "two lymph nodes,
        negative for carcinoma (0/2)"."""
        out: list[Found] = []
        for f in found:
            prev = out[-1] if out else None
            between = body[prev.end : f.start] if prev is not None else ""
            if (
                prev is not None
                and 0 <= len(between) <= 40
                and not _CLAUSE_BREAK.search(between)
                and (f.detail.get("frac") or prev.detail.get("frac"))
                and not (f.detail.get("frac") and prev.detail.get("frac"))
            ):
                a, b = prev.detail, f.detail
                flags = list(prev.flags)
                for k in ("p", "e"):
                    if a.get(k) is not None and b.get(k) is not None and a[k] != b[k]:
                        flags.append("node_count_mismatch")
                merged: dict[str, Any] = {
                    "p": a.get("p") if a.get("p") is not None else b.get("p"),
                    "e": a.get("e") if a.get("e") is not None else b.get("e"),
                }
                out[-1] = Found(prev.start, f.end, None, tuple(flags), merged)
                continue
            out.append(f)
        return out

    @staticmethod
    def _drop_partial_negatives(found: list[Found]) -> list[Found]:
        """ "2 of 15 nodes positive; 13 nodes negative": the second is not a total."""
        out: list[Found] = []
        for f in found:
            if f.detail.get("neg") and any(
                (g.detail.get("p") or 0) > 0 and 0 <= f.start - g.end <= 150 for g in out
            ):
                continue
            out.append(f)
        return out

    @staticmethod
    def _flag_pairs(found: list[Found]) -> None:
        """Synoptic counts on separate lines: compare a positive count with its examined."""
        singles = [f for f in found if f.detail.get("count")]
        for i, a in enumerate(singles):
            for b in singles[i + 1 :]:
                if b.start - a.end > 250:
                    break
                if a.detail["count"] == b.detail["count"]:
                    continue
                p = a.detail["p"] if a.detail["count"] == "p" else b.detail["p"]
                e = a.detail["e"] if a.detail["count"] == "e" else b.detail["e"]
                if p is not None and e is not None and p > e:
                    for f in (a, b):
                        f.flags = (*f.flags, "nodes_positive_exceed_examined")
                break
