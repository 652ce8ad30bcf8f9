"""ICD-O-3 morphology codes in the shipped ontology, read with pronto directly.

Every code cited in LABELS.md must resolve to the right concept, and every coded concept must sit
under the behaviour anchor its fifth digit names (/0 benign, /1 uncertain, /2 in situ, /3 malignant).
"""

from __future__ import annotations

import re
import warnings
from collections import defaultdict
from pathlib import Path

import pronto
import pytest

OBO = Path(__file__).resolve().parents[2] / "ontology" / "pathsieve.obo"
ANCHOR = {
    "0": "behaviour_benign",
    "1": "behaviour_uncertain",
    "2": "behaviour_in_situ",
    "3": "behaviour_malignant",
}


@pytest.fixture(scope="module")
def onto() -> pronto.Ontology:
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # the shipped file must parse without a single warning
        return pronto.Ontology(str(OBO))


@pytest.fixture(scope="module")
def by_code(onto: pronto.Ontology) -> dict[str, list[pronto.Term]]:
    out: dict[str, list[pronto.Term]] = defaultdict(list)
    for t in onto.terms():
        for x in t.xrefs:
            if x.id.startswith("ICDO3:"):
                out[x.id[6:]].append(t)
    return out


def _lineage(t: pronto.Term) -> list[pronto.Term]:
    return list(t.superclasses(with_self=True))


def _subsets(t: pronto.Term) -> set[str]:
    return {s for a in _lineage(t) for s in a.subsets}


# (code, concept name): the codes cited in LABELS.md (source: ICD-O-3; WHO Classification of Tumours)
LABELS_CODES = [
    ("8140/3", "adenocarcinoma"),  # colorectal, prostate, cervix, lung
    ("8480/3", "mucinous adenocarcinoma"),  # colorectal
    ("8490/3", "signet ring cell carcinoma"),  # colorectal
    ("8510/3", "medullary carcinoma"),  # colorectal (medullary adenocarcinoma)
    ("8070/3", "squamous cell carcinoma"),  # cervix, lung
    ("8140/2", "adenocarcinoma in situ"),  # cervix AIS
    ("8041/3", "small cell carcinoma"),  # lung
    (
        "8500/3",
        "invasive breast carcinoma of no special type",
    ),  # breast (infiltrating duct carcinoma)
    ("8520/3", "invasive lobular carcinoma"),  # breast (lobular carcinoma NOS)
    ("8500/2", "ductal carcinoma in situ"),  # breast (intraductal carcinoma, noninfiltrating)
]

# further codes the ontology carries (source: ICD-O-3 and WHO Classification of Tumours, from memory)
OTHER_CODES = [
    ("8010/3", "carcinoma, not otherwise specified"),
    ("8010/2", "carcinoma in situ"),
    ("8210/0", "conventional adenoma"),  # adenomatous polyp NOS
    ("8211/0", "tubular adenoma"),
    ("8263/0", "tubulovillous adenoma"),
    ("8261/0", "villous adenoma"),
    ("8213/0", "sessile serrated lesion"),
    ("8213/0", "traditional serrated adenoma"),
    ("8213/3", "serrated adenocarcinoma"),
    ("8077/2", "high-grade squamous intraepithelial lesion"),
    ("8077/2", "cervical intraepithelial neoplasia grade 3"),
    ("8070/2", "squamous cell carcinoma in situ"),
    ("8071/3", "keratinizing squamous cell carcinoma"),
    ("8072/3", "non-keratinizing squamous cell carcinoma"),
    ("8083/3", "basaloid squamous cell carcinoma"),
    ("8076/3", "microinvasive squamous cell carcinoma"),
    ("8012/3", "large cell carcinoma"),
    ("8013/3", "large cell neuroendocrine carcinoma"),
    ("8045/3", "combined small cell carcinoma"),
    ("8046/3", "non-small cell carcinoma"),
    ("8240/3", "typical carcinoid"),
    ("8249/3", "atypical carcinoid"),
    ("8250/3", "lepidic predominant adenocarcinoma"),
    ("8551/3", "acinar predominant adenocarcinoma"),
    ("8260/3", "papillary predominant adenocarcinoma"),
    ("8265/3", "micropapillary predominant adenocarcinoma"),
    ("8230/3", "solid predominant adenocarcinoma"),
    ("8253/3", "invasive mucinous adenocarcinoma"),
    ("8256/3", "minimally invasive adenocarcinoma, non-mucinous"),
    ("8257/3", "minimally invasive adenocarcinoma, mucinous"),
    ("8250/2", "adenocarcinoma in situ of lung, non-mucinous"),
    ("8253/2", "adenocarcinoma in situ of lung, mucinous"),
    ("8140/3", "prostatic acinar adenocarcinoma"),  # not 8550/3, which is acinar cell carcinoma
    ("8500/3", "prostatic ductal adenocarcinoma"),
    ("8500/2", "intraductal carcinoma of prostate"),
    ("8148/2", "high-grade prostatic intraepithelial neoplasia"),
    ("8550/3", "acinar cell carcinoma"),
    ("8520/2", "lobular carcinoma in situ"),
    ("8522/3", "invasive carcinoma with ductal and lobular features"),
    ("9010/0", "fibroadenoma"),
    ("9020/0", "benign phyllodes tumor"),
    ("9020/1", "borderline phyllodes tumor"),
    ("9020/3", "malignant phyllodes tumor"),
    ("8503/0", "intraductal papilloma"),
]


