"""Lymphovascular invasion: "present" or "absent".

Rule: lymphovascular invasion is tumour in lymphatic and/or blood vessels (CAP
cancer protocols, *(practice)*), so "lymphatic invasion present" makes it
present, while "lymphatic invasion absent" alone does not make it absent.
All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value

Read = Callable[..., list[Value]]


def lvi(read: Read, text: str) -> list[tuple[str, str]]:
    return [(v.value, v.text) for v in read(text) if v.key == "lymphovascular_invasion"]


P, A = "present", "absent"

FORMS = [
    ("LVI: present", [(P, "LVI: present")]),
    ("No lymphovascular invasion.", [(A, "No lymphovascular invasion")]),
    ("LVI not identified.", [(A, "LVI not identified")]),
    ("Lymph-vascular invasion: Not identified", [(A, "Lymph-vascular invasion: Not identified")]),
    ("Angiolymphatic invasion present.", [(P, "Angiolymphatic invasion present")]),
    ("Lymphovascular invasion: Present (focal)", [(P, "Lymphovascular invasion: Present (focal)")]),
    (
        "Lymphovascular invasion is not identified.",
        [(A, "Lymphovascular invasion is not identified")],
    ),
    ("LVI: negative", [(A, "LVI: negative")]),
    ("LVI neg.", [(A, "LVI neg")]),
    ("LVI absent; margins negative", [(A, "LVI absent")]),
    ("ANGIOLYMPHATIC INVASION: No", [(A, "ANGIOLYMPHATIC INVASION: No")]),
    ("1. NO ANGIOLYMPHATIC INVASION IS IDENTIFIED.", [(A, "NO ANGIOLYMPHATIC INVASION")]),
    ("Vascular/Lymphatic Invasion: No", [(A, "Vascular/Lymphatic Invasion: No")]),
    ("Vascular/Lymphatic Invasion: Yes", [(P, "Vascular/Lymphatic Invasion: Yes")]),
    ("PERINEURAL AND LYMPHOVASCULAR INVASION PRESENT.", [(P, "LYMPHOVASCULAR INVASION PRESENT")]),
    (
        "No perineural or lymphovascular invasion.",
        [(A, "No perineural or lymphovascular invasion")],
    ),
    ("Lymphovascular space invasion: Absent", [(A, "Lymphovascular space invasion: Absent")]),
    (
        "Lymphovascular space invasion is not identified.",
        [(A, "Lymphovascular space invasion is not identified")],
    ),
    ("LVSI: present", [(P, "LVSI: present")]),
    ("No evidence of lymphovascular invasion.", [(A, "No evidence of lymphovascular invasion")]),
    ("Negative for lymphovascular invasion.", [(A, "Negative for lymphovascular invasion")]),
    ("Carcinoma with lymphovascular invasion.", [(P, "with lymphovascular invasion")]),
    (
        "Extensive lymphovascular invasion is seen.",
        [(P, "Extensive lymphovascular invasion is seen")],
    ),
    ("Focal angiolymphatic invasion.", [(P, "Focal angiolymphatic invasion")]),
    ("Lymphovascular invasion: Not identified.", [(A, "Lymphovascular invasion: Not identified")]),
    ("Lymphovascular invasion is present.", [(P, "Lymphovascular invasion is present")]),
    ("Angiolymphatic invasion not detected.", [(A, "Angiolymphatic invasion not detected")]),
    (
        "Lymphovascular space invasion by carcinoma identified",
        [(P, "Lymphovascular space invasion by carcinoma identified")],
    ),
    ("Lymphatic invasion: Present", [(P, "Lymphatic invasion: Present")]),
    ("Venous invasion: Present", [(P, "Venous invasion: Present")]),
    ("Small vessel invasion identified.", [(P, "Small vessel invasion identified")]),
    ("Lymphovascular invasion: not present.", [(A, "Lymphovascular invasion: not present")]),
    ("Lympho-vascular invasion: absent", [(A, "Lympho-vascular invasion: absent")]),
    ("Positive for lymphovascular invasion.", [(P, "Positive for lymphovascular invasion")]),
    ("No definite lymphovascular invasion.", [(A, "No definite lymphovascular invasion")]),
    ("Lymphovascular invasion (LVI): present", [(P, "Lymphovascular invasion (LVI): present")]),
    ("LVI: Not identified", [(A, "LVI: Not identified")]),
    (
        "Lymphovascular and perineural invasion: not identified",
        [(A, "Lymphovascular and perineural invasion: not identified")],
    ),
    ("without lymphovascular invasion", [(A, "without lymphovascular invasion")]),
    ("Presence of lymphovascular invasion.", [(P, "Presence of lymphovascular invasion")]),
    ("LVI +", [(P, "LVI +")]),
    ("lymphovascular invasion: identified", [(P, "lymphovascular invasion: identified")]),
    ("Angiolymphatic Invasion: Absent", [(A, "Angiolymphatic Invasion: Absent")]),
    (
        "No convincing lymphovascular invasion noted.",
        [(A, "No convincing lymphovascular invasion")],
    ),
    (
        "Lymphatic (small vessel) invasion: Present",
        [(P, "Lymphatic (small vessel) invasion: Present")],
    ),
    ("Lymphovascular invasion: None", [(A, "Lymphovascular invasion: None")]),
    ("LVI: yes", [(P, "LVI: yes")]),
    ("lymphovascular invasion not seen", [(A, "lymphovascular invasion not seen")]),
    (
        "Vascular invasion: Negative; lymphovascular invasion: positive",
        [(P, "lymphovascular invasion: positive")],
    ),
    ("Lymph vascular invasion: present", [(P, "Lymph vascular invasion: present")]),
]


@pytest.mark.parametrize(("text", "expected"), FORMS)
def test_lvi_forms(read: Read, text: str, expected: list[tuple[str, str]]) -> None:
    assert lvi(read, text) == expected


def test_table_has_fifty_forms() -> None:
    assert len(FORMS) >= 50


def test_part_of_lvi_is_marked_partial(read: Read) -> None:
    (v,) = [v for v in read("Lymphatic invasion: Present") if v.key == "lymphovascular_invasion"]
    assert v.detail == {"partial": True}
    (v,) = [v for v in read("LVI: present") if v.key == "lymphovascular_invasion"]
    assert v.detail == {}


@pytest.mark.parametrize(
    "text",
    [
        "Lymphatic invasion: Absent",  # blood vessels not said
        "Venous invasion: not identified",
        "Foci are suspicious for lymphovascular invasion.",
        "Lymphovascular invasion: indeterminate",
        "Angiolymphatic Invasion :( No r Yes rUnknown",  # a checkbox list with every answer
        "Perineural invasion: present.",
        "No perineural invasion.",
        "Lymphovascular invasion:",
        "No tumor identified.",
    ],
)
def test_no_lvi_where_none_is_stated(read: Read, text: str) -> None:
    assert lvi(read, text) == []


def test_a_breaker_between_negation_and_name_keeps_the_statements_apart(read: Read) -> None:
    text = "No perineural invasion, but lymphovascular invasion is present."
    assert lvi(read, text) == [(P, "lymphovascular invasion is present")]
