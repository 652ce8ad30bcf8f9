"""pT / pN / pM readers.

Category syntax follows the AJCC Cancer Staging Manual, 8th edition (2017):
T: TX, T0, Tis, Ta, T1-T4 with subcategories (T1mi, T1a..c, T1a1/T1b2 for the
cervix), multiplicity "(m)"; N: NX, N0, N0(i+)/(i-)/(mol+), N1mi, N1a..N3c,
"(sn)"; M: M0 (clinical only: there is no pM0), M1, M1a..M1d; MX was removed in
the 7th edition.  Prefixes y (after therapy), r (recurrence), a (autopsy) are kept.
All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value

Read = Callable[..., list[Value]]


def tnm(read: Read, text: str) -> list[tuple[str, str, str]]:
    return [(v.key, v.value, v.text) for v in read(text) if v.key in ("pt", "pn", "pm")]


# (text, [(key, value, evidence), ...])
FORMS = [
    ("Pathologic stage: pT3 pN1a", [("pt", "pT3", "pT3"), ("pn", "pN1a", "pN1a")]),
    ("After neoadjuvant therapy: ypT0 ypN0", [("pt", "ypT0", "ypT0"), ("pn", "ypN0", "ypN0")]),
    ("Multifocal tumour, pT1b(m)", [("pt", "pT1b(m)", "pT1b(m)")]),
    ("Sentinel node with isolated tumour cells, pN0(i+)", [("pn", "pN0(i+)", "pN0(i+)")]),
    ("Micrometastasis: pN1mi", [("pn", "pN1mi", "pN1mi")]),
    ("Recurrent tumour, rpT2", [("pt", "rpT2", "rpT2")]),
    ("Intramucosal carcinoma (pTis)", [("pt", "pTis", "pTis")]),
    ("Liver metastasis confirmed: pM1c", [("pm", "pM1c", "pM1c")]),
    ("Stage: pT2 N0 MX", [("pt", "pT2", "pT2"), ("pn", "pN0", "N0")]),
    ("TNM: T3N0", [("pt", "pT3", "T3"), ("pn", "pN0", "N0")]),
    ("Pathologic Stage: pT3 N1b MX", [("pt", "pT3", "pT3"), ("pn", "pN1b", "N1b")]),
    ("Primary tumor (pT): pT2", [("pt", "pT2", "pT2")]),
    ("Primary Tumor (pT): T2", [("pt", "pT2", "T2")]),
    ("Regional Lymph Nodes (pN): N1a", [("pn", "pN1a", "N1a")]),
    ("Regional lymph nodes (pN): pN0", [("pn", "pN0", "pN0")]),
    ("Distant metastasis (pM): pM1a", [("pm", "pM1a", "pM1a")]),
    ("Primary tumor (pT): pT 2a", [("pt", "pT2a", "pT 2a")]),
    (
        "classification: p T 3, L1, V1, p N 1 (3/19)",
        [("pt", "pT3", "p T 3"), ("pn", "pN1", "p N 1")],
    ),
    ("Final TNM: pT2bN0M0", [("pt", "pT2b", "pT2b"), ("pn", "pN0", "N0"), ("pm", "cM0", "M0")]),
    ("pT4a pN2b", [("pt", "pT4a", "pT4a"), ("pn", "pN2b", "pN2b")]),
    ("pT1c pN0 (0/14)", [("pt", "pT1c", "pT1c"), ("pn", "pN0", "pN0")]),
    ("Tumour stage therefore pT3 pN2 (4/19) L0, V0", [("pt", "pT3", "pT3"), ("pn", "pN2", "pN2")]),
    ("Breast: pT1mi pN0(sn)", [("pt", "pT1mi", "pT1mi"), ("pn", "pN0(sn)", "pN0(sn)")]),
    ("Cervix: pT1a1 (FIGO 2018 IA1)", [("pt", "pT1a1", "pT1a1")]),
    ("Cervix: pT1b2", [("pt", "pT1b2", "pT1b2")]),
    ("Bladder: pTa, low grade", [("pt", "pTa", "pTa")]),
    ("No residual tumour: ypT0", [("pt", "ypT0", "ypT0")]),
    ("pTX pNX", [("pt", "pTX", "pTX"), ("pn", "pNX", "pNX")]),
    (
        "Staging: pT3a pN1 M1b",
        [("pt", "pT3a", "pT3a"), ("pn", "pN1", "pN1"), ("pm", "pM1b", "M1b")],
    ),
    ("pT2, pN1, pMX", [("pt", "pT2", "pT2"), ("pn", "pN1", "pN1")]),
    ("pT3 N0 M0", [("pt", "pT3", "pT3"), ("pn", "pN0", "N0"), ("pm", "cM0", "M0")]),
    ("ypT2 N1 (2/15)", [("pt", "ypT2", "ypT2"), ("pn", "ypN1", "N1")]),
    ("PT2 N0 MX (upper case)", [("pt", "pT2", "PT2"), ("pn", "pN0", "N0")]),
    ("pT2c, Gleason 3+3=6", [("pt", "pT2c", "pT2c")]),
    ("The tumour is staged as pT4.", [("pt", "pT4", "pT4")]),
    ("Pathological Staging (pTNM): pT1a, NO, MX", [("pt", "pT1a", "pT1a"), ("pn", "pN0", "NO")]),
    ("pN3a (12/20)", [("pn", "pN3a", "pN3a")]),
    ("pN2 (21/33), pM1 (pericardium)", [("pn", "pN2", "pN2"), ("pm", "pM1", "pM1")]),
    ("pT1 b (2).", [("pt", "pT1b(2)", "pT1 b (2)")]),
    ("pT2 pN1mi", [("pt", "pT2", "pT2"), ("pn", "pN1mi", "pN1mi")]),
    ("pN0(i-)", [("pn", "pN0(i-)", "pN0(i-)")]),
    ("pN0(mol+)", [("pn", "pN0(mol+)", "pN0(mol+)")]),
    ("ypTis ypN0", [("pt", "ypTis", "ypTis"), ("pn", "ypN0", "ypN0")]),
    ("pT4b N2a M1a", [("pt", "pT4b", "pT4b"), ("pn", "pN2a", "N2a"), ("pm", "pM1a", "M1a")]),
    ("T2 N1 M0 (pathologic)", [("pt", "pT2", "T2"), ("pn", "pN1", "N1"), ("pm", "cM0", "M0")]),
    ("pT3/pN0", [("pt", "pT3", "pT3"), ("pn", "pN0", "pN0")]),
    ("pT3; pN0.", [("pt", "pT3", "pT3"), ("pn", "pN0", "pN0")]),
    ("pT1N0", [("pt", "pT1", "pT1"), ("pn", "pN0", "N0")]),
    ("pT2 pN0 cM0", [("pt", "pT2", "pT2"), ("pn", "pN0", "pN0"), ("pm", "cM0", "cM0")]),
    ("Lung: pT1c pN2.", [("pt", "pT1c", "pT1c"), ("pn", "pN2", "pN2")]),
    ("Colon: pT3 pN1c", [("pt", "pT3", "pT3"), ("pn", "pN1c", "pN1c")]),
    ("AJCC stage pT2a pN0 pMX", [("pt", "pT2a", "pT2a"), ("pn", "pN0", "pN0")]),
    ("aT3 at autopsy: apT3", [("pt", "apT3", "apT3")]),
    ("pN1(sn)", [("pn", "pN1(sn)", "pN1(sn)")]),
]


@pytest.mark.parametrize(("text", "expected"), FORMS)
def test_tnm_forms(read: Read, text: str, expected: list[tuple[str, str, str]]) -> None:
    assert tnm(read, text) == expected


def test_table_has_fifty_forms() -> None:
    assert len(FORMS) >= 50


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("pTIa, pNO (0/16), LO, VO", [("pt", "pT1a", "pTIa"), ("pn", "pN0", "pNO")]),
        ("Pathological Staging (pTNM): pT I NO MX", [("pt", "pT1", "pT I"), ("pn", "pN0", "NO")]),
        ("pT3 NO MX", [("pt", "pT3", "pT3"), ("pn", "pN0", "NO")]),
        ("pNl (1/15)", [("pn", "pN1", "pNl")]),
    ],
)
def test_ocr_digits_are_read_and_flagged(
    read: Read, text: str, expected: list[tuple[str, str, str]]
) -> None:
    # OCR letters for digits (O for 0, I/l for 1) only where the category letter makes them certain
    assert tnm(read, text) == expected
    for v in read(text):
        if v.key in ("pt", "pn"):
            assert ("ocr_corrected" in v.flags) == any(c in v.text for c in "OIl"), v


@pytest.mark.parametrize(
    "text",
    [
        "pT2 N0 MX",
        "pT2 pN0 pMX",
        "Distant metastasis (pM): MX",
        "pMX",
        "pT3 N1 Mx",
    ],
)
def test_mx_is_not_a_category(read: Read, text: str) -> None:
    # AJCC 7th/8th edition: MX is not valid; a missing M is reported as missing, not invented
    assert [v for v in read(text) if v.key == "pm"] == []


def test_pm0_is_read_as_clinical_m0_and_flagged(read: Read) -> None:
    # AJCC 8th edition: "pM0" is not a valid category; M0 is clinical
    (m,) = [v for v in read("pT2 pN0 pM0") if v.key == "pm"]
    assert m.value == "cM0"
    assert "pm0_not_valid" in m.flags


def test_bare_n_takes_the_prefix_of_its_string(read: Read) -> None:
    # "a bare N0 following a pT in a staging string normalises to pN0"
    (n,) = [v for v in read("pT3 N0") if v.key == "pn"]
    assert n.value == "pN0" and n.detail["prefix"] == "" and n.flags == ()
    (n,) = [v for v in read("ypT3 N0") if v.key == "pn"]
    assert n.value == "ypN0"


def test_unprefixed_string_is_pathological_with_a_flag(read: Read) -> None:
    for v in read("T3N0"):
        assert "prefix_assumed" in v.flags
        assert v.detail["prefix"] == ""
        assert v.detail["raw"] == v.text


@pytest.mark.parametrize(
    "text",
    [
        "Clinical stage cT2 N0 M0 before surgery.",
        "clinically T2N0",
        "cT3",
        "MRI: T2-weighted images show no lesion.",
        "Vertebra T12 is unremarkable.",
        "T2 hyperintense lesion",
        "No lymph nodes identified. No tumour.",
        "pT2 No evidence of lymphovascular invasion.",
        "MACROSCOPIC DESCRI PTION: received in formalin",
        "pT5",
        "pT0a",
        "pN4",
        "The pTNM classification could not be assigned.",
        "PT/INR 12.5 sec",
        "Primary tumor (pT): Cannot be assessed",
    ],
)
def test_no_category_where_none_is_stated(read: Read, text: str) -> None:
    found = tnm(read, text)
    if text.startswith("pT2 No"):
        assert found == [("pt", "pT2", "pT2")]  # the T is real; "No" is not N0
    else:
        assert found == []


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("Pathologic Stage: pT3c/d N2 MX", [("pt", "pT3", "pT3c/d"), ("pn", "pN2", "N2")]),
        ("pT2a/b pN1a/b", [("pt", "pT2", "pT2a/b"), ("pn", "pN1", "pN1a/b")]),
    ],
)
def test_two_subcategories_give_the_category_they_share(
    read: Read, text: str, expected: list[tuple[str, str, str]]
) -> None:
    # "pT3c/d" is pT3 whichever subcategory is meant: the shared category is stated;
    # the subcategory is not, and the flag says so (trade practice, no source)
    assert tnm(read, text) == expected
    for v in read(text):
        if "/" in v.text:
            assert "subcategory_uncertain" in v.flags


@pytest.mark.parametrize(
    ("text", "bad"),
    [
        ("pN2mi", "pn"),  # only N1mi exists
        ("pT2mi", "pt"),  # only T1mi exists
        ("pN1(i+)", "pn"),  # isolated tumour cells qualify N0 only
        ("pM0a", "pm"),
    ],
)
def test_invalid_categories_are_not_read(read: Read, text: str, bad: str) -> None:
    # AJCC 8th edition category syntax
    assert [v for v in read(text) if v.key == bad] == []


def test_detail_keeps_prefix_and_raw_text(read: Read) -> None:
    (t,) = [v for v in read("ypT1b(m) ypN0") if v.key == "pt"]
    assert t.detail == {"prefix": "yp", "raw": "ypT1b(m)"}


def test_regions_bound_the_staging_string(read: Read) -> None:
    from pathsieve.values import extract_values

    text = "pT3\nN1 in the next region"
    values = extract_values(text, [(0, 4, "diagnosis", "A"), (4, len(text), "comment", "A")])
    assert [(v.key, v.value, v.section) for v in values] == [("pt", "pT3", "diagnosis")]
