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
from collections.abc import Iterable, Sequence
from dataclasses import replace
from functools import lru_cache
from typing import Any

import spacy
from spacy.language import Language
from spacy.tokens import Doc

from .abbreviations import AbbreviationDictionary
from .assertion import AssertionEngine
from .matcher import ConceptMatcher
from .ontology import Ontology, load_ontology
from .parts import find_parts
from .records import DECIDING, Mention, Part, ReadReport, Section, Segment
from .schemes import Scheme, load_scheme
from .sections import find_sections
from .tokenizer import make_tokenizer
from .values import extract_values

__all__ = ["POLARITY_VALUES", "build_nlp", "read", "read_report"]

#: Values whose polarity is the value itself ("no lymphovascular invasion" -> absent):
#: a negation trigger must not drop them.
POLARITY_VALUES = frozenset(
    {
        "lymphovascular_invasion",
        "margin_status",
        "er_status",
        "pr_status",
        "her2_status",
        "lymph_nodes_positive",
        "lymph_nodes_examined",
    }
)


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
    out: list[Segment] = []
    for a, b in itertools.pairwise(points):
        if a == b:
            continue
        i = bisect.bisect_right(sec_starts, a) - 1
        kind = sections[i].kind if i >= 0 and a < sections[i].end else "other"
        label = ""
        for p in parts:
            if p.start <= a < p.end:
                label = p.label
                break
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
        st = _state(nlp)
        text = doc.text
        segments = _segments(text, doc._.ps_sections, doc._.ps_parts)
        starts = [s.start for s in segments]
        found = st.matcher.find(text)
        mentions = []
        for m in found:
            seg = _locate(segments, starts, m.start)
            mentions.append(replace(m, section=seg.section, part=seg.part))
        doc._.ps_mentions = tuple(mentions)
        doc._.ps_parts = tuple(_fill_part_concepts(st, doc._.ps_parts, mentions))
        doc._.ps_segments = tuple(segments)
        return doc

    return component


def _fill_part_concepts(
    st: _State, parts: Iterable[Part], mentions: Sequence[Mention]
) -> list[Part]:
    out = []
    for p in parts:
        if p.header_end <= p.start:
            out.append(p)
            continue
        inside = [m.concept_id for m in mentions if p.start <= m.start and m.end <= p.header_end]
        sites = tuple(c for c in inside if st.site_root and st.ontology.is_a(c, st.site_root))
        procs = tuple(
            c for c in inside if st.procedure_root and st.ontology.is_a(c, st.procedure_root)
        )
        out.append(replace(p, site_ids=sites, procedure_ids=procs))
    return out


def _boundaries(doc: Doc) -> list[int]:
    cuts = {s.start for s in doc._.ps_sections} | {p.start for p in doc._.ps_parts}
    return sorted(c for c in cuts if c > 0)


@Language.factory(
    "pathsieve_assertion",
    assigns=["doc._.ps_assertions"],
    requires=["doc._.ps_mentions"],
    default_config={},
)
def make_assertion(nlp: Language, name: str) -> Any:
    def component(doc: Doc) -> Doc:
        st = _state(nlp)
        spans = [(m.start, m.end) for m in doc._.ps_mentions]
        doc._.ps_assertions = tuple(
            st.engine.assess(doc.text, spans, boundaries=_boundaries(doc)) if spans else ()
        )
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
        st = _state(nlp)
        segments = doc._.ps_segments
        regions = [(s.start, s.end, s.section, s.part) for s in segments]
        values = extract_values(doc.text, regions)
        if not values:
            doc._.ps_values, doc._.ps_value_assertions = (), ()
            return doc
        asserted = st.engine.assess(
            doc.text, [(v.start, v.end) for v in values], boundaries=_boundaries(doc)
        )
        kept, kept_assertions = [], []
        for v, a in zip(values, asserted, strict=True):
            if v.key not in POLARITY_VALUES and a.certainty == "absent":
                continue  # e.g. a Gleason score inside a negated statement: read nothing
            kept.append(v)
            kept_assertions.append(a)
        doc._.ps_values = tuple(kept)
        doc._.ps_value_assertions = tuple(kept_assertions)
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
