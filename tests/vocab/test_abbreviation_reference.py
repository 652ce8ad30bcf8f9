"""The abbreviation dictionary: well-formed, tied to the ontology, and checked against a reference list.

The reference is J. Berman's public list of pathology abbreviations, read in place from the shared
data folder (never copied into the repository).  Expansions are compared by normalised word overlap.
"""

from __future__ import annotations

import csv
import re
from collections import defaultdict
from pathlib import Path

import pytest

from pathsieve.abbreviations import AbbreviationDictionary, check_abbreviations
from pathsieve.ontology import load_ontology

REPO = Path(__file__).resolve().parents[2]
TSV = REPO / "ontology" / "lexicon" / "abbreviations.tsv"
SCHEMES = ("colorectal", "prostate", "cervix", "duodenum", "lung", "breast")
SECTION_KINDS = (
    "diagnosis",
    "clinical_history",
    "gross",
    "microscopic",
    "comment",
    "addendum",
    "synoptic",
)
COLUMNS = ["abbr", "expansion", "concept_id", "contexts", "case_sensitive"]

# Short forms shared with the reference list whose pathsieve senses the reference does not carry.
# Each is a standard surgical-pathology usage (the reference is broader, older general medicine).
# The test below also fails when an entry here starts agreeing, so the list cannot go stale.
REFERENCE_LACKS: dict[str, str] = {
    "ssp": "sessile serrated polyp, a WHO 2010 name of the sessile serrated lesion",
    "tsa": "traditional serrated adenoma (WHO digestive system tumours)",
    "ind": "indefinite for dysplasia (IBD dysplasia reporting)",
    "net": "neuroendocrine tumour (WHO 2019 neuroendocrine nomenclature)",
    "ls": "Lynch syndrome (colorectal mismatch-repair testing)",
    "td": "tumour deposit (AJCC colorectal N1c)",
    "icv": "ileocaecal valve (colonoscopy site)",
    "mmr": "mismatch repair (colorectal and endometrial testing)",
    "mss": "microsatellite stable",
    "mp": "muscularis propria (depth of invasion)",
    "lp": "lamina propria",
    "gfd": "gluten-free diet (celiac clinical history)",
    "gs": "Gleason score",
    "svi": "seminal vesicle invasion (prostatectomy staging)",
    "sv": "seminal vesicle",
    "pz": "peripheral zone of prostate",
    "erg": "ERG immunostain (prostate)",
    "adt": "androgen deprivation therapy",
    "ar": "androgen receptor immunostain",
    "pni": "perineural invasion",
    "smile": "stratified mucin-producing intraepithelial lesion (WHO 2020 female genital)",
    "cpe": "cytopathic effect",
    "scj": "squamocolumnar junction (cervix)",
    "stas": "spread through air spaces (WHO 2015 lung)",
    "vpi": "visceral pleural invasion (AJCC lung)",
    "tblc": "transbronchial lung cryobiopsy",
    "cps": "PD-L1 combined positive score",
    "nst": "no special type (breast carcinoma)",
    "adh": "atypical ductal hyperplasia (breast)",
    "ccl": "columnar cell lesion (breast)",
    "fa": "fibroadenoma",
    "sbr": "Scarff-Bloom-Richardson grade",
    "hr": "hormone receptor (breast ER/PR)",
    "rcb": "residual cancer burden (breast neoadjuvant)",
    "ssm": "skin-sparing mastectomy",
    "nac": "nipple-areolar complex; neoadjuvant chemotherapy",
    "vab": "vacuum-assisted biopsy (breast)",
    "cap": "College of American Pathologists (cancer protocols)",
    "wd": "well differentiated",
    "pd": "poorly differentiated",
    "lg": "low grade",
    "hg": "high grade",
    "cup": "carcinoma of unknown primary",
    "agus": "atypical glandular cells of undetermined significance (Bethesda 1991 wording)",
}

_STOP = frozenset(
    ["of", "the", "and", "with", "to", "in", "for", "a", "an", "or", "by", "on", "at", "as"]
)
# spelling normalisation for comparison only (British -> American, -ise -> -ize)
_SPELLING = (
    (r"^oesoph", "esoph"),
    (r"^haem", "hem"),
    (r"^oestr", "estr"),
    (r"tumour", "tumor"),
    (r"is(e|ed|es|ing|ation)$", r"iz\1"),
    (r"trophic$", "tropic"),
)


def _words(text: str) -> frozenset[str]:
    """Normalised content words: hyphenated words both split and joined, digits split, endings trimmed."""
    text = text.lower().replace("'s", "")
    joined = [w.replace("-", "") for w in re.findall(r"[a-z]+(?:-[a-z]+)+", text)]
    out = set()
    for w in re.findall(r"[a-z]+|[0-9]+", text) + joined:
        if w in _STOP:
            continue
        for pat, rep in _SPELLING:
            w = re.sub(pat, rep, w)
        if len(w) > 3 and w.endswith("s"):
            w = w[:-1]
        # a crude stem: "ultrasound" ~ "ultrasonography", "pneumonia" ~ "pneumonitis"
        out.add(w[:6])
    return frozenset(out) or frozenset(re.findall(r"[a-z]+", text.lower()))


def agrees(ours: str, theirs: str) -> bool:
    """Two expansions agree when their word sets overlap by half or one contains the other."""
    a, b = _words(ours), _words(theirs)
    if not a or not b:
        return False
    return len(a & b) / len(a | b) >= 0.5 or a <= b or b <= a


def read_rows() -> list[dict[str, str]]:
    lines = [
        ln for ln in TSV.read_text(encoding="utf-8").splitlines() if ln and not ln.startswith("#")
    ]
    assert lines[0].split("\t") == COLUMNS
    return list(csv.DictReader(lines, delimiter="\t", quoting=csv.QUOTE_NONE))


