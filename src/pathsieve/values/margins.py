"""Surgical margin status: ``"involved"`` or ``"negative"`` (detail: distance_mm, close).

Read forms: a margin named and then judged ("margins are free of carcinoma",
"Margin status: uninvolved by invasive carcinoma, closest 0.3 cm (deep)"), an
adjective before the margin ("positive margin"), tumour put at a margin
("carcinoma extends to the inked margin"; negated: "no tumor seen at the
bronchial margin"), a yes/no involvement field ("Surgical margin involvement:
No") and a distance ("closest margin 2 mm", "carcinoma is 2 mm from the deep
margin"), which means the margin is free.

Not read: a distance of 0 with no status word (whether 0 mm is "at ink" depends on
the site's convention), margins "cannot be assessed" / "not specified".

>>> from pathsieve.values import extract_values
>>> t = "Margins uninvolved by invasive carcinoma, closest 0.3 cm (deep)."
>>> v = extract_values(t, [(0, len(t), "diagnosis", "")])[0]
>>> v.value, v.detail["distance_mm"], v.text
('negative', 3.0, 'Margins uninvolved by invasive carcinoma, closest 0.3 cm (deep)')
"""

from __future__ import annotations

from typing import Any

from ..records import Value
from .common import (
    NUM,
    Anchors,
    Found,
    Numbers,
    Region,
    Rx,
    Sizes,
    alternation,
    gate,
    keep_non_overlapping,
    near_before,
)
from .lexicon import ValueLexicon

__all__ = ["MarginReader"]

_S = r"[^\S\n]{0,3}"
_SENT = r"(?:(?!\.\s)[^\n])"  # a character inside the current sentence ("; closest ..." stays in)


