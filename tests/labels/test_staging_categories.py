"""A staging value is checked against the organ's own T/N/M categories (scheme data).

External source: AJCC Cancer Staging Manual, 8th ed. (from memory), chapter by
chapter; the 7th edition's prostate pT2a-c and the cervix chapter of the 9th
edition (FIGO 2018) where a scheme says it takes them.  The rules checked:

- prostate: there is no pathological T1 category (T1 is clinical only);
- colon and rectum: T4 has T4a/T4b and no other T subcategory; N goes to N2b (no N3);
- lung: T1mi, T1a-c, T2a/T2b; N goes to N3;
- breast: N3 has N3a-c; T4 has T4a-d.

A reading outside the organ's categories stays in the evidence (flag
``category_not_in_scheme``) and never becomes a label; a subcategory outside,
of a category inside, is read as that category (flag
``subcategory_not_in_scheme``).  Every fragment is invented (fictional Northgate
Lane laboratory).
"""

from __future__ import annotations

from functools import cache
from pathlib import Path

import pytest

from pathsieve import Labeler
from pathsieve.records import Value
from pathsieve.schemes import category_core, check_scheme, load_scheme

# AJCC 8th ed., from memory: categories every scheme must have, and some it must not
MUST_HAVE = {
    "lung": {"pt": ["T1mi", "T1a", "T1b", "T1c", "T2a", "T2b", "T3", "T4"], "pn": ["N3"]},
    "colorectal": {"pt": ["Tis", "T4a", "T4b"], "pn": ["N1c", "N2a", "N2b"]},
    "prostate": {"pt": ["T2", "T3a", "T3b", "T4"], "pn": ["N0", "N1"]},
    "cervix": {"pt": ["T1a1", "T1a2", "T1b1", "T1b2", "T2a1", "T2a2", "T2b", "T3b"]},
    "breast": {"pt": ["T1mi", "T4d"], "pn": ["N1mi", "N3a", "N3b", "N3c"]},
    "duodenum": {"pt": ["T1a", "T1b", "T4"], "pn": ["N2"]},
}
MUST_NOT_HAVE = {
    "prostate": {"pt": ["T1", "T1a", "T1b", "T1c", "Tis"], "pn": ["N2"]},
    "colorectal": {"pt": ["T3a", "T3b", "T1a"], "pn": ["N3"]},
    "lung": {"pt": ["T4a", "T1b2"], "pn": ["N1a"]},
    "duodenum": {"pn": ["N3"]},
}


@cache
def labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


@pytest.mark.parametrize("scheme", sorted(MUST_HAVE))
def test_scheme_categories_follow_ajcc(scheme: str) -> None:
    cats = load_scheme(scheme).categories
    for key, have in MUST_HAVE[scheme].items():
        assert set(have) <= cats[key], (scheme, key)
    for key, lacking in MUST_NOT_HAVE.get(scheme, {}).items():
        assert not set(lacking) & cats[key], (scheme, key)


@pytest.mark.parametrize(
    ("value", "core"),
    [
        ("ypT2a(m)", ("T2a", "T2")),
        ("rpT3", ("T3", "T3")),
        ("pN0(i+)", ("N0", "N0")),
        ("pN1mi", ("N1mi", "N1")),
        ("pT1b2", ("T1b2", "T1")),
        ("pTis", ("Tis", "Tis")),
        ("pNX", ("NX", "NX")),
        ("cM0", ("M0", "M0")),
        ("3+4=7", None),
    ],
)
def test_category_core(value: str, core: tuple[str, str] | None) -> None:
    assert category_core(value) == core


def _v(key: str, value: str) -> Value:
    return Value(key, value, value, 0, len(value), "diagnosis")


def test_fit_category_refuses_keeps_and_widens() -> None:
    prostate, colorectal = load_scheme("prostate"), load_scheme("colorectal")
    assert prostate.fit_category(_v("pt", "pT1c")) is None
    kept = prostate.fit_category(_v("pt", "pT3b"))
    assert kept is not None and kept.value == "pT3b" and not kept.flags
    wide = colorectal.fit_category(_v("pt", "ypT3b(m)"))
    assert wide is not None and wide.value == "ypT3(m)"
    assert wide.flags == ("subcategory_not_in_scheme",)
    assert colorectal.fit_category(_v("pn", "pN3")) is None
    # a value key with no categories listed passes unchanged
    assert colorectal.fit_category(_v("tumor_size_mm", "40")) is not None


PROSTATECTOMY = (
    "FINAL DIAGNOSIS:\n"
    "A. Prostate and seminal vesicles, radical prostatectomy: adenocarcinoma, Gleason 4+3=7.\n"
    "Tumour invades the right seminal vesicle. Pathologic stage: pT1b pN0.\n"
)


def test_prostate_pt1_is_evidence_not_a_label() -> None:
    result = labeler("prostate").label_report(PROSTATECTOMY)
    assert "pt" not in result.case.values
    assert result.case.values["pn"].value == "pN0"
    rows = [r for r in result.evidence if r.kind == "value" and r.value.key == "pt"]
    assert len(rows) == 1 and not rows[0].decides
    assert "category_not_in_scheme" in rows[0].value.flags
    assert PROSTATECTOMY[rows[0].value.start : rows[0].value.end] == "pT1b"


def test_prostate_pt1_beside_a_valid_category_gives_the_valid_one() -> None:
    text = PROSTATECTOMY.replace("pT1b pN0", "pT1b; on review pT3b pN0")
    assert labeler("prostate").label_report(text).case.values["pt"].value == "pT3b"


def test_colorectal_depth_subdivision_reads_as_the_ajcc_category() -> None:
    text = (
        "DIAGNOSIS:\nSigmoid colon, resection: adenocarcinoma, moderately differentiated.\n"
        "Stage: pT3c pN1b\n"
    )
    values = labeler("colorectal").label_report(text).case.values
    assert values["pt"].value == "pT3"
    assert "subcategory_not_in_scheme" in values["pt"].flags
    assert values["pn"].value == "pN1b"


def test_lung_and_cervix_subcategories_are_kept() -> None:
    lung = "DIAGNOSIS:\nRight upper lobe: adenocarcinoma, acinar. Stage pT1mi pN0.\n"
    assert labeler("lung").label_report(lung).case.values["pt"].value == "pT1mi"
    cervix = "DIAGNOSIS:\nCervix, hysterectomy: squamous cell carcinoma. pT1b2 pN0\n"
    assert labeler("cervix").label_report(cervix).case.values["pt"].value == "pT1b2"


@pytest.mark.parametrize(
    ("block", "message"),
    [
        ("categories:\n  pt: [pT2]\n", "not a bare T category"),
        ("categories:\n  pt: [N2]\n", "not a bare T category"),
        ("categories:\n  pt: [T2, T2]\n", "listed twice"),
        ("categories:\n  size: [T2]\n", "for pt, pn and pm"),
    ],
)
def test_checker_names_bad_categories(tmp_path: Path, block: str, message: str) -> None:
    src = Path(load_scheme("colorectal").path).read_text(encoding="utf-8")
    head = src.split("\ncategories:")[0]
    path = tmp_path / "mine.yaml"
    path.write_text(head + "\n" + block, encoding="utf-8")
    problems = check_scheme(path)
    assert any(message in p for p in problems), problems
    assert all(p.startswith(f"{path}:") for p in problems)
