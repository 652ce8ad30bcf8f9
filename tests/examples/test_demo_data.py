"""Checks on the bundled demo data: invented reports and their hand-coded gold.

The demo files are data other parts of pathsieve are measured against (``make demo``, the
validation and review tools), so their shape is tested here: coverage of every scheme, a gold
row for every label key, valid state words and value forms, and values that agree with the
published tables they come from.
"""

from __future__ import annotations

import csv
import importlib.util
import os
import re
import statistics
import sys
from collections import Counter, defaultdict
from pathlib import Path
from types import ModuleType

import pytest

REPO = Path(__file__).resolve().parents[2]
EXAMPLES = REPO / "examples"
SHARED = Path(os.environ.get("PATHSIEVE_SHARED", REPO.parent / "shared"))

# Label keys of the six starter schemes, exactly as the label contract (LABELS.md) names them.
SCHEME_KEYS: dict[str, tuple[str, ...]] = {
    "colorectal": (
        "adenocarcinoma",
        "high_grade_dysplasia",
        "low_grade_dysplasia",
        "hyperplastic_polyp",
        "sessile_serrated_lesion",
        "normal",
    ),
    "prostate": ("adenocarcinoma", "atypical_glands", "hgpin", "benign"),
    "cervix": (
        "squamous_cell_carcinoma",
        "adenocarcinoma",
        "adenocarcinoma_in_situ",
        "hsil",
        "lsil",
        "benign",
    ),
    "duodenum": (
        "celiac_disease",
        "villous_atrophy",
        "intraepithelial_lymphocytosis",
        "crypt_hyperplasia",
        "normal",
    ),
    "lung": (
        "adenocarcinoma",
        "squamous_cell_carcinoma",
        "small_cell_carcinoma",
        "large_cell_carcinoma",
        "nsclc_nos",
        "carcinoid",
        "metastatic_carcinoma",
        "benign",
    ),
    "breast": (
        "invasive_ductal_carcinoma",
        "invasive_lobular_carcinoma",
        "dcis",
        "lcis",
        "atypical_ductal_hyperplasia",
        "fibroadenoma",
        "benign",
    ),
}
COMMON_VALUES = {
    "pt",
    "pn",
    "pm",
    "lymph_nodes_positive",
    "lymph_nodes_examined",
    "margin_status",
    "tumor_size_mm",
    "lymphovascular_invasion",
}
SCHEME_VALUES: dict[str, set[str]] = {
    "colorectal": COMMON_VALUES,
    "prostate": COMMON_VALUES | {"gleason_score", "grade_group"},
    "cervix": COMMON_VALUES,
    "duodenum": COMMON_VALUES | {"marsh_grade"},
    "lung": COMMON_VALUES,
    "breast": COMMON_VALUES | {"nottingham_grade", "er_status", "pr_status", "her2_status"},
}
STATE_WORDS = {"present", "likely", "uncertain", "unlikely", "absent", "unmentioned"}

# AJCC 8th edition pathological category syntax: optional y/r prefix, then p + T/N/M category
# (TX/T0/Tis/T1mi/T1-4 with a-d, plus the cervix sub-subcategories T1a1-T2a2; NX/N0/N1mi/
# N1-3 with a-c; M1 with a-d). (from memory)
PT_RE = re.compile(r"^(?:y|r|yr)?pT(?:X|0|is|1mi|[1-4][a-d]?|[12][ab][12])$")
PN_RE = re.compile(r"^(?:y|r|yr)?pN(?:X|0|1mi|[1-3][a-c]?)$")
PM_RE = re.compile(r"^(?:y|r|yr)?pM1[a-d]?$")  # pM0 and pMX are not pathological categories


def isup_grade_group(primary: int, secondary: int) -> int:
    """ISUP 2014 / WHO 2016 grade groups (Epstein et al., Am J Surg Pathol 2016;40:244)."""
    total = primary + secondary
    if total <= 6:
        return 1
    if total == 7:
        return 2 if primary == 3 else 3
    return 4 if total == 8 else 5


# ----------------------------------------------------------------------------- fixtures


