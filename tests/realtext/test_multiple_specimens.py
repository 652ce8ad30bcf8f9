"""Several specimens with separate diagnoses.

Lymph-node parts negative for carcinoma beside a lung part with carcinoma; a
case is positive when any specimen is; a broad negation about some specimens
("lymph nodes negative for carcinoma") does not cancel a specific diagnosis
of another stated where the diagnosis header was lost.  Every fragment here
is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


LUNG_PARTS = (
    "FINAL DIAGNOSIS:\n"
    "A. Lymph node, station 7, excision:\n"
    "- One lymph node, negative for carcinoma (0/1).\n"
    "B. Lymph node, station 10, excision:\n"
    "- Two lymph nodes, negative for carcinoma (0/2).\n"
    "C. Lung, left upper lobe, lobectomy:\n"
    "- Squamous cell carcinoma, moderately differentiated, 3.1 cm.\n"
    "- Bronchial margin free of carcinoma.\n"
)
COLON_PARTS = (
    "DIAGNOSIS:\n"
    "1. Liver, wedge biopsy: benign liver parenchyma.\n"
    "2. Sigmoid colon, resection: invasive adenocarcinoma, moderately differentiated.\n"
    "3. Anastomotic ring, excision: benign segment of colon.\n"
)
LOST_HEADER = (
    "Lung, left upper lobe, excision: invasive squamous cell carcinoma forming a 2.7 cm mass.\n"
    "Lymph nodes, mediastinal, excision: negative for carcinoma.\n"
    "SYNOPTIC REPORT\n"
    "Procedure: Lobectomy\n"
    "Tumor Site: Upper lobe\n"
    "Tumor Size: 2.7 cm\n"
    "Margins: Uninvolved by carcinoma\n"
    "Lymph nodes: negative for carcinoma (0/6)\n"
)


@pytest.mark.parametrize(
    ("scheme", "text", "labels", "parts"),
    [
        ("lung", LUNG_PARTS, {"squamous_cell_carcinoma": "present", "adenocarcinoma": "absent"},
         ["A", "B", "C"]),
        ("colorectal", COLON_PARTS, {"adenocarcinoma": "present"}, ["1", "2", "3"]),
    ],
)  # fmt: skip
def test_specimen_parts_and_case_roll_up(
    scheme: str, text: str, labels: dict[str, str], parts: list[str]
) -> None:
    res = _labeler(scheme).label_report(text)
    for key, state in labels.items():
        assert res.case.states[key].state == state, key
    assert [p.part for p in res.parts] == parts
    # the carcinoma belongs to its own specimen only
    positive = [p.part for p in res.parts if any(s.state == "present" for s in p.states.values())]
    assert len(positive) >= 1 and positive != parts


def test_broad_negation_of_other_specimens_keeps_a_specific_diagnosis() -> None:
    res = _labeler("lung").label_report(LOST_HEADER)
    assert res.case.states["squamous_cell_carcinoma"].state == "present"
    assert res.primary_label == "squamous_cell_carcinoma"