def test_parses_without_warnings(onto: pronto.Ontology) -> None:
    assert len(list(onto.terms())) > 400


@pytest.mark.parametrize(("code", "name"), LABELS_CODES + OTHER_CODES)
def test_code_resolves_to_concept(
    by_code: dict[str, list[pronto.Term]], code: str, name: str
) -> None:
    assert name in [t.name for t in by_code[code]], f"{code} should be on {name!r}"


@pytest.mark.parametrize(("code", "name"), LABELS_CODES + OTHER_CODES)
def test_behaviour_digit_matches_place(
    onto: pronto.Ontology, by_code: dict, code: str, name: str
) -> None:
    term = next(t for t in by_code[code] if t.name == name)
    subsets = _subsets(term)
    assert ANCHOR[code[-1]] in subsets
    # and it does not also sit under a contradictory anchor
    assert not (subsets & set(ANCHOR.values())) - {ANCHOR[code[-1]]}


def test_every_coded_term_agrees_with_its_anchor(onto: pronto.Ontology) -> None:
    problems = []
    for t in onto.terms():
        codes = [x.id[6:] for x in t.xrefs if x.id.startswith("ICDO3:")]
        assert len(codes) <= 1, f"{t.id} carries several ICD-O-3 codes"
        for code in codes:
            assert re.fullmatch(r"[89]\d{3}/[0-3]", code), f"{t.id}: malformed code {code}"
            if ANCHOR[code[-1]] not in _subsets(t):
                problems.append(f"{t.id} {t.name} {code}")
    assert problems == []


@pytest.mark.parametrize(
    ("name", "not_ancestor"),
    [  # invasive and non-invasive classes must not cross (source: ICD-O-3 behaviour codes)
        ("adenocarcinoma in situ of lung", "lung adenocarcinoma"),
        ("adenocarcinoma in situ", "adenocarcinoma"),
        ("ductal carcinoma in situ", "invasive breast carcinoma"),
        ("squamous cell carcinoma in situ", "squamous cell carcinoma"),
        ("intramucosal carcinoma", "adenocarcinoma"),
        ("high-grade prostatic intraepithelial neoplasia", "prostatic adenocarcinoma"),
        ("acinar cell carcinoma", "prostatic adenocarcinoma"),
        ("lobular carcinoma in situ", "invasive lobular carcinoma"),
    ],
)
def test_in_situ_not_under_invasive(onto: pronto.Ontology, name: str, not_ancestor: str) -> None:
    term = next(t for t in onto.terms() if t.name == name)
    assert not_ancestor not in {a.name for a in _lineage(term)}


def test_ncit_xrefs_are_marked_from_memory(onto: pronto.Ontology) -> None:
    ncit = [(t.id, x) for t in onto.terms() for x in t.xrefs if x.id.startswith("NCIT:")]
    assert ncit
    for tid, x in ncit:
        assert re.fullmatch(r"NCIT:C\d+", x.id), tid
        assert x.description == "from memory", tid
