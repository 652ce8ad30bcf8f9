"""ICD-O-3 morphology codes written in a report, read as the concepts they code.

Reports and the forms scanned with them often carry the coded diagnosis: "8140/3"
(adenocarcinoma, NOS), "Carcinoma, squamous cell, NOS 8070/3", a registrar's
stamp at the top of the page.  Where OCR has wrecked the words, the code may be
all that is left of the type.  A code reads as the ontology concept whose
``xref: ICDO3:<code>`` it is (ICD-O-3, WHO 2013: four morphology digits, a
slash, the behaviour digit); where several concepts share a code, the most
general of them, and where they are unrelated, none.  The mention covers the
code's exact characters, with match ``code`` and a note naming the concept.

Only codes the ontology lists are read: a date ("2011/3"), a ratio or a
fraction never is one, and neither is a number run into other digits or
slashes ("18140/32", "8140/3/1").

>>> from pathsieve.ontology import load_ontology
>>> codes = MorphologyCodes.from_ontology(load_ontology())
>>> [(m.text, m.label) for m in codes.mentions("ICD-O-3: Adenoca NOS 8140/3.", [])]
[('8140/3', 'adenocarcinoma')]
"""

from __future__ import annotations

import re
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from .ontology import Ontology
from .records import Mention

__all__ = ["MorphologyCodes"]

# Four digits, a slash (OCR may set a space either side), the behaviour digit; not
# inside a longer run of digits or slashes.
_CODE = re.compile(r"(?<![\d/])([89]\d{3})[ ]?/[ ]?([012369])(?![\d/])")


@dataclass(frozen=True)
class MorphologyCodes:
    """Code -> (concept id, label); build with :meth:`from_ontology`."""

    concepts: dict[str, tuple[str, str]]

    @classmethod
    def from_ontology(cls, onto: Ontology) -> MorphologyCodes:
        holders: dict[str, list[str]] = {}
        for term in onto.terms.values():
            code = term.icdo3
            if code:
                holders.setdefault(code, []).append(term.id)
        concepts: dict[str, tuple[str, str]] = {}
        for code, ids in holders.items():
            # the most general holder, if every other holder is beneath it
            top = [c for c in ids if not any(o != c and onto.is_a(c, o) for o in ids)]
            if len(top) == 1:
                concepts[code] = (top[0], onto.term(top[0]).label)
        return cls(concepts)

    def mentions(
        self,
        text: str,
        mentions: Sequence[Mention],
        place: Callable[[int], tuple[str, str]] | None = None,
    ) -> list[Mention]:
        """``mentions`` with the codes of ``text`` added; sorted by start."""
        if "/" not in text or not self.concepts:
            return list(mentions)
        added: list[Mention] = []
        for m in _CODE.finditer(text):
            code = f"{m.group(1)}/{m.group(2)}"
            hit = self.concepts.get(code)
            if hit is None:
                continue
            cid, label = hit
            s, e = m.start(), m.end()
            if any(x.start < e and s < x.end for x in mentions):
                continue
            section, part = place(s) if place is not None else ("other", "")
            note = f"ICD-O-3 code '{code}' read as '{label}'"
            added.append(Mention(cid, label, text[s:e], s, e, section, part, "code", 100.0, note))
        if not added:
            return list(mentions)
        return sorted([*mentions, *added], key=lambda x: x.start)
