"""Aggregation rules of the label contract (LABELS.md), one test per rule.

Reports are built directly as records so each rule is tested on its own.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from pathsieve.aggregate import aggregate
from pathsieve.ontology import load_ontology
from pathsieve.records import Assertion, Mention, Part, ReadReport, Section, Segment, Value
from pathsieve.schemes import Scheme, load_scheme

DATA = Path(__file__).parent / "data"
ADENOCA, MUCINOUS, ADENOMA, TUBULAR, HGD, LGD, CARCINOMA = (
    "PSV:0000003",
    "PSV:0000004",
    "PSV:0000005",
    "PSV:0000006",
    "PSV:0000007",
    "PSV:0000008",
    "PSV:0000002",
)


@pytest.fixture(scope="module")
def scheme() -> Scheme:
    return load_scheme(DATA / "agg_scheme.yaml", load_ontology(DATA / "agg.obo"))


def M(cid: str, section: str = "diagnosis", part: str = "", start: int = 0) -> Mention:
    return Mention(cid, cid, "x", start, start + 1, section=section, part=part)


def A(
    certainty: str = "present", temporality: str = "current", experiencer: str = "patient"
) -> Assertion:
    return Assertion(certainty, temporality, experiencer)


def report(
    items: list[tuple[Mention, Assertion]],
    sections: tuple[str, ...] = ("clinical_history", "diagnosis", "comment", "addendum"),
    values: list[Value] | None = None,
    parts: tuple[str, ...] = ("",),
) -> ReadReport:
    secs = tuple(
        Section(k, k.upper(), i * 10, i * 10 + 10, i * 10 + 5) for i, k in enumerate(sections)
    )
    vs = values or []
    return ReadReport(
        text="x" * 100,
        sections=secs,
        parts=tuple(Part(p, 0, 100) for p in parts),
        mentions=tuple(m for m, _ in items),
        assertions=tuple(a for _, a in items),
        values=tuple(vs),
        value_assertions=tuple(A() for _ in vs),
        segments=(Segment(0, 100, "diagnosis", ""),),
    )


def states(result) -> dict[str, str]:  # type: ignore[no-untyped-def]
    return {k: s.state for k, s in result.case.states.items()}


def test_present_mention_decides(scheme: Scheme) -> None:
    assert states(aggregate(report([(M(ADENOCA), A())]), scheme)) == {"adenocarcinoma": "present"}


def test_roll_up_descendant_counts(scheme: Scheme) -> None:
    # a mention of mucinous adenocarcinoma makes `adenocarcinoma` present (ontology roll-up)
    assert states(aggregate(report([(M(MUCINOUS), A())]), scheme))["adenocarcinoma"] == "present"


@pytest.mark.parametrize(
    ("temporality", "experiencer"),
    [("historical", "patient"), ("hypothetical", "patient"), ("current", "other")],
)
def test_only_current_patient_mentions_decide(
    scheme: Scheme, temporality: str, experiencer: str
) -> None:
    res = aggregate(report([(M(ADENOCA), A("present", temporality, experiencer))]), scheme)
    assert states(res) == {}
    assert res.evidence[0].decides is False  # stays in the evidence with its flags
    assert res.evidence[0].assertion.temporality == temporality


def test_clinical_history_never_decides_when_diagnosis_exists(scheme: Scheme) -> None:
    res = aggregate(report([(M(ADENOCA, "clinical_history"), A())]), scheme)
    assert states(res) == {}


def test_gross_never_decides_when_diagnosis_exists(scheme: Scheme) -> None:
    res = aggregate(report([(M(ADENOCA, "gross"), A())], sections=("gross", "diagnosis")), scheme)
    assert states(res) == {}


def test_headerless_report_decides(scheme: Scheme) -> None:
    res = aggregate(report([(M(ADENOCA, "other"), A())], sections=("other",)), scheme)
    assert states(res) == {"adenocarcinoma": "present"}


def test_comment_supports_only_unmentioned_labels(scheme: Scheme) -> None:
    items = [(M(ADENOCA, "diagnosis"), A("uncertain")), (M(ADENOCA, "comment"), A("present"))]
    assert states(aggregate(report(items), scheme))["adenocarcinoma"] == "uncertain"
    items = [(M(HGD, "comment"), A("likely"))]
    assert states(aggregate(report(items), scheme))["high_grade_dysplasia"] == "likely"


def test_most_definite_positive_state_wins(scheme: Scheme) -> None:
    items = [(M(ADENOCA), A("uncertain")), (M(ADENOCA), A("likely"))]
    assert states(aggregate(report(items), scheme))["adenocarcinoma"] == "likely"


def test_absent_only_when_every_mention_negated(scheme: Scheme) -> None:
    res = aggregate(report([(M(HGD), A("absent")), (M(HGD), A("absent"))]), scheme)
    assert states(res)["high_grade_dysplasia"] == "absent"
    assert not res.case.states["high_grade_dysplasia"].conflict


def test_affirmed_and_negated_is_present_with_conflict(scheme: Scheme) -> None:
    res = aggregate(report([(M(HGD), A("present")), (M(HGD), A("absent"))]), scheme)
    st = res.case.states["high_grade_dysplasia"]
    assert (st.state, st.conflict) == ("present", True)
    assert "conflict:high_grade_dysplasia" in res.case.flags


def test_addendum_that_changes_a_label_wins(scheme: Scheme) -> None:
    items = [(M(ADENOCA, "diagnosis"), A("uncertain")), (M(ADENOCA, "addendum"), A("absent"))]
    assert states(aggregate(report(items), scheme))["adenocarcinoma"] == "absent"


def test_negated_broader_class_negates_labels_beneath_it(scheme: Scheme) -> None:
    # "negative for carcinoma": adenocarcinoma (wholly beneath carcinoma) is absent,
    # dysplasia labels (not beneath it) are untouched.
    res = aggregate(report([(M(CARCINOMA), A("absent"))]), scheme)
    assert states(res) == {"adenocarcinoma": "absent"}
    # an affirmed broader class does not make the narrower label present
    assert states(aggregate(report([(M(CARCINOMA), A("present"))]), scheme)) == {}


def test_case_state_is_most_definite_across_parts(scheme: Scheme) -> None:
    items = [(M(ADENOCA, part="A"), A("absent")), (M(ADENOCA, part="B"), A("uncertain"))]
    res = aggregate(report(items, parts=("A", "B")), scheme)
    assert [p.part for p in res.parts] == ["A", "B"]
    assert res.parts[0].states["adenocarcinoma"].state == "absent"
    assert res.parts[1].states["adenocarcinoma"].state == "uncertain"
    assert states(res)["adenocarcinoma"] == "uncertain"


def test_implication_from_concept(scheme: Scheme) -> None:
    # scheme data: an adenoma with no stated grade -> low_grade_dysplasia likely
    res = aggregate(report([(M(TUBULAR), A())]), scheme)
    st = res.case.states["low_grade_dysplasia"]
    assert (st.state, st.implied) == ("likely", True)


def test_implication_blocked_by_stated_grade(scheme: Scheme) -> None:
    res = aggregate(report([(M(TUBULAR), A()), (M(HGD), A())]), scheme)
    assert "low_grade_dysplasia" not in res.case.states


def test_implication_not_from_negated_or_historical(scheme: Scheme) -> None:
    assert states(aggregate(report([(M(TUBULAR), A("absent"))]), scheme)) == {}
    assert states(aggregate(report([(M(TUBULAR), A("present", "historical"))]), scheme)) == {}


def V(
    key: str,
    value: object,
    section: str = "diagnosis",
    part: str = "",
    start: int = 0,
    **detail: object,
) -> Value:
    return Value(key, value, "x", start, start + 1, section=section, part=part, detail=dict(detail))


def test_implication_from_value(scheme: Scheme) -> None:
    # Marsh 3b -> villous atrophy present (Marsh 1992 / Oberhuber 1999: type 3 = villous atrophy)
    res = aggregate(report([], values=[V("marsh_grade", "3b")]), scheme)
    assert res.case.states["villous_atrophy"].state == "present"
    res = aggregate(report([], values=[V("marsh_grade", "1")]), scheme)
    assert "villous_atrophy" not in res.case.states


def test_case_value_takes_the_highest_grade(scheme: Scheme) -> None:
    vals = [
        V("gleason_score", "3+3=6", part="A", primary=3, secondary=3, total=6),
        V("gleason_score", "4+3=7", part="B", primary=4, secondary=3, total=7),
        V("gleason_score", "3+4=7", part="C", primary=3, secondary=4, total=7),
    ]
    res = aggregate(report([], values=vals, parts=("A", "B", "C")), scheme)
    assert res.case.values["gleason_score"].value == "4+3=7"
    assert [p.values["gleason_score"].value for p in res.parts] == ["3+3=6", "4+3=7", "3+4=7"]


def test_stated_grade_group_preferred_over_derived(scheme: Scheme) -> None:
    vals = [V("grade_group", 2, derived=True), V("grade_group", 3, start=5)]
    res = aggregate(report([], values=vals), scheme)
    assert res.case.values["grade_group"].value == 3


def test_value_in_clinical_history_does_not_count(scheme: Scheme) -> None:
    res = aggregate(report([], values=[V("marsh_grade", "3a", section="clinical_history")]), scheme)
    assert "marsh_grade" not in res.case.values


def test_inconsistent_value_flag_is_reported(scheme: Scheme) -> None:
    v = Value(
        "gleason_score", "3+4=8", "x", 0, 1, section="diagnosis", flags=("gleason_sum_mismatch",)
    )
    res = aggregate(report([], values=[v]), scheme)
    assert res.case.values["gleason_score"].value == "3+4=8"
    assert "gleason_sum_mismatch" in res.case.flags


def test_primary_label_by_severity(scheme: Scheme) -> None:
    res = aggregate(report([(M(HGD), A()), (M(ADENOCA), A("likely"))]), scheme)
    assert res.primary_label == "adenocarcinoma"


def test_broad_negation_never_contradicts_an_affirmation(scheme: Scheme) -> None:
    # "mucinous adenocarcinoma ... negative for carcinoma at the margin" style: no conflict
    res = aggregate(report([(M(MUCINOUS), A()), (M(CARCINOMA), A("absent"))]), scheme)
    st = res.case.states["adenocarcinoma"]
    assert (st.state, st.conflict) == ("present", False)
