"""Structured value readers: Gleason, grade group, Marsh, Nottingham, ER/PR/HER2, TNM,
lymph-node counts, margins, tumour size and lymphovascular invasion.

Every value carries exact offsets into the original text (``text[v.start:v.end] ==
v.text``), its section and part, a normalised value, flags for inconsistencies
that were reported rather than corrected, and a ``detail`` dict.  One module per
value family; the words each reader looks for live in
``ontology/lexicon/values.yaml``.

>>> t = "FINAL DIAGNOSIS: Adenocarcinoma, Gleason score 3+4=7. pT2 N0 MX."
>>> for v in extract_values(t, [(0, len(t), "diagnosis", "A")]):
...     print(v.key, v.value, repr(v.text))
gleason_score 3+4=7 'Gleason score 3+4=7'
grade_group 2 'Gleason score 3+4=7'
pt pT2 'pT2'
pn pN0 'N0'
"""

from __future__ import annotations

import time
from collections.abc import Collection, Iterable, Sequence
from functools import lru_cache
from typing import Any, Protocol

from ..errors import InputError
from ..records import Value
from .breast import HER2Reader, NottinghamReader, ReceptorReader
from .common import Region, Report, present
from .gleason import GleasonReader, grade_group, grade_group_from_total
from .lexicon import (
    VALUE_LEXICON_FILE,
    ValueLexicon,
    check_value_lexicon,
    default_value_lexicon,
    load_value_lexicon,
)
from .lvi import LVIReader
from .margins import MarginReader
from .marsh import MarshReader
from .nodes import NodeReader
from .size import SizeReader
from .tnm import TNMReader

__all__ = [
    "VALUE_KEYS",
    "VALUE_LEXICON_FILE",
    "ValueLexicon",
    "check_value_lexicon",
    "extract_values",
    "grade_group",
    "grade_group_from_total",
    "load_value_lexicon",
    "readers",
]

#: Every key a reader may emit, in the order of the label contract.
VALUE_KEYS: tuple[str, ...] = (
    "gleason_score",
    "grade_group",
    "marsh_grade",
    "nottingham_grade",
    "er_status",
    "pr_status",
    "her2_status",
    "pt",
    "pn",
    "pm",
    "lymph_nodes_positive",
    "lymph_nodes_examined",
    "margin_status",
    "tumor_size_mm",
    "lymphovascular_invasion",
)
_KEY_ORDER = {k: i for i, k in enumerate(VALUE_KEYS)}

RegionSpec = tuple[int, int, str, str]


class _Reader(Protocol):
    @property
    def keys(self) -> tuple[str, ...]: ...

    def read(self, region: Region) -> list[Value]: ...


@lru_cache(maxsize=8)
def _readers_for(lex: ValueLexicon) -> tuple[_Reader, ...]:
    return (
        GleasonReader(lex),
        MarshReader(lex),
        NottinghamReader(lex),
        ReceptorReader(lex),
        HER2Reader(lex),
        TNMReader(lex),
        NodeReader(lex),
        MarginReader(lex),
        SizeReader(lex),
        LVIReader(lex),
    )


_DEFAULT: list[Any] = [None, -1.0]  # (readers, when the file was last looked at)
_RECHECK_SECONDS = 2.0


def readers(lexicon: ValueLexicon | None = None) -> tuple[_Reader, ...]:
    """The compiled readers for a lexicon (the shipped one by default); built once.

    The shipped file is looked at again at most every two seconds (an edit is
    picked up; a stat per report would cost more than reading it).
    """
    if lexicon is not None:
        return _readers_for(lexicon)
    now = time.monotonic()
    if _DEFAULT[0] is None or now - _DEFAULT[1] > _RECHECK_SECONDS:
        _DEFAULT[0] = _readers_for(default_value_lexicon())
        _DEFAULT[1] = now
    return _DEFAULT[0]  # type: ignore[no-any-return]


@lru_cache(maxsize=64)
def _plan(rs: tuple[_Reader, ...]) -> tuple[tuple[_Reader, frozenset[int] | None], ...]:
    """Each reader with its gate: the anchors one of which it needs to read anything."""
    return tuple((r, getattr(r, "gate", None)) for r in rs)


def _check_region(spec: object, n: int, i: int) -> RegionSpec:
    if not isinstance(spec, (tuple, list)) or len(spec) != 4:
        raise InputError(f"region {i} must be (start, end, section_kind, part_label), got {spec!r}")
    start, end, section, part = spec
    if not (isinstance(start, int) and isinstance(end, int)) or not 0 <= start <= end <= n:
        raise InputError(
            f"region {i} ({start!r}, {end!r}) is not inside the text of length {n}; "
            "pass offsets into the original text"
        )
    return start, end, str(section), str(part)


def extract_values(
    text: str,
    regions: Iterable[RegionSpec] | Sequence[RegionSpec],
    *,
    lexicon: ValueLexicon | None = None,
    keys: Collection[str] | None = None,
) -> list[Value]:
    """All values in the given regions of ``text``, sorted by position.

    ``regions`` are ``(start, end, section_kind, part_label)`` spans of the original
    text; nothing is matched across a region's end.  Each value's section and part
    come from its region.  ``keys`` limits the work to the readers of those keys
    (each reader still reports all of its keys); readers are independent, so the
    values of a kept reader are the same either way.
    """
    report = Report(text)
    n = len(text)
    out: list[Value] = []
    seen: set[tuple[str, int, int, str]] = set()
    rs = readers(lexicon)
    if keys is not None:
        wanted = frozenset(keys)
        rs = tuple(r for r in rs if not wanted.isdisjoint(r.keys))
    plan = _plan(rs)
    for i, spec in enumerate(regions):
        start, end, section, part = _check_region(spec, n, i)
        if start == end:
            continue
        region = Region.of(report, start, end, section, part)
        found = present(region)
        for reader, needs in plan:
            if needs is not None and needs.isdisjoint(found):
                continue  # none of the words it starts from: it would read nothing
            for v in reader.read(region):
                key = (v.key, v.start, v.end, repr(v.value))
                if key not in seen:  # overlapping regions must not double a value
                    seen.add(key)
                    out.append(v)
    out.sort(key=lambda v: (v.start, _KEY_ORDER.get(v.key, 99), v.end))
    return out
