"""The six starter scheme files against the label contract (LABELS.md)."""

from __future__ import annotations

import re
from pathlib import Path

import pytest
import yaml

from pathsieve.ontology import load_ontology
from pathsieve.schemes import check_scheme, load_scheme

SCHEMES_DIR = Path(__file__).resolve().parents[2] / "ontology" / "schemes"

# Label keys and value labels of every starter scheme, in contract order (source: LABELS.md)
LABEL_KEYS = {
    "colorectal": [
        "adenocarcinoma",
        "high_grade_dysplasia",
        "low_grade_dysplasia",
        "hyperplastic_polyp",
        "sessile_serrated_lesion",
        "normal",
    ],
    "prostate": ["adenocarcinoma", "atypical_glands", "hgpin", "benign"],
    "cervix": [
        "squamous_cell_carcinoma",
        "adenocarcinoma",
        "adenocarcinoma_in_situ",
        "hsil",
        "lsil",
        "benign",
    ],
    "duodenum": [
        "celiac_disease",
        "villous_atrophy",
        "intraepithelial_lymphocytosis",
        "crypt_hyperplasia",
        "normal",
    ],
    "lung": [
        "adenocarcinoma",
        "squamous_cell_carcinoma",
        "small_cell_carcinoma",
        "large_cell_carcinoma",
        "nsclc_nos",
        "carcinoid",
        "metastatic_carcinoma",
        "benign",
    ],
    "breast": [
        "invasive_ductal_carcinoma",
        "invasive_lobular_carcinoma",
        "dcis",
        "lcis",
        "atypical_ductal_hyperplasia",
        "fibroadenoma",
        "benign",
    ],
}
COMMON_VALUES = [
    "pt",
    "pn",
    "pm",
    "lymph_nodes_positive",
    "lymph_nodes_examined",
    "margin_status",
    "tumor_size_mm",
    "lymphovascular_invasion",
]
SCHEME_VALUES = {
    "colorectal": [],
    "prostate": ["gleason_score", "grade_group"],
    "cervix": [],
    "duodenum": ["marsh_grade"],
    "lung": [],
    "breast": ["nottingham_grade", "er_status", "pr_status", "her2_status"],
}


def raw(name: str) -> dict:
    return yaml.safe_load((SCHEMES_DIR / f"{name}.yaml").read_text(encoding="utf-8"))


def test_exactly_the_six_starter_schemes() -> None:
    assert sorted(p.stem for p in SCHEMES_DIR.glob("*.yaml")) == sorted(LABEL_KEYS)


@pytest.mark.parametrize("name", sorted(LABEL_KEYS))
def test_file_shape(name: str) -> None:
    data = raw(name)
    assert set(data) == {
        "scheme",
        "title",
        "source",
        "organ",
        "labels",
        "values",
        "severity",
        "implications",
        "categories",
    }
    # every staging value the scheme emits is checked against its organ's categories
    assert set(data["categories"]) == {"pt", "pn", "pm"} & set(data["values"])
    assert data["scheme"] == name
    assert data["title"] and data["source"] and data["organ"]
    for key, label in data["labels"].items():
        assert set(label) <= {"description", "classes", "exclude"}, key
        assert label["description"] and label["classes"], key


@pytest.mark.parametrize("name", sorted(LABEL_KEYS))
def test_keys_values_and_severity(name: str) -> None:
    data = raw(name)
    assert list(data["labels"]) == LABEL_KEYS[name]
    assert data["values"] == SCHEME_VALUES[name] + COMMON_VALUES
    assert sorted(data["severity"]) == sorted(LABEL_KEYS[name])
    assert len(set(data["severity"])) == len(data["severity"])


@pytest.mark.parametrize("name", sorted(LABEL_KEYS))
def test_scheme_checks_clean_and_loads(name: str) -> None:
    assert check_scheme(name) == []
    scheme = load_scheme(name)
    onto = load_ontology()
    for label in scheme.labels.values():
        for cid in (*label.classes, *label.exclude):
            assert cid in onto
        # an exclusion must remove something the classes would otherwise count, or it does nothing
        for ex in label.exclude:
            removed = {ex} | onto.descendants(ex)
            assert any(onto.is_a(r, c) for r in removed for c in label.classes), (
                name,
                label.key,
                ex,
            )


@pytest.mark.parametrize(
    ("name", "first", "last"),
    [  # primary-label order (practice): invasive before in situ before benign
        ("colorectal", "adenocarcinoma", "normal"),
        ("prostate", "adenocarcinoma", "benign"),
        ("cervix", "squamous_cell_carcinoma", "benign"),
        ("duodenum", "celiac_disease", "normal"),
        ("lung", "small_cell_carcinoma", "benign"),
        ("breast", "invasive_ductal_carcinoma", "benign"),
    ],
)
def test_severity_ends(name: str, first: str, last: str) -> None:
    sev = raw(name)["severity"]
    assert sev[0] == first and sev[-1] == last