@pytest.mark.parametrize(
    ("ours", "theirs", "expected"),
    [
        ("infiltrating ductal carcinoma", "invasive ductal carcinoma", True),
        ("transrectal ultrasound", "transrectal ultrasonography", True),
        ("nonsteroidal anti-inflammatory drug", "nonsteroidal antiinflammatory drug", True),
        ("oesophagogastroduodenoscopy", "esophagogastroduodenoscopy", True),
        ("not otherwise specified", "not otherwise specified", True),
        ("tubular adenoma", "temporal arteritis", False),
        ("endometrial biopsy", "endomyocardial biopsy", False),
        ("hyperplastic polyp", "hypersensitivity pneumonitis", False),
    ],
)
def test_expansion_comparison(ours: str, theirs: str, expected: bool) -> None:
    assert agrees(ours, theirs) is expected


def test_rows_are_well_formed() -> None:
    rows = read_rows()
    assert len(rows) >= 300  # several hundred senses (brief)
    seen = set()
    for n, r in enumerate(rows, 2):
        assert None not in r and all(r[c] is not None for c in COLUMNS), (
            f"row {n}: wrong column count"
        )
        assert r["abbr"].strip() == r["abbr"] and r["abbr"], f"row {n}: abbr"
        assert r["expansion"].strip(), f"row {n}: expansion"
        assert r["case_sensitive"] in ("yes", "no"), f"row {n}: case_sensitive"
        ctx = r["contexts"].split(",")
        assert ctx == ["*"] or all(c in SCHEMES or c in SECTION_KINDS for c in ctx), (
            f"row {n}: {ctx}"
        )
        key = (r["abbr"], r["expansion"].lower(), r["concept_id"])
        assert key not in seen, f"row {n}: duplicate {key}"
        seen.add(key)


def test_concept_ids_exist_in_the_ontology() -> None:
    onto = load_ontology()
    missing = [
        (r["abbr"], r["concept_id"])
        for r in read_rows()
        if r["concept_id"] and r["concept_id"] not in onto
    ]
    assert missing == []


def test_every_ontology_abbreviation_is_in_the_dictionary() -> None:
    onto = load_ontology()
    dictionary = AbbreviationDictionary.load(TSV)
    abbreviations = {(t, cid) for t, cid, kind in onto.surface_forms() if kind == "abbreviation"}
    assert len(abbreviations) > 100
    missing = sorted(
        (text, cid)
        for text, cid in abbreviations
        if cid not in {s.concept_id for s in dictionary.senses_for(text)}
    )
    assert missing == []


def test_dictionary_passes_the_vocabulary_check() -> None:
    assert check_abbreviations(TSV) == []


@pytest.mark.parametrize(
    ("abbr", "context", "expansion"),
    [  # senses that must stay distinct (practice)
        ("HP", "colorectal", "hyperplastic polyp"),
        ("HP", "duodenum", "Helicobacter pylori"),
        ("PR", "breast", "progesterone receptor"),
        ("TZ", "prostate", "transition zone"),
        ("TZ", "cervix", "transformation zone"),
        ("AIS", "cervix", "adenocarcinoma in situ"),
        ("ASAP", "prostate", "atypical small acinar proliferation"),
        ("ASAP", "clinical_history", "as soon as possible"),
        ("IDC", "breast", "invasive ductal carcinoma"),
        ("IDC", "prostate", "intraductal carcinoma of prostate"),
    ],
)
def test_ambiguous_short_forms_have_a_sense_per_context(
    abbr: str, context: str, expansion: str
) -> None:
    rows = [r for r in read_rows() if r["abbr"] == abbr and context in r["contexts"].split(",")]
    assert expansion in [r["expansion"] for r in rows]


def test_short_forms_that_are_words_are_case_sensitive() -> None:
    rows = {r["abbr"]: r for r in read_rows()}
    for abbr in ("TA", "AIS", "PIN", "ER", "PR", "CIS", "NET", "SMILE", "FISH", "PAS", "ASAP"):
        assert rows[abbr]["case_sensitive"] == "yes", abbr


@pytest.mark.shared
def test_senses_agree_with_reference_list(capsys: pytest.CaptureFixture[str]) -> None:
    from shared_paths import shared_file

    ref_path = shared_file("abbreviations", "pathology_abbreviations_berman.txt")
    reference: dict[str, list[str]] = defaultdict(list)
    for line in ref_path.read_text(encoding="utf-8", errors="replace").splitlines():
        if " = " in line:
            a, e = line.split(" = ", 1)
            reference[a.strip().lower()].append(e.strip())
    ours: dict[str, list[str]] = defaultdict(list)
    for r in read_rows():
        ours[r["abbr"].lower()].append(r["expansion"])

    shared = sorted(a for a in ours if a in reference)
    disagree = [a for a in shared if not any(agrees(e, t) for e in ours[a] for t in reference[a])]
    unknown = [
        (a, e) for a in shared for e in ours[a] if not any(agrees(e, t) for t in reference[a])
    ]

    with capsys.disabled():
        print(
            f"\nabbreviations: {len(ours)} short forms, {len(shared)} also in the reference list, "
            f"{len(shared) - len(disagree)} agree on at least one sense"
        )
        print(f"senses the reference list does not know ({len(unknown)}):")
        for a, e in unknown:
            print(f"  {a}: {e}")

    assert len(shared) >= 150
    assert sorted(set(disagree) - set(REFERENCE_LACKS)) == []
    stale = sorted(a for a in REFERENCE_LACKS if a not in disagree)
    assert stale == [], f"now agree or no longer shared, drop from REFERENCE_LACKS: {stale}"
