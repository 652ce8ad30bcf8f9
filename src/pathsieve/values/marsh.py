"""Marsh grade of a small-bowel biopsy (Marsh 1992, as modified by Oberhuber 1999).

Categories: 0 (normal), 1 (infiltrative), 2 (hyperplastic), 3a/3b/3c (partial,
subtotal, total villous atrophy; Oberhuber 1999), 4 (hypoplastic; Marsh 1992).
A type 3 written without its subtype is kept as ``"3"`` with the flag
``marsh_subtype_missing``.  Forms that are not a category are not read: a
subtype on a type other than 3 ("Marsh 2a") and ranges ("Marsh 3a-3b").

>>> from pathsieve.values import extract_values
>>> t = "Duodenum, biopsy: villous atrophy (modified Marsh IIIb)."
>>> [(v.value, v.text) for v in extract_values(t, [(0, len(t), "diagnosis", "")])]
[('3b', 'modified Marsh IIIb')]
"""

from __future__ import annotations

from ..records import Value
from .common import Anchors, Numbers, Region, Rx, alternation, gate
from .lexicon import ValueLexicon

__all__ = ["MARSH_CATEGORIES", "MarshReader"]

#: Valid categories (Marsh 1992; Oberhuber 1999 subtypes of type 3).
MARSH_CATEGORIES: tuple[str, ...] = ("0", "1", "2", "3a", "3b", "3c", "4")

_S = r"[^\S\n]{0,3}"


class MarshReader:
    """Reads ``marsh_grade``."""

    keys = ("marsh_grade",)

    def __init__(self, lex: ValueLexicon) -> None:
        self.numbers = Numbers(lex)
        names = alternation(lex.phrases("marsh", "names"))
        kind = alternation(lex.phrases("marsh", "kind_words"))
        filler = alternation(lex.phrases("marsh", "filler_words"))
        grade = r"(?P<n>[0-4](?!\d)|iv|iii|ii|i)"
        self._pattern = Rx(
            # "Modified Marsh (Oberhuber) type: 3a", "Marsh-Oberhuber type IIIb", "MARSH 3B"
            rf"{names}(?:{_S}\([^()\n]{{1,20}}\))?(?:{_S}[-(]?{_S}{kind}){{0,2}}{_S}\)?{_S}[:=\-]?\s{{0,3}}"
            rf"(?:{filler}{_S}){{0,2}}{grade}(?:[-\s]?(?P<sub>[abc]))?(?![^\W_])"
            # a range or an alternative ("3a-3b", "IIIb/c") is not one category
            rf"(?P<range>{_S}(?:-|–|/|to|or){_S}(?:(?:[0-4]|iv|iii|ii|i)[abc]?|[abc])(?![^\W_]))?"
        )
        self._at = Anchors(lex.phrases("marsh", "names"))
        #: every form starts at one of these (see :func:`~.common.gate`)
        self.gate = gate(self._at)

    def read(self, region: Region) -> list[Value]:
        out: list[Value] = []
        for m in self._pattern.match_at(region, self._at.positions(region)):
            if m["range"] and m["range"].strip():
                continue
            n = self.numbers.parse_grade(m["n"])
            if n is None or not 0 <= n <= 4:
                continue
            sub = (m["sub"] or "").lower()
            flags: list[str] = []
            if sub and n != 3:
                continue  # only type 3 has subtypes (Oberhuber 1999)
            value = f"{n}{sub}"
            if n == 3 and not sub:
                flags.append("marsh_subtype_missing")
            end = m.end("sub") if m["sub"] else m.end("n")
            out.append(region.value("marsh_grade", value, m.start(), end, flags, {}))
        return out
