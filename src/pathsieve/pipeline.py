"""The report pipeline: one spaCy pipeline from text to a read report.

``text -> Doc -> sections/parts -> mentions (with assertion) -> values``

A blank English pipeline with the report tokenizer and five pathsieve
components, each registered as a spaCy factory.  Every stage works on the
original text and records exact character offsets into it; the result is
``doc._.pathsieve``, a frozen :class:`ReadReport` for code that does not want
spaCy.

>>> report = read("DIAGNOSIS: Sigmoid colon, polypectomy: tubular adenoma.")
>>> [m.label for m in report.mentions if m.section == "diagnosis"][-1]
'tubular adenoma'
"""

from __future__ import annotations

import bisect
import itertools
from collections.abc import Callable, Iterable, Sequence
from dataclasses import replace
from functools import lru_cache
from typing import Any

import spacy
from spacy.language import Language
from spacy.tokens import Doc

from .abbreviations import AbbreviationDictionary
from .aggregate import section_role
from .assertion import AssertionEngine
from .matcher import ConceptMatcher
from .morphology_codes import MorphologyCodes
from .ontology import Ontology, load_ontology
from .parts import find_parts
from .records import DECIDING, Assertion, Mention, Part, ReadReport, Section, Segment, Value
from .schemes import Scheme, load_scheme
from .sections import default_lexicon, find_sections
from .tokenizer import make_tokenizer
from .type_fields import TypeFields
from .values import extract_values

__all__ = ["build_nlp", "read", "read_report", "report_reader"]


def _segments(text: str, sections: Sequence[Section], parts: Sequence[Part]) -> list[Segment]:
    """Partition the text by section and part (parts nest inside sections)."""
    cuts = {0, len(text)}
    for s in sections:
        cuts.update((s.start, s.end))
    for p in parts:
        cuts.update((p.start, p.end))
    points = sorted(c for c in cuts if 0 <= c <= len(text))
    sec_starts = [s.start for s in sections]
    single = len({p.label for p in parts}) <= 1
    by_start = sorted(parts, key=lambda p: p.start)
    part_starts = [p.start for p in by_start]
    out: list[Segment] = []
    for a, b in itertools.pairwise(points):
        if a == b:
            continue
        i = bisect.bisect_right(sec_starts, a) - 1
        kind = sections[i].kind if i >= 0 and a < sections[i].end else "other"
        label = ""
        j = bisect.bisect_right(part_starts, a) - 1  # parts do not overlap
        if j >= 0 and a < by_start[j].end:
            label = by_start[j].label
        if single and parts and not label and kind in DECIDING:
            label = parts[0].label
        out.append(Segment(a, b, kind, label))
    return out


def _locate(segments: Sequence[Segment], starts: Sequence[int], pos: int) -> Segment:
    i = bisect.bisect_right(starts, pos) - 1
    return segments[max(i, 0)]


class _State:
    """What the components share: ontology, scheme, matcher, engines (built once)."""

    def __init__(self, scheme: Scheme | None, ontology: Ontology) -> None:
        self.ontology = ontology
        self.scheme = scheme
        self.matcher = ConceptMatcher(
            ontology,
            AbbreviationDictionary.load(),
            scheme_name=scheme.name if scheme else None,
        )
        self.engine = AssertionEngine.load()
        self.type_fields = TypeFields.from_lexicon(default_lexicon())
        self.codes = MorphologyCodes.from_ontology(ontology)
        self.site_root = _root(ontology, "anatomical site")
        self.procedure_root = _root(ontology, "procedure")


def _root(onto: Ontology, name: str) -> str | None:
    ids = onto.lookup(name)
    return ids[0] if ids else None


_STATES: dict[int, _State] = {}


def _state(nlp: Language) -> _State:
    return _STATES[id(nlp)]


def _ensure_extensions() -> None:
    if not Doc.has_extension("pathsieve"):
        Doc.set_extension("pathsieve", default=None)
        Doc.set_extension("ps_sections", default=())
        Doc.set_extension("ps_parts", default=())
        Doc.set_extension("ps_mentions", default=())
        Doc.set_extension("ps_assertions", default=())
        Doc.set_extension("ps_values", default=())
        Doc.set_extension("ps_value_assertions", default=())
        Doc.set_extension("mentions", getter=lambda d: d._.ps_mentions)
        Doc.set_extension("sections", getter=lambda d: d._.ps_sections)
        Doc.set_extension("parts", getter=lambda d: d._.ps_parts)
        Doc.set_extension(
            "mention_spans",
            getter=lambda d: [
                d.char_span(m.start, m.end, label=m.concept_id, alignment_mode="expand")
                for m in d._.ps_mentions
            ],
        )


