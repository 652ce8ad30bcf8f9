"""Margin status: "involved" or "negative", with the closest distance in mm.

Rules: a margin with tumour at it (on ink) is involved; a margin free of tumour is
negative, and a stated distance to the closest margin means it is free (reporting
practice of the CAP cancer protocols, *(practice)*); cm -> mm by x10.
All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value

Read = Callable[..., list[Value]]


def margins(read: Read, text: str) -> list[tuple[str, float | None, str]]:
    return [
        (v.value, v.detail.get("distance_mm"), v.text)
        for v in read(text)
        if v.key == "margin_status"
    ]


N, INV = "negative", "involved"

FORMS = [
    ("Margins negative.", [(N, None, "Margins negative")]),
    ("Margins free of carcinoma.", [(N, None, "Margins free of carcinoma")]),
    (
        "Carcinoma extends to the inked margin.",
        [(INV, None, "Carcinoma extends to the inked margin")],
    ),
    ("Closest margin 2 mm.", [(N, 2.0, "Closest margin 2 mm")]),
    (
        "Margins uninvolved by invasive carcinoma, closest 0.3 cm (deep).",
        [(N, 3.0, "Margins uninvolved by invasive carcinoma, closest 0.3 cm (deep)")],
    ),
    ("Positive margin at the apex.", [(INV, None, "Positive margin")]),
    (
        "Surgical margins are negative for tumor.",
        [(N, None, "Surgical margins are negative for tumor")],
    ),
    ("All margins are free of tumor.", [(N, None, "margins are free of tumor")]),
    ("Resection margins are free of tumour.", [(N, None, "Resection margins are free of tumour")]),
    ("Margin status: negative", [(N, None, "Margin status: negative")]),
    ("Margins: Uninvolved by carcinoma", [(N, None, "Margins: Uninvolved by carcinoma")]),
    (
        "Margins: Involved by invasive carcinoma",
        [(INV, None, "Margins: Involved by invasive carcinoma")],
    ),
    ("Tumor is present at the deep margin.", [(INV, None, "Tumor is present at the deep margin")]),
    (
        "Invasive carcinoma focally involves the radial margin.",
        [(INV, None, "Invasive carcinoma focally involves the radial margin")],
    ),
    ("Surgical margin involvement: No", [(N, None, "Surgical margin involvement: No")]),
    ("Surgical margin involvement: Yes", [(INV, None, "Surgical margin involvement: Yes")]),
    ("NO TUMOR SEEN AT BRONCHIAL MARGIN.", [(N, None, "NO TUMOR SEEN AT BRONCHIAL MARGIN")]),
    ("Bronchial margin negative for tumor.", [(N, None, "margin negative for tumor")]),
    ("Distal margin: Negative for tumor", [(N, None, "margin: Negative for tumor")]),
    ("margins neg.", [(N, None, "margins neg")]),
    (
        "Margins clear of AIS (closest: endocervical, 3 mm).",
        [(N, 3.0, "Margins clear of AIS (closest: endocervical, 3 mm)")],
    ),
    ("The margins are widely free.", [(N, None, "margins are widely free")]),
    ("Margins: not involved", [(N, None, "Margins: not involved")]),
    ("Margins are close (1 mm).", [(N, None, "Margins are close")]),
    ("Negative margins.", [(N, None, "Negative margins")]),
    ("Clear resection margins.", [(N, None, "Clear resection margins")]),
    (
        "HSIL extends to the endocervical margin.",
        [(INV, None, "HSIL extends to the endocervical margin")],
    ),
    (
        "HSIL (CIN 3) INVOLVING THE DEEP AND ENDOCERVICAL MARGINS.",
        [(INV, None, "HSIL (CIN 3) INVOLVING THE DEEP AND ENDOCERVICAL MARGINS")],
    ),
    (
        "Tumour reaches the inked margin at the right posterolateral aspect.",
        [(INV, None, "Tumour reaches the inked margin")],
    ),
    ("Carcinoma is 2 mm from the deep margin.", [(N, 2.0, "2 mm from the deep margin")]),
    ("The tumor is 0.4 cm from the closest margin.", [(N, 4.0, "0.4 cm from the closest margin")]),
    ("Distance from closest margin: 0.3 cm", [(N, 3.0, "Distance from closest margin: 0.3 cm")]),
    ("Closest margin: deep, 2 mm", [(N, 2.0, "Closest margin: deep, 2 mm")]),
    (
        "Margins negative; closest margin 0.2 cm (posterior).",
        [(N, 2.0, "Margins negative; closest margin 0.2 cm (posterior)")],
    ),
    (
        "The mass is 4 cm from the posterior vaginal surgical margin.",
        [(N, 40.0, "4 cm from the posterior vaginal surgical margin")],
    ),
    (
        "Invasive carcinoma is within 1 mm of the superior margin.",
        [(N, 1.0, "within 1 mm of the superior margin")],
    ),
    (
        "ALL EXAMINED SURGICAL RESECTION MARGINS ARE FREE OF TUMOR.",
        [(N, None, "SURGICAL RESECTION MARGINS ARE FREE OF TUMOR")],
    ),
    ("Margins of resection are negative.", [(N, None, "Margins of resection are negative")]),
    ("Resection margins negative for tumor.", [(N, None, "Resection margins negative for tumor")]),
    (
        "Oral and aboral resection margins are tumor-free.",
        [(N, None, "resection margins are tumor-free")],
    ),
    ("-Surgical margins uninvolved.", [(N, None, "Surgical margins uninvolved")]),
    (
        "Tumor is present at one of the resection margins.",
        [(INV, None, "Tumor is present at one of the resection margins")],
    ),
    (
        "Margins: positive for carcinoma (posterior).",
        [(INV, None, "Margins: positive for carcinoma")],
    ),
    ("Stalk margin is free of adenoma.", [(N, None, "margin is free")]),
    ("Margin: involved", [(INV, None, "Margin: involved")]),
    (
        "Carcinoma does not extend to the margin.",
        [(N, None, "Carcinoma does not extend to the margin")],
    ),
    ("margins free", [(N, None, "margins free")]),
    ("with positive surgical margins", [(INV, None, "positive surgical margins")]),
    (
        "DCIS is present at the inked superior margin.",
        [(INV, None, "DCIS is present at the inked superior margin")],
    ),
    (
        "Margins are clear; the closest is 5 mm (inferior).",
        [(N, 5.0, "Margins are clear; the closest is 5 mm (inferior)")],
    ),
    (
        "Margins: uninvolved by invasive carcinoma\nDistance from closest margin: 3 mm",
        [
            (N, None, "Margins: uninvolved by invasive carcinoma"),
            (N, 3.0, "Distance from closest margin: 3 mm"),
        ],
    ),
]


@pytest.mark.parametrize(("text", "expected"), FORMS)
def test_margin_forms(read: Read, text: str, expected: list[tuple[str, float | None, str]]) -> None:
    assert margins(read, text) == expected


def test_table_has_fifty_forms() -> None:
    assert len(FORMS) >= 50


@pytest.mark.parametrize(
    ("text", "mm"),
    [
        ("Closest margin 0.3 cm", 3.0),  # cm -> mm by x10, exact in decimal
        ("Closest margin 0.25 cm", 2.5),
        ("Closest margin 1.1 cm", 11.0),
        ("Closest margin 7 mm", 7.0),
        ("Closest margin 12 millimeters", 12.0),
        ("Closest margin 2 centimeters", 20.0),
    ],
)
def test_distance_converts_to_millimetres(read: Read, text: str, mm: float) -> None:
    # unit conversion cm -> mm (SI: 1 cm = 10 mm)
    (v,) = [v for v in read(text) if v.key == "margin_status"]
    assert v.detail["distance_mm"] == mm


def test_close_margin_is_negative_with_a_note(read: Read) -> None:
    (v,) = [v for v in read("Margins are close.") if v.key == "margin_status"]
    assert v.value == "negative" and v.detail["close"] is True


@pytest.mark.parametrize(
    "text",
    [
        "Margins: cannot be assessed.",
        "Margins: Not specified",
        "The specimen margins are inked.",
        "Tumor border: infiltrative margin.",
        "Closest margin 0 mm.",  # at the margin or not depends on the site's convention
        "Margins are not all free.",
        "The resection margin is inked black and presumed proximal.",
        "Apex and base margins amputated and cone-sectioned.",
        "No carcinoma identified.",
    ],
)
def test_no_margin_status_where_none_is_stated(read: Read, text: str) -> None:
    assert margins(read, text) == []


def test_margin_distance_of_a_non_tumour_is_not_read(read: Read) -> None:
    assert margins(read, "The staple line is 2 cm from the vascular margin.") == []
