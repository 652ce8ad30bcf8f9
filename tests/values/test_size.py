"""Tumour size in millimetres (the greatest dimension).

Rules: the size is the greatest of the stated dimensions (CAP cancer protocols
report the greatest dimension, *(practice)*); cm -> mm by x10 (SI).  Only sizes
said to be of the tumour or lesion are read; specimen and container dimensions,
distances and definitions are not.  All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value

Read = Callable[..., list[Value]]


def sizes(read: Read, text: str, section: str = "diagnosis") -> list[tuple[float, str]]:
    return [(v.value, v.text) for v in read(text, section) if v.key == "tumor_size_mm"]


FORMS = [
    ("A 2.5 cm tumor is present.", [(25.0, "2.5 cm tumor")]),
    ("Tumor size: 25 mm", [(25.0, "Tumor size: 25 mm")]),
    ("The tumor measures 2.5 x 1.8 x 1.0 cm.", [(25.0, "tumor measures 2.5 x 1.8 x 1.0 cm")]),
    ("Tumor size: 1.2 cm", [(12.0, "Tumor size: 1.2 cm")]),
    ("Greatest dimension: 3.1 cm", [(31.0, "Greatest dimension: 3.1 cm")]),
    ("A 2.1 cm mass is identified in the upper lobe.", [(21.0, "2.1 cm mass")]),
    ("Tumor size: Greatest dimension: 3.1 cm", [(31.0, "Tumor size: Greatest dimension: 3.1 cm")]),
    (
        "TUMOR SIZE:\nGreatest dimension: 1.2 cm",
        [(12.0, "TUMOR SIZE:\nGreatest dimension: 1.2 cm")],
    ),
    ("Tumour size: 4.5 x 3 x 1 cm", [(45.0, "Tumour size: 4.5 x 3 x 1 cm")]),
    ("Size of invasive carcinoma: 1.5 cm", [(15.0, "Size of invasive carcinoma: 1.5 cm")]),
    ("Maximum tumor diameter 16 mm", [(16.0, "Maximum tumor diameter 16 mm")]),
    ("max. tumor diameter: 50 mm", [(50.0, "max. tumor diameter: 50 mm")]),
    (
        "a grayish white tumor measuring 2.4 x 2.1 x 0.4 cm",
        [(24.0, "tumor measuring 2.4 x 2.1 x 0.4 cm")],
    ),
    (
        "an ulcerated mass measuring 3.0 x 2.5 x 0.4 cm",
        [(30.0, "mass measuring 3.0 x 2.5 x 0.4 cm")],
    ),
    ("Tumor 5.7 cm in greatest diameter.", [(57.0, "Tumor 5.7 cm")]),
    ("Invasive ductal carcinoma, 2.3 cm.", [(23.0, "carcinoma, 2.3 cm")]),
    ("Typical carcinoid tumor, 2.7 cm; margins negative.", [(27.0, "tumor, 2.7 cm")]),
    ("The lesion is 1.5 cm in greatest dimension.", [(15.0, "lesion is 1.5 cm")]),
    (
        "black nodule which measures 1.8 x 1.5 x 1.5 cm",
        [(18.0, "nodule which measures 1.8 x 1.5 x 1.5 cm")],
    ),
    ("TUMOR SIZE: Maximum dimension: 2.0 cm", [(20.0, "TUMOR SIZE: Maximum dimension: 2.0 cm")]),
    ("Tumor size: 0 x 0 x 8.5 cm", [(85.0, "Tumor size: 0 x 0 x 8.5 cm")]),
    (
        "a firm, tan-gray mass measuring 0.9 cm, 24 mm from the pleura",
        [(9.0, "mass measuring 0.9 cm")],
    ),
    ("Dominant nodule, right posterior, 2.3 cm.", [(23.0, "nodule, right posterior, 2.3 cm")]),
    ("Tumor size (dominant nodule): 1.2 cm", [(12.0, "Tumor size (dominant nodule): 1.2 cm")]),
    (
        "Invasive adenocarcinoma, lepidic predominant, 1.6 cm; margins free.",
        [(16.0, "adenocarcinoma, lepidic predominant, 1.6 cm")],
    ),
    ("depth of invasion 2.5 mm, horizontal extent 5 mm", [(5.0, "horizontal extent 5 mm")]),
    ("The tumour measures 25 x 18 mm.", [(25.0, "tumour measures 25 x 18 mm")]),
    (
        "The mass measures 2.5 cm x 2.0 cm x 1.1 cm.",
        [(25.0, "mass measures 2.5 cm x 2.0 cm x 1.1 cm")],
    ),
    ("A 3 cm diameter lesion.", [(30.0, "3 cm diameter lesion")]),
    ("A 2.1-cm nodule.", [(21.0, "2.1-cm nodule")]),
    ("a 1.2 cm firm tan-white mass", [(12.0, "1.2 cm firm tan-white mass")]),
    ("Tumor size: approximately 3.5 cm", [(35.0, "Tumor size: approximately 3.5 cm")]),
    ("The tumor measures approximately 4 cm.", [(40.0, "tumor measures approximately 4 cm")]),
    ("a polyp measuring 1.6 cm with a 0.3 cm stalk", [(16.0, "polyp measuring 1.6 cm")]),
    (
        "Size of largest invasive carcinoma: 22 mm",
        [(22.0, "Size of largest invasive carcinoma: 22 mm")],
    ),
    ("Invasive tumor size: 1.4 cm", [(14.0, "Invasive tumor size: 1.4 cm")]),
    ("Tumor dimensions: 3.2 x 2.0 x 1.5 cm", [(32.0, "Tumor dimensions: 3.2 x 2.0 x 1.5 cm")]),
    ("carcinoma measuring up to 1.1 cm", [(11.0, "carcinoma measuring up to 1.1 cm")]),
    ("Adenocarcinoma (4.2 cm) of the sigmoid colon", [(42.0, "Adenocarcinoma (4.2 cm)")]),
    ("Squamous cell carcinoma, keratinizing, 2.2 cm;", [(22.0, "carcinoma, keratinizing, 2.2 cm")]),
    ("a 4.8 x 3.9 cm mass", [(48.0, "4.8 x 3.9 cm mass")]),
    ("the lesion measures 8 mm", [(8.0, "lesion measures 8 mm")]),
    ("Tumor size: 1.7 cm (microscopic)", [(17.0, "Tumor size: 1.7 cm")]),
    ("LESION SIZE: 0.6 CM", [(6.0, "LESION SIZE: 0.6 CM")]),
    (
        "A well-circumscribed nodule measuring 1.1 x 0.9 x 0.8 cm",
        [(11.0, "nodule measuring 1.1 x 0.9 x 0.8 cm")],
    ),
    ("Tumor measures 2.0 cm in greatest dimension.", [(20.0, "Tumor measures 2.0 cm")]),
    ("Greatest tumor dimension: 14 mm", [(14.0, "Greatest tumor dimension: 14 mm")]),
    ("tumor, which measures 3.3 cm", [(33.0, "tumor, which measures 3.3 cm")]),
    ("mass, 2.2 x 2.0 x 1.9 cm", [(22.0, "mass, 2.2 x 2.0 x 1.9 cm")]),
    ("Maximum diameter: 2.4 cm", [(24.0, "Maximum diameter: 2.4 cm")]),
    ("A 5 mm sigmoid polyp.", [(5.0, "5 mm sigmoid polyp")]),
]


@pytest.mark.parametrize(("text", "expected"), FORMS)
def test_size_forms(read: Read, text: str, expected: list[tuple[float, str]]) -> None:
    assert sizes(read, text) == expected


def test_table_has_fifty_forms() -> None:
    assert len(FORMS) >= 50


@pytest.mark.parametrize(
    ("text", "mm", "dims"),
    [
        ("Tumor size: 0.3 cm", 3.0, (3.0,)),  # 0.3 x 10 is exactly 3.0 in decimal arithmetic
        ("Tumor size: 2.5 x 1.8 x 1.0 cm", 25.0, (25.0, 18.0, 10.0)),
        ("Tumor size: 1.8 x 2.5 cm", 25.0, (18.0, 25.0)),
        ("Tumor size: 12 mm", 12.0, (12.0,)),
        ("Tumor size: 0.25 cm", 2.5, (2.5,)),
        ("Tumor size: 2 centimeters", 20.0, (20.0,)),
        ("Tumor size: 15 millimetres", 15.0, (15.0,)),
        ("Tumor size: 2.5 cm x 18 mm", 25.0, (25.0, 18.0)),
    ],
)
def test_greatest_dimension_in_millimetres(
    read: Read, text: str, mm: float, dims: tuple[float, ...]
) -> None:
    # unit conversion cm -> mm (SI: 1 cm = 10 mm); greatest dimension is the maximum
    (v,) = [v for v in read(text) if v.key == "tumor_size_mm"]
    assert v.value == mm
    assert v.detail["dimensions_mm"] == dims


@pytest.mark.parametrize(
    "text",
    [
        "Received in formalin is a specimen measuring 5 x 4 x 2 cm.",
        "The specimen is a mass of fibrofatty tissue measuring 5 x 4 x 2 cm.",
        "Received fresh is a lobectomy specimen, 17.0 x 11.0 x 5.0 cm.",
        "Carcinoma is 0.5 cm from the deep margin.",
        "The tumor is located 3 cm from the distal margin.",
        "pT1b: Tumor greater than 2 cm, but 3 cm or less in greatest dimension.",
        "Tumor 2 cm or less in greatest dimension.",
        "Fragments of tumor measuring 2 x 1 cm in aggregate.",
        "Five cores, 10 to 17 mm.",
        "The lymph node measures 1.2 cm.",
        "Size of largest metastatic deposit: 4 mm",
        "Lymph node, greatest dimension: 1.2 cm",
        "Tumor size: cannot be determined.",
        "A firm yellow area, 2.3 cm.",
        "Tumor bed measures 2 cm.",
        "Tumor thickness 0.5 cm.",
        "Tumour size (cm) 4,2999999999999998",
        "tumor 2.4 x 2.1 x 0.4 em",  # OCR-mangled unit: not read
        "Segment of colon, 21.0 cm in length, with a tumor.",
        "Depth of invasion: 4 mm",
        "1.5 cm from the tumor",
    ],
)
def test_no_size_where_it_is_not_the_tumours(read: Read, text: str) -> None:
    assert sizes(read, text) == []