@Language.factory(
    "pathsieve_sections",
    assigns=["doc._.ps_sections"],
    default_config={},
)
def make_sections(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        doc._.ps_sections = tuple(find_sections(doc.text))
        return doc

    return component


@Language.factory(
    "pathsieve_parts",
    assigns=["doc._.ps_parts"],
    requires=["doc._.ps_sections"],
    default_config={},
)
def make_parts(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        doc._.ps_parts = tuple(find_parts(doc.text, doc._.ps_sections))
        return doc

    return component


@Language.factory(
    "pathsieve_concepts",
    assigns=["doc._.ps_mentions", "doc._.ps_parts"],
    requires=["doc._.ps_sections", "doc._.ps_parts"],
    default_config={},
)
def make_concepts(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        mentions, parts, segments = _concepts(
            _state(nlp), doc.text, doc._.ps_sections, doc._.ps_parts
        )
        doc._.ps_mentions, doc._.ps_parts, doc._.ps_segments = mentions, parts, segments
        return doc

    return component


def _concepts(
    st: _State, text: str, sections: Sequence[Section], parts: Sequence[Part]
) -> tuple[tuple[Mention, ...], tuple[Part, ...], tuple[Segment, ...]]:
    """Concept mentions placed in their section and part; parts get their sites."""
    segments = _segments(text, sections, parts)
    starts = [s.start for s in segments]

    def section_at(pos: int) -> str:
        return _locate(segments, starts, pos).section

    def place(pos: int) -> tuple[str, str]:
        seg = _locate(segments, starts, pos)
        return seg.section, seg.part

    # the section at a short form helps choose among its senses
    mentions = st.matcher.find(text, section_at=section_at, place=place)
    mentions = st.type_fields.mentions(text, mentions, st.matcher, place)
    mentions = st.codes.mentions(text, mentions, place)
    filled = tuple(_fill_part_concepts(st, parts, mentions))
    return tuple(mentions), filled, tuple(segments)


def _fill_part_concepts(
    st: _State, parts: Iterable[Part], mentions: Sequence[Mention]
) -> list[Part]:
    out = []
    starts = [m.start for m in mentions]  # mentions are sorted by start
    for p in parts:
        if p.header_end <= p.start:
            out.append(p)
            continue
        lo = bisect.bisect_left(starts, p.start)
        hi = bisect.bisect_left(starts, p.header_end)
        inside = [m.concept_id for m in mentions[lo:hi] if m.end <= p.header_end]
        sites = tuple(c for c in inside if st.site_root and st.ontology.is_a(c, st.site_root))
        procs = tuple(
            c for c in inside if st.procedure_root and st.ontology.is_a(c, st.procedure_root)
        )
        out.append(replace(p, site_ids=sites, procedure_ids=procs))
    return out


def _boundaries(sections: Iterable[Section], parts: Iterable[Part]) -> list[int]:
    cuts = {s.start for s in sections} | {p.start for p in parts}
    return sorted(c for c in cuts if c > 0)


def _assertions(
    st: _State, text: str, mentions: Sequence[Mention], boundaries: list[int]
) -> tuple[Assertion, ...]:
    spans = [(m.start, m.end) for m in mentions]
    return tuple(st.engine.assess(text, spans, boundaries=boundaries) if spans else ())


def _values(
    st: _State,
    text: str,
    segments: Sequence[Segment],
    boundaries: list[int],
    keys: frozenset[str] | None = None,
) -> tuple[tuple[Value, ...], tuple[Assertion, ...]]:
    regions = [(s.start, s.end, s.section, s.part) for s in segments]
    values = extract_values(text, regions, keys=keys)
    if not values:
        return (), ()
    # The readers refuse values inside negated statements and carry their own polarity
    # ("no lymphovascular invasion" -> absent); the assertion of a value's span
    # decides only whether it is current and about the patient.
    asserted = st.engine.assess(text, [(v.start, v.end) for v in values], boundaries=boundaries)
    return tuple(values), tuple(asserted)


@Language.factory(
    "pathsieve_assertion",
    assigns=["doc._.ps_assertions"],
    requires=["doc._.ps_mentions"],
    default_config={},
)
def make_assertion(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        bounds = _boundaries(doc._.ps_sections, doc._.ps_parts)
        doc._.ps_assertions = _assertions(_state(nlp), doc.text, doc._.ps_mentions, bounds)
        return doc

    return component


@Language.factory(
    "pathsieve_values",
    assigns=["doc._.ps_values", "doc._.ps_value_assertions"],
    requires=["doc._.ps_sections", "doc._.ps_parts"],
    default_config={},
)
def make_values(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        bounds = _boundaries(doc._.ps_sections, doc._.ps_parts)
        doc._.ps_values, doc._.ps_value_assertions = _values(
            _state(nlp), doc.text, doc._.ps_segments, bounds
        )
        return doc

    return component


@Language.factory(
    "pathsieve_report",
    assigns=["doc._.pathsieve"],
    requires=["doc._.ps_mentions", "doc._.ps_assertions", "doc._.ps_values"],
    default_config={},
)
def make_report(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        doc._.pathsieve = ReadReport(
            text=doc.text,
            sections=doc._.ps_sections,
            parts=doc._.ps_parts,
            mentions=doc._.ps_mentions,
            assertions=doc._.ps_assertions,
            values=doc._.ps_values,
            value_assertions=doc._.ps_value_assertions,
            segments=doc._.ps_segments,
        )
        return doc

    return component


def build_nlp(scheme: Scheme | str | None = None, *, ontology: Ontology | None = None) -> Language:
    """Build the spaCy pipeline (blank English, report tokenizer, pathsieve components)."""
    _ensure_extensions()
    if not Doc.has_extension("ps_segments"):
        Doc.set_extension("ps_segments", default=())
    onto = ontology or load_ontology()
    sch = load_scheme(scheme, onto) if isinstance(scheme, str) else scheme
    nlp = spacy.blank("en")
    nlp.tokenizer = make_tokenizer(nlp)
    _STATES[id(nlp)] = _State(sch, onto)
    for component in (
        "pathsieve_sections",
        "pathsieve_parts",
        "pathsieve_concepts",
        "pathsieve_assertion",
        "pathsieve_values",
        "pathsieve_report",
    ):
        nlp.add_pipe(component)
    return nlp


def report_reader(
    nlp: Language,
    *,
    value_keys: Iterable[str] | None = None,
    keep_mention: Callable[[str], bool] | None = None,
    counting_only: bool = False,
) -> Callable[[str], ReadReport]:
    """A function reading a text with ``nlp``'s stages, without tokenizing it.

    The stages work on the text and its character offsets, never on tokens, so
    labelling skips the spaCy Doc (building its tokens is most of what
    ``nlp(text)`` would cost) and returns the same :class:`ReadReport`.
    ``value_keys`` runs only the value readers of those keys (a label table
    needs its scheme's value keys only; evidence wants every value), and
    ``keep_mention(concept_id)`` drops the other mentions before they are
    assessed (a site or a procedure never changes a label).  ``counting_only``
    also drops the mentions, and skips the value regions, of sections that can
    never change a label (:func:`~pathsieve.aggregate.section_role` "none":
    clinical history, and gross text in a report with a diagnosis section).

    >>> read_fast = report_reader(build_nlp("colorectal"))
    >>> read_fast("DIAGNOSIS: Rectum, biopsy: adenocarcinoma.").mentions[-1].label
    'adenocarcinoma'
    """
    st = _state(nlp)
    keys = frozenset(value_keys) if value_keys is not None else None

    def read_text(text: str) -> ReadReport:
        sections = tuple(find_sections(text))
        parts = tuple(find_parts(text, sections))
        mentions, parts, segments = _concepts(st, text, sections, parts)
        if keep_mention is not None:
            mentions = tuple(m for m in mentions if keep_mention(m.concept_id))
        value_segments: Sequence[Segment] = segments
        if counting_only:
            deciding = any(s.kind in DECIDING for s in sections)
            lead_end = next((s.start for s in sections if s.header), len(text))
            mentions = tuple(
                m
                for m in mentions
                if section_role(m.section, deciding, m.start, lead_end) != "none"
            )
            value_segments = [
                s
                for s in segments
                if section_role(s.section, deciding, s.start, lead_end, value=True) != "none"
            ]
        bounds = _boundaries(sections, parts)
        values, value_assertions = _values(st, text, value_segments, bounds, keys)
        return ReadReport(
            text=text,
            sections=sections,
            parts=parts,
            mentions=mentions,
            assertions=_assertions(st, text, mentions, bounds),
            values=values,
            value_assertions=value_assertions,
            segments=segments,
        )

    return read_text


@lru_cache(maxsize=8)
def _default_nlp(scheme: str | None) -> Language:
    return build_nlp(scheme)


def read(text: str, *, scheme: str | None = None) -> Doc:
    """Read one report into a spaCy Doc (``doc._.pathsieve`` holds the records)."""
    return _default_nlp(scheme)(text)


def read_report(text: str, *, scheme: str | None = None) -> ReadReport:
    """Read one report into plain frozen records, for code that does not want spaCy."""
    report: ReadReport = read(text, scheme=scheme)._.pathsieve
    return report
