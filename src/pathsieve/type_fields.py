"""Checklist type fields whose value leaves out its head noun.

A checklist line such as ``Histologic type: Squamous cell`` or ``HISTOLOGIC
TYPE; SQUAMOUS`` names a tumour type without the head noun the key implies.
The value alone names no disease, so the concept matcher finds nothing (or only
a cell type).  For each such field the value is read again with each head noun
of the header lexicon (``type_heads``: "carcinoma", "adenocarcinoma") in turn;
the first head that completes a vocabulary name starting at the value's first
word gives a mention over the value's exact characters, with match ``field``
and a note saying what was read.

Only keys listed as ``type_keys`` (all of them synoptic keys) are read, and
only a value on the key's own line, after a colon or semicolon, made of
letters, spaces and hyphens.  A value that already names a disease whole is
left alone: the head noun must extend the name past the value's end.

>>> from pathsieve.sections import default_lexicon
>>> fields = TypeFields.from_lexicon(default_lexicon())
>>> text = "HISTOLOGIC TYPE; SQUAMOUS."
>>> [text[s:e] for s, e in fields.values(text)]
['SQUAMOUS']
"""

from __future__ import annotations

import re
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from .records import Mention

if TYPE_CHECKING:
    from .matcher import ConceptMatcher
    from .sections import HeaderLexicon

__all__ = ["TypeFields"]

# The value: letters first, then letters, spaces and hyphens, up to punctuation or
# the line's end ("Squamous cell", "NON-KERATINIZING SQUAMOUS CELL").
_VALUE = r"[ \t]{0,8}[:;][ \t]{0,8}(?P<v>[A-Za-z][A-Za-z \t\-]{0,59}?)[ \t]*(?=[^A-Za-z \t\-]|$)"


@dataclass(frozen=True)
class TypeFields:
    """Reads elliptic type-field values; build with :meth:`from_lexicon`."""

    keys: tuple[str, ...]
    heads: tuple[str, ...]
    _re: re.Pattern[str] | None = field(init=False, repr=False)
    _firsts: tuple[str, ...] = field(init=False, repr=False)

    def __post_init__(self) -> None:
        # a key's first word as reports write it (lower, Title or UPPER case): a
        # text holding none of them has no type field, and plain substring tests
        # are far cheaper than the pattern tried at every position
        firsts = {k.split()[0] for k in self.keys}
        object.__setattr__(
            self,
            "_firsts",
            tuple(v for w in sorted(firsts) for v in (w, w.title(), w.upper())),
        )
        pattern = None
        if self.keys and self.heads:
            alts = "|".join(
                r"[ \t]+".join(re.escape(w) for w in k.split())
                for k in sorted(self.keys, key=len, reverse=True)
            )
            pattern = re.compile(
                r"(?<![A-Za-z])(?:" + alts + r")" + _VALUE, re.IGNORECASE | re.MULTILINE
            )
        object.__setattr__(self, "_re", pattern)

    @classmethod
    def from_lexicon(cls, lexicon: HeaderLexicon) -> TypeFields:
        return cls(tuple(lexicon.type_keys), tuple(lexicon.type_heads))

    def values(self, text: str) -> Iterator[tuple[int, int]]:
        """Spans of the type-field values in ``text``."""
        if self._re is None or not any(w in text for w in self._firsts):
            return
        for m in self._re.finditer(text):
            yield m.start("v"), m.end("v")

    def mentions(
        self,
        text: str,
        mentions: Sequence[Mention],
        matcher: ConceptMatcher,
        place: Callable[[int], tuple[str, str]] | None = None,
    ) -> list[Mention]:
        """``mentions`` with elliptic type-field values read; sorted by start.

        A value read with a head noun replaces the mentions inside it (a cell
        type found in "squamous cell", say).
        """
        added: list[Mention] = []
        for vs, ve in self.values(text):
            found = self._read(text[vs:ve], matcher)
            if found is None:
                continue
            concept_id, label, head = found
            section, part = place(vs) if place is not None else ("other", "")
            value = text[vs:ve]
            added.append(
                Mention(
                    concept_id,
                    label,
                    value,
                    vs,
                    ve,
                    section,
                    part,
                    "field",
                    100.0,
                    f"type field: '{value}' read as '{value} {head}'",
                )
            )
        if not added:
            return list(mentions)
        kept = [m for m in mentions if not any(m.start < a.end and a.start < m.end for a in added)]
        return sorted(kept + added, key=lambda m: m.start)

    def _read(self, value: str, matcher: ConceptMatcher) -> tuple[str, str, str] | None:
        """(concept id, label, head) of the name ``value`` + a head noun completes."""
        end = len(value)
        for head in self.heads:
            for m in matcher.find(f"{value} {head}"):
                if m.start == 0 and m.end > end:
                    return m.concept_id, m.label, head
        return None