def test_colorectal_adenoma_implies_low_grade_dysplasia() -> None:
    # an adenoma with no grade stated is reported as low-grade dysplasia (practice; LABELS.md)
    scheme = load_scheme("colorectal")
    onto = load_ontology()
    tubular = onto.lookup("tubular adenoma")[0]
    hits = [i for i in scheme.implications if i.concept and onto.is_a(tubular, i.concept)]
    assert len(hits) == 1
    imp = hits[0]
    assert (imp.then_label, imp.then_state) == ("low_grade_dysplasia", "likely")
    assert set(imp.unless) == {"low_grade_dysplasia", "high_grade_dysplasia"}
    for adenoma in ("tubulovillous adenoma", "villous adenoma", "adenomatous polyp"):
        assert onto.is_a(onto.lookup(adenoma)[0], imp.concept)
    for not_conventional in (
        "sessile serrated lesion",
        "traditional serrated adenoma",
        "hyperplastic polyp",
    ):
        assert not onto.is_a(onto.lookup(not_conventional)[0], imp.concept)


# Marsh-Oberhuber: IEL increased in types 1-3c; crypt hyperplasia in 2-3c; villous atrophy partial (3a),
# subtotal (3b), total (3c); type 4 flat hypoplastic (source: Oberhuber G et al., 1999)
MARSH = {
    "0": set(),
    "1": {"intraepithelial_lymphocytosis"},
    "2": {"intraepithelial_lymphocytosis", "crypt_hyperplasia"},
    "3a": {"intraepithelial_lymphocytosis", "crypt_hyperplasia", "villous_atrophy"},
    "3b": {"intraepithelial_lymphocytosis", "crypt_hyperplasia", "villous_atrophy"},
    "3c": {"intraepithelial_lymphocytosis", "crypt_hyperplasia", "villous_atrophy"},
    "4": {"villous_atrophy"},
}


@pytest.mark.parametrize(("grade", "expected"), sorted(MARSH.items()))
def test_marsh_implications(grade: str, expected: set[str]) -> None:
    scheme = load_scheme("duodenum")
    implied = {
        i.then_label
        for i in scheme.implications
        if i.value_key == "marsh_grade" and grade in i.value_in and i.then_state == "present"
    }
    assert implied == expected


@pytest.mark.shared
def test_keys_match_labels_md() -> None:
    from shared_paths import SHARED

    spec = SHARED / "spec" / "LABELS.md"
    if not spec.exists():
        pytest.skip(f"label contract not present: {spec}")
    text = spec.read_text(encoding="utf-8")
    sections = re.split(r"^## ", text, flags=re.M)
    found = {}
    for sec in sections:
        name = sec.split(maxsplit=1)[0] if sec.strip() else ""
        if name not in LABEL_KEYS:
            continue
        keys, values = [], []
        for row in re.findall(r"^\| *([a-z0-9_, ]+?)( \(value\))? *\|", sec, flags=re.M):
            cells = [c.strip() for c in row[0].split(",")]
            if cells == ["key"]:
                continue
            (values if row[1] else keys).extend(cells)
        found[name] = (keys, values)
    assert set(found) == set(LABEL_KEYS)
    for name, (keys, values) in found.items():
        assert keys == LABEL_KEYS[name], name
        assert values == SCHEME_VALUES[name], name
    common = re.search(r"## Values every scheme may emit(.*)", text, flags=re.S).group(1)
    for v in COMMON_VALUES:
        assert v in common


def _with_implications(tmp_path: Path, block: str) -> Path:
    src = (SCHEMES_DIR / "lung.yaml").read_text(encoding="utf-8")
    head, rest = src.split("\nimplications:", 1)
    tail = rest[rest.index("\ncategories:") :]
    path = tmp_path / "mine.yaml"
    path.write_text(head + "\nimplications:\n" + block + tail, encoding="utf-8")
    return path


@pytest.mark.parametrize(
    ("block", "message"),
    [
        (
            "  - when: {concept: PSV:0000109, site: PSV:9999999}\n"
            "    then: {label: squamous_cell_carcinoma, state: likely}\n",
            "site PSV:9999999 is not in the ontology",
        ),
        (
            "  - when: {value: pt, in: [pT2], site: PSV:0001086}\n"
            "    then: {label: squamous_cell_carcinoma, state: likely}\n",
            "goes with 'concept'",
        ),
    ],
)
def test_implication_site_is_checked(tmp_path: Path, block: str, message: str) -> None:
    path = _with_implications(tmp_path, block)
    problems = check_scheme(path)
    assert any(message in p for p in problems), problems


def test_implication_site_loads(tmp_path: Path) -> None:
    path = _with_implications(
        tmp_path,
        "  - when: {concept: PSV:0000109, site: PSV:0001086}\n"
        "    then: {label: squamous_cell_carcinoma, state: likely}\n",
    )
    assert check_scheme(path) == []
    (imp,) = load_scheme(path).implications
    assert (imp.concept, imp.site) == ("PSV:0000109", "PSV:0001086")
