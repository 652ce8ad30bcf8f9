"""The public API of the value readers: keys, regions, offsets, errors.

All texts are invented.
"""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from pathsieve.errors import InputError
from pathsieve.values import VALUE_KEYS, extract_values, readers

REPORT = (
    "FINAL DIAGNOSIS:\n"
    "A. Prostate, radical prostatectomy: adenocarcinoma, Gleason score 3+4=7 (Grade Group 2).\n"
    "   Margins negative. No lymphovascular invasion. Tumor size: 2.1 cm.\n"
    "B. Lymph nodes, pelvic: metastatic carcinoma in two of fifteen lymph nodes (2/15).\n"
    "Pathologic stage: pT3a pN1 MX\n"
    "COMMENT:\nER and PR are not applicable; Gleason score 4+4=8 in the addendum below.\n"
)


def test_value_keys_are_the_contract_order() -> None:
    assert VALUE_KEYS == (
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


def test_every_reader_declares_keys_of_the_contract() -> None:
    declared = [k for r in readers() for k in r.keys]
    assert sorted(declared) == sorted(VALUE_KEYS)


def test_full_report_reads_every_family_with_exact_offsets() -> None:
    values = extract_values(REPORT, [(0, len(REPORT), "diagnosis", "A")])
    got = [(v.key, v.value) for v in values]
    assert ("gleason_score", "3+4=7") in got
    assert ("grade_group", 2) in got
    assert ("margin_status", "negative") in got
    assert ("lymphovascular_invasion", "absent") in got
    assert ("tumor_size_mm", 21.0) in got
    assert ("lymph_nodes_positive", 2) in got and ("lymph_nodes_examined", 15) in got
    assert ("pt", "pT3a") in got and ("pn", "pN1") in got
    assert not any(k == "pm" for k, _ in got)  # MX is not a category
    for v in values:
        assert REPORT[v.start : v.end] == v.text
        assert v.key in VALUE_KEYS


def test_values_are_sorted_by_position() -> None:
    values = extract_values(REPORT, [(0, len(REPORT), "diagnosis", "")])
    starts = [v.start for v in values]
    assert starts == sorted(starts)


def test_only_regions_are_read_and_they_name_section_and_part() -> None:
    a_start = REPORT.index("A. Prostate")
    b_start = REPORT.index("B. Lymph")
    comment = REPORT.index("COMMENT:")
    regions = [(a_start, b_start, "diagnosis", "A"), (comment, len(REPORT), "comment", "")]
    values = extract_values(REPORT, regions)
    assert {(v.key, v.section, v.part) for v in values if v.key == "gleason_score"} == {
        ("gleason_score", "diagnosis", "A"),
        ("gleason_score", "comment", ""),
    }
    assert not any(v.key.startswith("lymph_nodes") for v in values)  # part B not given
    for v in values:
        inside = [r for r in regions if r[0] <= v.start and v.end <= r[1]]
        assert inside and (v.section, v.part) == (inside[0][2], inside[0][3])


def test_nothing_matches_across_a_region_end() -> None:
    text = "Gleason score 3+4=7"
    cut = text.index("+")
    values = extract_values(
        text, [(0, cut + 1, "diagnosis", ""), (cut + 1, len(text), "diagnosis", "")]
    )
    assert [v for v in values if v.key == "gleason_score"] == []


def test_overlapping_regions_do_not_double_values() -> None:
    text = "Margins negative."
    values = extract_values(
        text, [(0, len(text), "diagnosis", ""), (0, len(text), "diagnosis", "")]
    )
    assert len(values) == 1


@pytest.mark.parametrize(
    "text",
    [
        "",
        "Benign colonic mucosa. No dysplasia or malignancy.",
        "Received in formalin labelled with the patient's name are two fragments.",
        "Clinical history: screening.",
    ],
)
def test_text_with_no_values_yields_none(text: str) -> None:
    assert extract_values(text, [(0, len(text), "diagnosis", "")]) == []


def test_empty_region_list_yields_none() -> None:
    assert extract_values(REPORT, []) == []


@pytest.mark.parametrize(
    "region",
    [
        (0, 10_000, "diagnosis", ""),
        (-1, 5, "diagnosis", ""),
        (5, 2, "diagnosis", ""),
        (0, 5),
        "0-5",
    ],
)
def test_bad_regions_raise_input_error_that_says_what(region: object) -> None:
    with pytest.raises(InputError) as e:
        extract_values("Margins negative.", [region])  # type: ignore[list-item]
    assert "region 0" in str(e.value)


def test_values_are_frozen_records() -> None:
    (v,) = extract_values("Margins negative.", [(0, 17, "diagnosis", "")])
    with pytest.raises(AttributeError):
        v.value = "involved"  # type: ignore[misc]


TOKENS = [
    "Gleason score 3+4=7",
    "pT3 N1b MX",
    "2/15 lymph nodes",
    "margins negative",
    "2.5 x 1.8 cm tumor",
    "LVI: present",
    "ER positive (95%)",
    "HER2 2+",
    "Marsh 3a",
    "Nottingham grade 2",
    "No",
    "(",
    "\n",
    "  ",
    "x",
    "7",
    ";",
    "cm",
    "négatif",
    "İ",  # grows when lower-cased: offsets must still hold
]


@settings(max_examples=150, deadline=None)
@given(st.lists(st.sampled_from(TOKENS), max_size=25), st.integers(min_value=0, max_value=400))
def test_property_evidence_is_always_the_original_slice(parts: list[str], cut: int) -> None:
    text = " ".join(parts)
    cut = min(cut, len(text))
    regions = [(0, cut, "diagnosis", "A"), (cut, len(text), "comment", "B")]
    for v in extract_values(text, regions):
        assert text[v.start : v.end] == v.text
        assert v.start < v.end
        assert (v.end <= cut) or (v.start >= cut)  # never across a region end
        assert v.key in VALUE_KEYS
