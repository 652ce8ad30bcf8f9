"""Records that flow between the stages of the report pipeline.

text -> Doc -> sections/parts -> mentions (with assertion) -> values -> labels

Every record carries offsets into the *original* report text: ``text[start:end]``
is always the exact evidence.  Records are frozen so a stage can never edit the
output of an earlier one.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Literal

__all__ = [
    "CERTAINTY_ORDER",
    "CERTAINTY_SCORE",
    "DECIDING",
    "EXPERIENCERS",
    "SECTION_KINDS",
    "SUPPORTING",
    "TEMPORALITIES",
    "Assertion",
    "Certainty",
    "LabelState",
    "Mention",
    "Part",
    "ReadReport",
    "Section",
    "Segment",
    "TriggerHit",
    "Value",
    "score_to_state",
]

Certainty = Literal["present", "likely", "uncertain", "unlikely", "absent"]

#: The five-level certainty scale of the label contract (LABELS.md).
CERTAINTY_SCORE: dict[str, float] = {
    "present": 1.0,
    "likely": 0.75,
    "uncertain": 0.5,
    "unlikely": 0.25,
    "absent": 0.0,
}
#: Most definite positive first; used to pick a part's or a case's state.
CERTAINTY_ORDER: tuple[str, ...] = ("present", "likely", "uncertain", "unlikely", "absent")
TEMPORALITIES: tuple[str, ...] = ("current", "historical", "hypothetical")
EXPERIENCERS: tuple[str, ...] = ("patient", "other")
SECTION_KINDS: tuple[str, ...] = (
    "diagnosis",
    "clinical_history",
    "gross",
    "microscopic",
    "comment",
    "addendum",
    "synoptic",
    "other",
)


def score_to_state(score: float) -> str:
    """Map a certainty score back to its state word.

    >>> score_to_state(0.75)
    'likely'
    """
    for state, value in CERTAINTY_SCORE.items():
        if abs(value - score) < 1e-9:
            return state
    raise ValueError(f"not a certainty score: {score!r}")


@dataclass(frozen=True, slots=True)
class Section:
    """A section of a report: its canonical kind and its span.

    ``start``/``end`` cover the header and the body; ``body_start`` is where the
    text after the header begins.  ``header`` is the header as written ("" when
    the report, or its first stretch, has no header).
    """

    kind: str
    header: str
    start: int
    end: int
    body_start: int


@dataclass(frozen=True, slots=True)
class Part:
    """A specimen part (A, B, 1, ...); ``label`` is "" for a one-specimen report."""

    label: str
    start: int
    end: int
    header: str = ""
    header_end: int = -1
    site_ids: tuple[str, ...] = ()
    procedure_ids: tuple[str, ...] = ()


@dataclass(frozen=True, slots=True)
class Mention:
    """An ontology concept found in the text."""

    concept_id: str
    label: str
    text: str
    start: int
    end: int
    section: str = "other"
    part: str = ""
    match: str = "exact"  # exact | abbreviation | fuzzy | field
    score: float = 100.0
    note: str = ""  # e.g. how an ambiguous abbreviation's sense was chosen


@dataclass(frozen=True, slots=True)
class TriggerHit:
    """An assertion trigger that acted on a mention."""

    text: str
    start: int
    end: int
    category: str


@dataclass(frozen=True, slots=True)
class Assertion:
    """ConText-style assertion of one mention."""

    certainty: str = "present"
    temporality: str = "current"
    experiencer: str = "patient"
    triggers: tuple[TriggerHit, ...] = ()

    @property
    def score(self) -> float:
        return CERTAINTY_SCORE[self.certainty]

    @property
    def counts(self) -> bool:
        """Whether the mention may decide a label (current, about the patient)."""
        return self.temporality == "current" and self.experiencer == "patient"


@dataclass(frozen=True, slots=True)
class Value:
    """A structured value read from the text (Gleason score, pT, ER status...).

    ``value`` is normalised ("3+4=7", 2, "pT3", "positive", 25.0); ``flags`` name
    inconsistencies that were reported rather than corrected
    (e.g. ``"gleason_sum_mismatch"``); ``detail`` holds extras such as the ER
    percent or the HER2 IHC score.
    """

    key: str
    value: Any
    text: str
    start: int
    end: int
    section: str = "other"
    part: str = ""
    flags: tuple[str, ...] = ()
    detail: dict[str, Any] = field(default_factory=dict, compare=False, hash=False)


@dataclass(frozen=True, slots=True)
class LabelState:
    """A binary label's aggregated state for a part or a case."""

    key: str
    state: str
    conflict: bool = False
    implied: bool = False

    @property
    def score(self) -> float:
        return CERTAINTY_SCORE[self.state]


#: Sections whose statements decide labels, and sections that may add support.
DECIDING = frozenset({"diagnosis", "synoptic", "addendum"})
SUPPORTING = frozenset({"comment", "microscopic"})


@dataclass(frozen=True, slots=True)
class Segment:
    """A stretch of text with one section kind and one specimen part."""

    start: int
    end: int
    section: str
    part: str


@dataclass(frozen=True, slots=True)
class ReadReport:
    """Everything the pipeline read from one report (offsets into ``text``)."""

    text: str
    sections: tuple[Section, ...]
    parts: tuple[Part, ...]
    mentions: tuple[Mention, ...]
    assertions: tuple[Assertion, ...]
    values: tuple[Value, ...]
    value_assertions: tuple[Assertion, ...]
    segments: tuple[Segment, ...]

    @property
    def has_deciding_section(self) -> bool:
        return any(s.kind in DECIDING for s in self.sections)