class MarginReader:
    """Reads ``margin_status``."""

    keys = ("margin_status",)

    def __init__(self, lex: ValueLexicon) -> None:
        fam = "margins"
        self.sizes = Sizes(lex)
        self.numbers = Numbers(lex)
        name = alternation(lex.phrases(fam, "names"))
        neg_words = lex.phrases(fam, "negative")
        pos_words = lex.phrases(fam, "positive")
        close_words = lex.phrases(fam, "close")
        self._neg = {" ".join(w.split()) for w in neg_words}
        self._close = {" ".join(w.split()) for w in close_words}
        status = alternation((*neg_words, *pos_words, *close_words))
        units = alternation((*lex.phrases("units", "cm"), *lex.phrases("units", "mm")), left=False)
        one_dim = rf"(?P<d>{NUM})\s{{0,2}}(?P<u>{units})"
        less = alternation(lex.phrases("numbers", "less_than"))
        closest = alternation(lex.phrases(fam, "closest"))
        distance = alternation(lex.phrases(fam, "distance_words"))
        tumor = alternation(lex.phrases(fam, "tumor_nouns"))
        negators = alternation(lex.phrases(fam, "negators"))
        # "margins (of resection) are free of carcinoma"
        findings = alternation(lex.phrases(fam, "finding_nouns"))
        self._judged = Rx(
            rf"{name}(?:{_S}\([^()\n]{{0,30}}\))?(?P<gap>[^.;\n\d]{{0,30}}?)(?P<st>{status})"
            rf"(?:{_S}(?:(?:by|for|of){_S})?{findings})?"
        )
        # "Surgical margin involvement: No"
        self._involvement = Rx(
            rf"{alternation(lex.phrases(fam, 'involvement_names'))}{_S}[:;=\-]?\s{{0,3}}"
            rf"(?P<answer>{alternation((*lex.phrases(fam, 'yes_words'), *lex.phrases(fam, 'no_words')))})"
        )
        self._yes = {" ".join(w.split()) for w in lex.phrases(fam, "yes_words")}
        # "negative margins", "positive surgical margin"
        self._neg_adjectives = {
            " ".join(w.split()) for w in lex.phrases(fam, "negative_adjectives")
        }
        self._adjective = Rx(
            rf"(?P<adj>{alternation((*lex.phrases(fam, 'negative_adjectives'), *lex.phrases(fam, 'positive_adjectives')))})"
            rf"(?:{_S}[a-z\-]{{2,20}}){{0,2}}?{_S}{name}"
        )
        # "carcinoma extends to the inked margin"; "no tumor seen at the bronchial margin"
        self._negator = Rx(negators)
        self._negator_before = Rx(rf"{negators}{_S}$")
        self._at_margin = Rx(
            rf"{tumor}(?P<gap>[^.;\n]{{0,40}}?){alternation(lex.phrases(fam, 'at_margin'))}"
            rf"\s{{1,3}}(?:(?:the|one|of|a|an)\s{{1,3}}){{0,3}}(?:[a-z\-]{{2,20}}\s{{1,3}}){{0,3}}?{name}"
        )
        # "closest margin 2 mm", "closest margin: deep, 2 mm" (and "Distance from ..." before it)
        self._closest = Rx(
            rf"{closest}{_S}(?:[a-z\-]{{2,20}}{_S})?{name}{_S}(?:\([^()\n]{{0,20}}\){_S})?"
            rf"(?:[:=,\-]|is|measures|at)?{_S}(?:[a-z\-]{{2,20}}{_S}[,:]?{_S}){{0,2}}?"
            rf"(?:is{_S})?(?P<q>{less}{_S})?{one_dim}(?![^\W_])"
        )
        self._distance_before = Rx(rf"{distance}[^\n.;]{{0,40}}$")
        # "carcinoma is 2 mm from the deep margin", "within 1 mm of the margin"
        self._from_margin = Rx(
            rf"(?P<q>{less}{_S})?{one_dim}(?![^\W_]){_S}(?:away{_S})?(?:from|to|of)\s{{1,3}}"
            rf"(?:the\s{{1,3}})?(?:{closest}\s{{1,3}})?(?:[a-z\-]{{2,20}}\s{{1,3}}){{0,3}}?{name}"
        )
        self._within_before = Rx(r"within\s{1,3}$")
        self._away = Rx(rf"{units}(?![^\W_])|\bfrom\b|\baway\b")
        self._tumor = Rx(tumor)
        # the rest of a judged sentence: "..., closest 0.3 cm (deep)"
        self._tail = Rx(
            rf"{_SENT}{{0,60}}?(?:{closest}{_S}(?:[a-z\-]{{2,20}}{_S})?(?:{name}{_S})?(?:\([^()\n]{{0,20}}\){_S})?"
            rf"[:=,\-]?{_S}(?:[a-z\-]{{2,20}}{_S}[,:]?{_S}){{0,2}}?(?:is{_S})?(?P<q>{less}{_S})?{one_dim}(?![^\W_])"
            rf"(?:{_S}\([^()\n]{{0,20}}\))?"
            rf"|(?P<q2>{less}{_S})?(?P<d2>{NUM})\s{{0,2}}(?P<u2>{units})(?![^\W_]){_S}(?:away{_S})?from)"
        )
        self._at_names = Anchors(lex.phrases(fam, "names"))
        self._at_involvement = Anchors(lex.phrases(fam, "involvement_names"))
        self._at_tumor = Anchors(lex.phrases(fam, "tumor_nouns"))
        self._at_adjective = Anchors(
            (*lex.phrases(fam, "negative_adjectives"), *lex.phrases(fam, "positive_adjectives"))
        )
        self._at_closest = Anchors(lex.phrases(fam, "closest"))
        #: nothing is read without one of these (see :func:`~.common.gate`)
        self.gate = gate(self._at_names, self._at_involvement)

    # -----------------------------------------------------------------------------
    def read(self, region: Region) -> list[Value]:
        names = self._at_names.positions(region)
        involvement = self._at_involvement.positions(region)
        if not names and not involvement:
            return []
        body = region.body
        found: list[Found] = []
        for m in self._involvement.match_at(region, involvement):
            yes = " ".join(m["answer"].lower().split()) in self._yes
            found.append(Found(m.start(), m.end(), "involved" if yes else "negative"))
        for m in self._judged.match_at(region, names):
            word = " ".join(m["st"].lower().split())
            if self._negator.search(region, m.start("gap"), m.end("gap")) is not None:
                continue  # "margins are not all free": too tangled to read
            f = self._status(m.start(), m.end(), word)
            self._add_tail(f, region)
            found.append(f)
        for m in self._at_margin.match_at(
            region, near_before(self._at_tumor.positions(region), names, 150)
        ):
            if self._away.search(region, m.start("gap"), m.end("gap")) is not None:
                continue  # "carcinoma is 2 mm from the margin" is a distance (read below)
            start = m.start()
            pre = self._negator_before.search(region, max(0, start - 15), start)
            if pre is not None:
                start = pre.start()
            negated = (
                pre is not None
                or self._negator.search(region, m.start("gap"), m.end("gap")) is not None
            )
            found.append(Found(start, m.end(), "negative" if negated else "involved"))
        for m in self._adjective.match_at(
            region, near_before(self._at_adjective.positions(region), names, 50)
        ):
            adj = " ".join(m["adj"].lower().split())
            f = Found(m.start(), m.end(), "negative" if adj in self._neg_adjectives else "involved")
            self._add_tail(f, region)
            found.append(f)
        for m in self._closest.match_at(region, self._at_closest.positions(region)):
            d = self._distance(m.start(), m.end(), m["d"], m["u"], m["q"])
            if d is not None:
                line_start = body.rfind("\n", 0, m.start()) + 1
                lead = self._distance_before.search(
                    region, max(line_start, m.start() - 60), m.start()
                )
                if lead is not None:
                    d.start = lead.start()  # "Distance from closest margin: ..."
                found.append(d)
        # a distance starts with a number: try it only shortly before the word "margin"
        for m in self._from_margin.match_at(
            region, self.numbers.positions_near(region, names, 100)
        ):
            # only a tumour's distance: "tumor is 2 mm from the margin"
            line_start = max(body.rfind("\n", 0, m.start()) + 1, body.rfind(". ", 0, m.start()) + 1)
            if self._tumor.search(region, max(line_start, m.start() - 80), m.start()) is None:
                continue
            within = self._within_before.search(region, max(0, m.start() - 12), m.start())
            d = self._distance(m.start(), m.end(), m["d"], m["u"], m["q"], close=within is not None)
            if d is not None:
                if within is not None:
                    d.start = within.start()
                found.append(d)
        kept = keep_non_overlapping(found)
        kept.sort(key=lambda f: f.start)
        return [region.found("margin_status", f) for f in kept]

    def _status(self, start: int, end: int, word: str) -> Found:
        if word in self._close:
            return Found(start, end, "negative", (), {"close": True})
        return Found(start, end, "negative" if word in self._neg else "involved")

    def _add_tail(self, f: Found, region: Region) -> None:
        if f.value != "negative":
            return
        t = self._tail.match(region, f.end, min(len(region.body), f.end + 120))
        if t is None:
            return
        num, unit = (t["d"], t["u"]) if t["d"] else (t["d2"], t["u2"])
        mm = self.sizes.to_mm(num, unit)
        if mm is None:
            return
        f.detail["distance_mm"] = mm
        if t["q"] or t["q2"]:
            f.detail["distance_qualifier"] = "<"
        f.end = t.end()

    def _distance(
        self, start: int, end: int, num: str, unit: str, q: str | None, *, close: bool = False
    ) -> Found | None:
        mm = self.sizes.to_mm(num, unit)
        if mm is None or mm == 0:
            return None  # 0 mm: at the margin or not depends on the site's convention
        detail: dict[str, Any] = {"distance_mm": mm}
        if q:
            detail["distance_qualifier"] = "<"
        if close:
            detail["close"] = True
        return Found(start, end, "negative", (), detail)