def read_csv(path: Path) -> list[dict[str, str]]:
    with path.open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(fh, strict=True))


@pytest.fixture(scope="module")
def reports() -> list[dict[str, str]]:
    return read_csv(EXAMPLES / "demo_reports.csv")


@pytest.fixture(scope="module")
def gold() -> list[dict[str, str]]:
    return read_csv(EXAMPLES / "demo_gold.csv")


@pytest.fixture(scope="module")
def gold_by_case(gold: list[dict[str, str]]) -> dict[str, dict[str, str]]:
    out: dict[str, dict[str, str]] = defaultdict(dict)
    for row in gold:
        out[row["case_id"]][row["label"]] = row["expected"]
    return out


def load_generator() -> ModuleType:
    spec = importlib.util.spec_from_file_location("generate_demo", EXAMPLES / "generate_demo.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    sys.modules["generate_demo"] = module  # dataclasses resolve annotations through sys.modules
    spec.loader.exec_module(module)
    return module


# ----------------------------------------------------------------------------- file shape


def test_headers() -> None:
    for name, header in (
        ("demo_reports.csv", "case_id,scheme,text"),
        ("demo_gold.csv", "case_id,scheme,label,expected"),
    ):
        first = (EXAMPLES / name).read_text(encoding="utf-8").splitlines()[0]
        assert first == header, name


def test_case_ids_unique_and_well_formed(reports: list[dict[str, str]]) -> None:
    ids = [r["case_id"] for r in reports]
    assert len(ids) == len(set(ids))
    bad = [i for i in ids if not re.fullmatch(r"LRP-26-\d{6}", i)]
    assert not bad


def test_at_least_forty_cases_per_scheme(reports: list[dict[str, str]]) -> None:
    counts = Counter(r["scheme"] for r in reports)
    assert set(counts) == set(SCHEME_KEYS)
    assert all(n >= 40 for n in counts.values()), counts


def test_report_lengths(reports: list[dict[str, str]]) -> None:
    lengths = [len(r["text"]) for r in reports]
    assert 600 <= statistics.mean(lengths) <= 1500
    assert all(len(r["text"].strip()) >= 50 for r in reports)


def test_gold_and_reports_cover_the_same_cases(
    reports: list[dict[str, str]], gold: list[dict[str, str]]
) -> None:
    scheme_of = {r["case_id"]: r["scheme"] for r in reports}
    assert {g["case_id"] for g in gold} == set(scheme_of)
    wrong = [g for g in gold if scheme_of[g["case_id"]] != g["scheme"]]
    assert not wrong


def test_no_duplicate_gold_rows(gold: list[dict[str, str]]) -> None:
    keys = Counter((g["case_id"], g["label"]) for g in gold)
    assert [k for k, n in keys.items() if n > 1] == []


def test_every_case_has_every_label_key(
    reports: list[dict[str, str]], gold_by_case: dict[str, dict[str, str]]
) -> None:
    for r in reports:
        have = gold_by_case[r["case_id"]]
        missing = [k for k in SCHEME_KEYS[r["scheme"]] if k not in have]
        assert not missing, (r["case_id"], missing)


def test_labels_belong_to_the_scheme(gold: list[dict[str, str]]) -> None:
    for g in gold:
        allowed = set(SCHEME_KEYS[g["scheme"]]) | SCHEME_VALUES[g["scheme"]]
        assert g["label"] in allowed, g


def test_binary_states_are_state_words(gold: list[dict[str, str]]) -> None:
    for g in gold:
        if g["label"] in SCHEME_KEYS[g["scheme"]]:
            assert g["expected"] in STATE_WORDS, g


# ----------------------------------------------------------------------------- value forms

VALUE_FORMS: dict[str, re.Pattern[str]] = {
    "gleason_score": re.compile(r"^[1-5]\+[1-5]=(?:[2-9]|10)$"),
    "grade_group": re.compile(r"^[1-5]$"),
    "marsh_grade": re.compile(r"^(?:0|1|2|3a|3b|3c|4)$"),  # Marsh 1992 / Oberhuber 1999
    "nottingham_grade": re.compile(r"^[1-3]$"),
    "er_status": re.compile(r"^(?:positive|negative)$"),
    "pr_status": re.compile(r"^(?:positive|negative)$"),
    "her2_status": re.compile(r"^(?:positive|negative|equivocal)$"),  # ASCO/CAP 2018
    "pt": PT_RE,
    "pn": PN_RE,
    "pm": PM_RE,
    "lymph_nodes_positive": re.compile(r"^\d+$"),
    "lymph_nodes_examined": re.compile(r"^\d+$"),
    "margin_status": re.compile(r"^(?:involved|negative)$"),
    "tumor_size_mm": re.compile(r"^\d+\.\d$"),
    "lymphovascular_invasion": re.compile(r"^(?:present|absent)$"),
}


def value_rows(gold: list[dict[str, str]]) -> list[dict[str, str]]:
    return [g for g in gold if g["label"] not in SCHEME_KEYS[g["scheme"]]]


def test_value_forms(gold: list[dict[str, str]]) -> None:
    for g in value_rows(gold):
        assert VALUE_FORMS[g["label"]].match(g["expected"]), g


def test_no_pmx(gold: list[dict[str, str]]) -> None:
    assert not [g for g in gold if g["expected"].lower().endswith("mx")]


@pytest.mark.parametrize(
    ("category", "pattern", "ok"),
    [
        ("pT3a", PT_RE, True),
        ("ypT0", PT_RE, True),
        ("pTis", PT_RE, True),
        ("pT1mi", PT_RE, True),
        ("pT1a1", PT_RE, True),
        ("pT5", PT_RE, False),
        ("pT1e", PT_RE, False),
        ("T3", PT_RE, False),
        ("ypN1a", PN_RE, True),
        ("pNX", PN_RE, True),
        ("pN3d", PN_RE, False),
        ("pM1a", PM_RE, True),
        ("pMX", PM_RE, False),
        ("pM0", PM_RE, False),
    ],
)
def test_ajcc_syntax_table(category: str, pattern: re.Pattern[str], ok: bool) -> None:
    assert bool(pattern.match(category)) is ok


@pytest.mark.parametrize(
    ("primary", "secondary", "group"),
    # ISUP 2014 / WHO 2016 grade groups (Epstein et al. 2016)
    [
        (3, 3, 1),
        (3, 4, 2),
        (4, 3, 3),
        (4, 4, 4),
        (3, 5, 4),
        (5, 3, 4),
        (4, 5, 5),
        (5, 4, 5),
        (5, 5, 5),
    ],
)
def test_isup_table(primary: int, secondary: int, group: int) -> None:
    assert isup_grade_group(primary, secondary) == group


def test_gleason_scores_add_up_and_match_grade_group(
    gold_by_case: dict[str, dict[str, str]],
) -> None:
    seen = 0
    for case_id, rows in gold_by_case.items():
        score = rows.get("gleason_score")
        if score is None:
            continue
        seen += 1
        m = re.fullmatch(r"(\d)\+(\d)=(\d+)", score)
        assert m, (case_id, score)
        p, s, total = (int(x) for x in m.groups())
        assert p + s == total, (case_id, score)
        # a Gleason score always comes with its grade group (derived when not written)
        assert rows.get("grade_group") == str(isup_grade_group(p, s)), (case_id, rows)
    assert seen >= 20


def test_lymph_node_counts(gold_by_case: dict[str, dict[str, str]]) -> None:
    for case_id, rows in gold_by_case.items():
        pos, exam = rows.get("lymph_nodes_positive"), rows.get("lymph_nodes_examined")
        assert (pos is None) == (exam is None), case_id
        if pos is not None and exam is not None:
            assert 0 <= int(pos) <= int(exam), case_id


def test_colorectal_pn_agrees_with_node_count(
    reports: list[dict[str, str]], gold_by_case: dict[str, dict[str, str]]
) -> None:
    # AJCC 8th colorectal: N0 none, N1a 1, N1b 2-3, N2a 4-6, N2b >= 7 (from memory)
    def category(n: int) -> str:
        return (
            "N0" if n == 0 else "N1a" if n == 1 else "N1b" if n <= 3 else "N2a" if n <= 6 else "N2b"
        )

    checked = 0
    for r in reports:
        rows = gold_by_case[r["case_id"]]
        if r["scheme"] != "colorectal" or "pn" not in rows or "lymph_nodes_positive" not in rows:
            continue
        checked += 1
        assert rows["pn"].endswith(category(int(rows["lymph_nodes_positive"]))), rows
    assert checked >= 5


def test_treatment_prefix_is_consistent(gold_by_case: dict[str, dict[str, str]]) -> None:
    # the y prefix describes the whole post-therapy classification (AJCC 8th; from memory)
    for case_id, rows in gold_by_case.items():
        if "pt" in rows and "pn" in rows:
            assert rows["pt"].startswith("y") == rows["pn"].startswith("y"), case_id


def test_state_mix_is_realistic(gold: list[dict[str, str]]) -> None:
    # every hedge level and every kind of negative occurs, so the demo exercises them all
    states = Counter(g["expected"] for g in gold if g["label"] in SCHEME_KEYS[g["scheme"]])
    assert all(states[s] >= 5 for s in STATE_WORDS), states
    for scheme, keys in SCHEME_KEYS.items():
        for key in keys:
            positives = [
                g
                for g in gold
                if g["scheme"] == scheme
                and g["label"] == key
                and g["expected"] in {"present", "likely"}
            ]
            assert positives, f"{scheme}.{key} never positive in the demo"


# ----------------------------------------------------------------------------- text content


def test_texts_are_finished(reports: list[dict[str, str]]) -> None:
    for r in reports:
        assert "{" not in r["text"] and "}" not in r["text"], r["case_id"]
        assert r["text"].endswith("\n") and not r["text"].startswith((" ", "\n"))


def test_reports_carry_their_own_accession(reports: list[dict[str, str]]) -> None:
    # every report with a header names its own accession number, never another case's
    ids = {r["case_id"] for r in reports}
    for r in reports:
        named = set(re.findall(r"LRP-26-\d{6}", r["text"]))
        assert not (named & ids) - {r["case_id"]}, r["case_id"]


def test_txt_samples_match_the_csv(reports: list[dict[str, str]]) -> None:
    texts = {r["case_id"]: r["text"] for r in reports}
    files = sorted((EXAMPLES / "reports_txt").glob("*.txt"))
    assert 8 <= len(files) <= 20
    for f in files:
        assert f.read_text(encoding="utf-8") == texts[f.stem], f.name


def test_generator_reproduces_the_committed_files() -> None:
    generator = load_generator()
    for path, text in generator.outputs().items():
        assert path.read_text(encoding="utf-8") == text, (
            f"stale: {path.name}; rerun generate_demo.py"
        )


def test_generator_gold_rule_most_definite_state_wins() -> None:
    generator = load_generator()
    assert generator.merge_state("absent", "uncertain") == "uncertain"
    assert generator.merge_state("likely", "present") == "present"
    assert generator.merge_state(None, "absent") == "absent"
    assert generator.parse_labels("cervix", "mal:a ais:p") == {
        "squamous_cell_carcinoma": "absent",
        "adenocarcinoma": "absent",
        "adenocarcinoma_in_situ": "present",
    }


# ----------------------------------------------------------------------------- the contract


@pytest.mark.shared
def test_keys_match_the_label_contract() -> None:
    spec = SHARED / "spec" / "LABELS.md"
    if not spec.exists():
        pytest.skip(f"label contract not present: {spec}")
    text = spec.read_text(encoding="utf-8")
    for scheme, keys in SCHEME_KEYS.items():
        m = re.search(rf"^## {scheme} .*?$(.*?)(?=^## |\Z)", text, re.M | re.S)
        assert m, scheme
        table_keys = re.findall(r"^\| (\w+) (?:\(value\) )?\|", m.group(1), re.M)
        binary = [k for k in table_keys if k != "key" and f"| {k} (value)" not in m.group(1)]
        assert tuple(binary) == keys, scheme
