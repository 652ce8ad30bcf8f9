#!/usr/bin/env python3
"""Build the bundled pathsieve demo reports and their hand-coded gold labels.

Everything here is invented: the laboratory (Larkspur Ridge Pathology Associates), its
staff, the patients, accession numbers and dates.  Reports are assembled from hand-written
diagnosis fragments -- each one carrying its own hand-coded label states and values -- and
a set of fully hand-written cases (addenda, amended diagnoses, awkward hedges).  A fixed
seed makes the output byte-for-byte reproducible.

Run from anywhere::

    python examples/generate_demo.py           # rewrite the CSVs and the .txt samples
    python examples/generate_demo.py --check   # exit 1 when the committed files are stale

Gold coding rules are written out in ``examples/README.md``.
"""

from __future__ import annotations

import argparse
import csv
import io
import random
import re
import sys
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

__all__ = [
    "SCHEME_KEYS",
    "VALUE_KEYS",
    "DemoCase",
    "build_cases",
    "gold_rows",
    "main",
    "report_rows",
]

SEED = 20260214
HERE = Path(__file__).resolve().parent
TXT_SAMPLE = 12  # how many reports are also written as .txt files

# ---------------------------------------------------------------------------------------
# Label keys (the scheme contract) and the short aliases used in the fragment tables.
# ---------------------------------------------------------------------------------------

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

COMMON_VALUES = (
    "pt",
    "pn",
    "pm",
    "lymph_nodes_positive",
    "lymph_nodes_examined",
    "margin_status",
    "tumor_size_mm",
    "lymphovascular_invasion",
)
VALUE_KEYS: dict[str, tuple[str, ...]] = {
    "colorectal": COMMON_VALUES,
    "prostate": ("gleason_score", "grade_group", *COMMON_VALUES),
    "cervix": COMMON_VALUES,
    "duodenum": ("marsh_grade", *COMMON_VALUES),
    "lung": COMMON_VALUES,
    "breast": ("nottingham_grade", "er_status", "pr_status", "her2_status", *COMMON_VALUES),
}

ALIASES: dict[str, dict[str, tuple[str, ...]]] = {
    "colorectal": {
        "adc": ("adenocarcinoma",),
        "hgd": ("high_grade_dysplasia",),
        "lgd": ("low_grade_dysplasia",),
        "hp": ("hyperplastic_polyp",),
        "ssl": ("sessile_serrated_lesion",),
        "nl": ("normal",),
        # covering terms: "dysplasia" names both grades; "carcinoma/malignancy" the cancer
        "dys": ("low_grade_dysplasia", "high_grade_dysplasia"),
        "mal": ("adenocarcinoma",),
    },
    "prostate": {
        "adc": ("adenocarcinoma",),
        "aty": ("atypical_glands",),
        "pin": ("hgpin",),
        "ben": ("benign",),
        "mal": ("adenocarcinoma",),
    },
    "cervix": {
        "scc": ("squamous_cell_carcinoma",),
        "adc": ("adenocarcinoma",),
        "ais": ("adenocarcinoma_in_situ",),
        "hsil": ("hsil",),
        "lsil": ("lsil",),
        "ben": ("benign",),
        "sil": ("hsil", "lsil"),
        "inv": ("squamous_cell_carcinoma", "adenocarcinoma"),
        "mal": ("squamous_cell_carcinoma", "adenocarcinoma", "adenocarcinoma_in_situ"),
    },
    "duodenum": {
        "cd": ("celiac_disease",),
        "va": ("villous_atrophy",),
        "iel": ("intraepithelial_lymphocytosis",),
        "ch": ("crypt_hyperplasia",),
        "nl": ("normal",),
    },
    "lung": {
        "adc": ("adenocarcinoma",),
        "scc": ("squamous_cell_carcinoma",),
        "sclc": ("small_cell_carcinoma",),
        "lcc": ("large_cell_carcinoma",),
        "nsclc": ("nsclc_nos",),
        "car": ("carcinoid",),
        "met": ("metastatic_carcinoma",),
        "ben": ("benign",),
        "mal": (
            "adenocarcinoma",
            "squamous_cell_carcinoma",
            "small_cell_carcinoma",
            "large_cell_carcinoma",
            "nsclc_nos",
            "carcinoid",
            "metastatic_carcinoma",
        ),
    },
    "breast": {
        "idc": ("invasive_ductal_carcinoma",),
        "ilc": ("invasive_lobular_carcinoma",),
        "dcis": ("dcis",),
        "lcis": ("lcis",),
        "adh": ("atypical_ductal_hyperplasia",),
        "fa": ("fibroadenoma",),
        "ben": ("benign",),
        "inv": ("invasive_ductal_carcinoma", "invasive_lobular_carcinoma"),
        "mal": ("invasive_ductal_carcinoma", "invasive_lobular_carcinoma", "dcis", "lcis"),
    },
}

STATES = ("present", "likely", "uncertain", "unlikely", "absent")
RANK = {s: 5 - i for i, s in enumerate(STATES)}  # present 5 ... absent 1
SHORT_STATE = {
    "p": "present",
    "l": "likely",
    "u": "uncertain",
    "ul": "unlikely",
    "a": "absent",
}


def parse_labels(scheme: str, spec: str) -> dict[str, str]:
    """``"lgd:l hgd:a"`` -> ``{"low_grade_dysplasia": "likely", ...}`` (aliases expanded)."""
    out: dict[str, str] = {}
    for token in spec.split():
        alias, _, code = token.partition(":")
        state = SHORT_STATE[code]
        for key in ALIASES[scheme][alias]:
            out[key] = merge_state(out.get(key), state) or state
    return out


def merge_state(a: str | None, b: str | None) -> str | None:
    """Most definite positive state of two (``None`` = not mentioned)."""
    if a is None:
        return b
    if b is None:
        return a
    return a if RANK[a] >= RANK[b] else b


# ---------------------------------------------------------------------------------------
# Published tables used to derive values.
# ---------------------------------------------------------------------------------------


def grade_group(primary: int, secondary: int) -> int:
    """ISUP 2014 / WHO 2016 grade group for a Gleason score."""
    total = primary + secondary
    if total <= 6:
        return 1
    if total == 7:
        return 2 if primary == 3 else 3
    if total == 8:
        return 4
    return 5


def nottingham(score: int) -> int:
    """Nottingham grade from the total score (3-5 -> 1, 6-7 -> 2, 8-9 -> 3)."""
    return 1 if score <= 5 else 2 if score <= 7 else 3


def crc_pn(pos: int, deposits: bool = False) -> str:
    """AJCC 8th colorectal pN from the count of involved nodes."""
    if pos == 0:
        return "N1c" if deposits else "N0"
    if pos == 1:
        return "N1a"
    if pos <= 3:
        return "N1b"
    if pos <= 6:
        return "N2a"
    return "N2b"


def lung_pt(size_mm: float, vpi: bool) -> str:
    """AJCC 8th lung pT from the invasive size (and visceral pleural invasion)."""
    if size_mm <= 10:
        t = "T1a"
    elif size_mm <= 20:
        t = "T1b"
    elif size_mm <= 30:
        t = "T1c"
    elif size_mm <= 40:
        t = "T2a"
    elif size_mm <= 50:
        t = "T2b"
    elif size_mm <= 70:
        t = "T3"
    else:
        t = "T4"
    if vpi and t in ("T1a", "T1b", "T1c"):
        t = "T2a"
    return t


def breast_pt(size_mm: float) -> str:
    """AJCC 8th breast pT from the invasive size."""
    if size_mm <= 1:
        return "T1mi"
    if size_mm <= 5:
        return "T1a"
    if size_mm <= 10:
        return "T1b"
    if size_mm <= 20:
        return "T1c"
    if size_mm <= 50:
        return "T2"
    return "T3"


def breast_pn(pos: int) -> str:
    if pos == 0:
        return "N0"
    if pos <= 3:
        return "N1a"
    if pos <= 9:
        return "N2a"
    return "N3a"


NUMBER_WORDS = [
    "zero",
    "one",
    "two",
    "three",
    "four",
    "five",
    "six",
    "seven",
    "eight",
    "nine",
    "ten",
    "eleven",
    "twelve",
    "thirteen",
    "fourteen",
    "fifteen",
    "sixteen",
    "seventeen",
    "eighteen",
    "nineteen",
    "twenty",
]
TENS = {20: "twenty", 30: "thirty", 40: "forty"}


def words(n: int) -> str:
    if n < len(NUMBER_WORDS):
        return NUMBER_WORDS[n]
    tens, ones = divmod(n, 10)
    base = TENS[tens * 10]
    return base if ones == 0 else f"{base}-{NUMBER_WORDS[ones]}"


def cm(mm: float) -> str:
    return f"{mm / 10:.1f}"


# ---------------------------------------------------------------------------------------
# The fictional laboratory.
# ---------------------------------------------------------------------------------------

LAB = "Larkspur Ridge Pathology Associates"
PATHOLOGISTS = (
    "Imogen Vale",
    "Casimir Oduya",
    "Petra Lindqvist",
    "Anselm Brightwater",
    "Noor Haddad",
    "Rosalind Ferrante",
    "Wendell Achterberg",
    "Saoirse Kilbride",
)
CLINICIANS = {
    "colorectal": ("Tobias Wren", "Priya Okonkwo", "Elspeth Mowbray", "Gideon Tarrant"),
    "duodenum": ("Tobias Wren", "Priya Okonkwo", "Elspeth Mowbray", "Juno Abernethy"),
    "prostate": ("Halvard Stroud", "Mireille Dufresne", "Osric Pennington"),
    "cervix": ("Beatrix Olumide", "Lena Castellanos", "Honor Fairlie"),
    "lung": ("Ivo Ramsgate", "Dagny Holloway", "Cyrus Everard"),
    "breast": ("Corin Abernethy", "Yusuf Talbot", "Marguerite Szell"),
}
SURNAMES = [
    "Quillane",
    "Harrow",
    "Tessaro",
    "Marwick",
    "Ostrander",
    "Bellweather",
    "Cadogan",
    "Fairweather",
    "Lindgren",
    "Okafor",
    "Rasmussen",
    "Szabo",
    "Valcourt",
    "Wexley",
    "Yardley",
    "Brennock",
    "Corvell",
    "Dunmore",
    "Ellery",
    "Fenwick",
    "Galloway",
    "Hesketh",
    "Ingleby",
    "Jessop",
    "Kettering",
    "Lowell",
    "Mabry",
    "Norcott",
    "Pryor",
    "Quarles",
    "Rudd",
    "Thornbury",
    "Upton",
    "Vickery",
    "Winslow",
    "Zeller",
    "Amadi",
    "Birkett",
    "Calloway",
    "Devereux",
    "Eastwood",
    "Fitzallan",
    "Grimaldi",
    "Holtby",
    "Iyer",
    "Jablonski",
    "Kowalczyk",
    "Leclair",
    "Moreno",
    "Nakashima",
    "Oyelaran",
    "Pettigrew",
    "Radcliffe",
    "Sandoval",
    "Trevelyan",
    "Underhill",
    "Varga",
    "Whitlock",
    "Ashdown",
    "Blackwood",
    "Coombe",
    "Delacroix",
]
FIRST_F = [
    "Rosa",
    "Linnea",
    "Edith",
    "Greta",
    "Mara",
    "Ottilie",
    "Wren",
    "Ingrid",
    "Delphine",
    "Hazel",
    "Noor",
    "Tamsin",
    "Beatrix",
    "Ilse",
    "Agnes",
    "Marisol",
    "Yvette",
    "Constance",
    "Fern",
    "Odalys",
    "Priscilla",
    "Juniper",
    "Sunniva",
    "Liesel",
    "Carmela",
]
FIRST_M = [
    "Bram",
    "Desmond",
    "Felix",
    "Orrin",
    "Lucan",
    "Magnus",
    "Ezra",
    "Teodor",
    "Anselm",
    "Cormac",
    "Wolfe",
    "Rafferty",
    "Soren",
    "Ambrose",
    "Emil",
    "Hollis",
    "Jasper",
    "Leander",
    "Niall",
    "Percival",
    "Rufus",
    "Silas",
    "Thaddeus",
    "Ugo",
    "Viggo",
]
MONTHS = [
    "January",
    "February",
    "March",
    "April",
    "May",
    "June",
    "July",
    "August",
    "September",
    "October",
    "November",
    "December",
]


@dataclass(frozen=True)
class Day:
    month: int
    day: int

    def us(self) -> str:
        return f"{self.month:02d}/{self.day:02d}/2026"

    def iso(self) -> str:
        return f"2026-{self.month:02d}-{self.day:02d}"

    def uk(self) -> str:
        return f"{self.day} {MONTHS[self.month - 1]} 2026"

    def plus(self, n: int) -> Day:
        d, m = self.day + n, self.month
        if d > 28:
            d, m = d - 28, m + 1
        return Day(m, d)


# ---------------------------------------------------------------------------------------
# Fragments: hand-written diagnosis sentences with their hand-coded part-level gold.
# ---------------------------------------------------------------------------------------

ALL_STYLES = frozenset({1, 2, 3, 4, 5})


@dataclass(frozen=True)
class Frag:
    """One part's diagnosis: sentences, hand-coded label states and values."""

    dx: tuple[str, ...]
    labels: str = ""
    values: tuple[tuple[str, str], ...] = ()
    micro: str = ""
    note: str = ""
    styles: frozenset[int] = ALL_STYLES


def F(
    dx: str | Sequence[str],
    labels: str = "",
    values: Mapping[str, str] | None = None,
    *,
    micro: str = "",
    note: str = "",
    styles: Iterable[int] | None = None,
) -> Frag:
    sentences = (dx,) if isinstance(dx, str) else tuple(dx)
    return Frag(
        dx=sentences,
        labels=labels,
        values=tuple((values or {}).items()),
        micro=micro,
        note=note,
        styles=frozenset(styles) if styles is not None else ALL_STYLES,
    )


# ----------------------------------------------------------------- colorectal fragments

CRC_POLYP = [
    F(
        "Tubular adenoma.",
        "lgd:l",
        micro="Sections show a polyp composed of closely packed tubular glands lined by "
        "elongated, hyperchromatic, pseudostratified nuclei.",
    ),
    F("Tubular adenoma with low-grade dysplasia.", "lgd:p"),
    F(
        ["Tubular adenoma.", "Negative for high-grade dysplasia and malignancy."],
        "lgd:l hgd:a mal:a",
    ),
    F("Fragments of tubular adenoma, low grade.", "lgd:p"),
    F(
        "Tubulovillous adenoma with low-grade dysplasia.",
        "lgd:p",
        micro="The polyp shows a mixed tubular and villous architecture; villous fronds make up "
        "roughly a third of the lesion.",
    ),
    F(
        [
            "Tubulovillous adenoma with focal high-grade dysplasia.",
            "No invasive adenocarcinoma identified.",
        ],
        "hgd:p adc:a",
        note="The focus of high-grade dysplasia lies at the luminal surface, well away from the "
        "stalk.",
        micro="One area shows cribriform glands with loss of nuclear polarity and prominent "
        "nucleoli.",
    ),
    F(
        "Tubular adenoma with high-grade dysplasia.",
        "hgd:p",
        note="Completeness of excision cannot be assessed in this piecemeal specimen.",
    ),
    F("Tubulovilous adenoma.", "lgd:l"),
    F("Villous adenoma with low-grade dysplasia.", "lgd:p"),
    F(
        "Hyperplastic polyp.",
        "hp:p",
        micro="The crypts are straight with serration confined to their upper halves.",
    ),
    F("Hyperplastic polyp, negative for dysplasia.", "hp:p dys:a"),
    F("Fragments of hyperplastic polyp, microvesicular type.", "hp:p"),
    F("Hyperplastic polyp, goblet cell-rich type.", "hp:p"),
    F(
        "Sessile serrated lesion without dysplasia.",
        "ssl:p dys:a",
        micro="Several crypts are dilated at their bases and run horizontally along the "
        "muscularis mucosae (L- and inverted T-shapes).",
    ),
    F("Sessile serrated adenoma/polyp (SSA/P).", "ssl:p"),
    F("Sessile serrated lesion.", "ssl:p"),
    F(
        [
            "Serrated polyp, favor sessile serrated lesion.",
            "A hyperplastic polyp is considered unlikely given the dilated, boot-shaped basal crypts.",
        ],
        "ssl:l hp:ul",
    ),
    F(
        [
            "Superficial fragments of serrated mucosa, most likely hyperplastic polyp.",
            "A sessile serrated lesion cannot be excluded in this limited, poorly oriented tissue.",
        ],
        "hp:l ssl:u",
    ),
    F("Tubular adenoma with low-grade dysplsia.", "lgd:p"),
    F("Adenomatous polyp (tubular adenoma).", "lgd:l"),
    F(
        ["Tubular adenoma, low grade.", "The cauterized stalk margin is free of adenoma."],
        "lgd:p",
        {"margin_status": "negative"},
    ),
    F(["Inflammatory polyp.", "Negative for dysplasia."], "dys:a"),
    F(
        "Polypoid colonic mucosa with a prominent lymphoid aggregate; no adenomatous change or "
        "dysplasia.",
        "dys:a",
    ),
    F("Mucosal prolapse-type polyp; negative for dysplasia.", "dys:a"),
    F(
        [
            "Tubular adenoma with high-grade dysplasia (intramucosal carcinoma).",
            "No invasive adenocarcinoma identified.",
        ],
        "hgd:p adc:a",
    ),
    F("Tubular adenoma, consistent with a small adenomatous polyp; fragmented.", "lgd:l"),
    F("TA, low grade.", "lgd:p", styles={3}),
    F("TA x2.", "lgd:l", styles={3}),
    F("HP.", "hp:p", styles={3}),
    F("SSA/P, no dysplasia.", "ssl:p dys:a", styles={3}),
    F("TVA w/ HGD; neg for invasive ca.", "hgd:p adc:a", styles={3}),
    F("SSL w/o dysplasia.", "ssl:p dys:a", styles={3}),
]

CRC_RANDOM = [
    F(
        [
            "Colonic mucosa with no significant histopathologic abnormality.",
            "No evidence of microscopic colitis.",
        ],
        "nl:p",
        micro="The surface epithelium is intact, crypt architecture is regular and the lamina "
        "propria cellularity is within normal limits.",
    ),
    F("Unremarkable colonic mucosa.", "nl:p"),
    F(
        "Colonic mucosa within normal limits; no active colitis, dysplasia or malignancy.",
        "nl:p dys:a mal:a",
    ),
    F("Normal colonic mucosa.", "nl:p"),
    F("Large bowel mucosa with no diagnostic abnormality.", "nl:p"),
    F(
        [
            "Chronic active colitis with crypt abscesses and basal plasmacytosis.",
            "Negative for dysplasia.",
        ],
        "dys:a",
        micro="There is crypt architectural distortion with branching, a basal lymphoplasmacytic "
        "infiltrate and neutrophilic cryptitis.",
    ),
    F("Chronic quiescent colitis; no dysplasia identified.", "dys:a"),
    F(
        "Collagenous colitis (subepithelial collagen band up to 25 micrometres).",
        "",
        micro="The subepithelial collagen table is irregularly thickened and entraps capillaries.",
    ),
    F("Lymphocytic colitis.", ""),
    F(
        "Mild nonspecific chronic inflammation without architectural distortion. No dysplasia.",
        "dys:a",
    ),
    F("Melanosis coli; otherwise unremarkable colonic mucosa.", "nl:p"),
]

CRC_MASS = [
    F("Invasive adenocarcinoma, moderately differentiated.", "adc:p"),
    F(
        "Adenocarcinoma, poorly differentiated, with signet-ring cell features (approximately 30%).",
        "adc:p",
    ),
    F("Mucinous adenocarcinoma.", "adc:p"),
    F("Invasive adenocarcnoma, moderately differentiated.", "adc:p"),
    F(
        [
            "Tubulovillous adenoma with high-grade dysplasia.",
            "Invasive adenocarcinoma cannot be excluded in this superficial biopsy; see comment.",
        ],
        "hgd:p adc:u",
        note="Deeper biopsies or excision are advised for definitive assessment.",
    ),
    F(
        "Highly atypical glands in desmoplastic-appearing stroma, suspicious for invasive "
        "adenocarcinoma.",
        "adc:u",
    ),
    F(
        "Invasive adenocarcinoma arising in a tubulovillous adenoma.",
        "adc:p lgd:l",
        micro="Malignant glands infiltrate beneath the adenoma with a desmoplastic stromal "
        "response.",
    ),
    F(
        [
            "Ulcerated colonic mucosa with granulation tissue.",
            "No dysplasia or malignancy identified; see comment.",
        ],
        "dys:a mal:a",
        note="The biopsy may not be representative of the endoscopic lesion; repeat sampling "
        "is suggested if clinical suspicion remains.",
    ),
]

COLON_POLYP_SITES = (
    "Cecum",
    "Ascending colon",
    "Hepatic flexure",
    "Transverse colon",
    "Splenic flexure",
    "Descending colon",
    "Sigmoid colon",
    "Rectosigmoid",
    "Rectum",
    "Sigmoid colon at 25 cm",
    "Rectum at 8 cm",
    "Descending colon at 45 cm",
)
COLON_POLYP_PROCS = (
    "polypectomy",
    "cold snare polypectomy",
    "hot snare polypectomy",
    "cold forceps polypectomy",
    "endoscopic mucosal resection",
    "biopsy",
)
COLON_RANDOM_SITES = (
    "Right colon",
    "Transverse colon",
    "Left colon",
    "Sigmoid colon",
    "Rectum",
    "Cecum",
)

# ----------------------------------------------------------------- prostate fragments

PROSTATE_BENIGN = [
    F("Benign prostatic tissue.", "ben:p"),
    F("Benign prostatic tissue; negative for carcinoma.", "ben:p adc:a"),
    F("Benign prostatic glands and stroma with mild chronic inflammation.", "ben:p"),
    F("Benign prostatic tissue with focal partial atrophy.", "ben:p"),
    F("Prostatic tissue, negative for malignancy.", "ben:p adc:a"),
    F("Benign prostatic tissue with basal cell hyperplasia.", "ben:p"),
    F("Negative for carcinoma.", "ben:p adc:a"),
    F("Benign prostatic tissue. No high-grade PIN or carcinoma identified.", "ben:p pin:a adc:a"),
    F("Benign prostatic tissue with acute and chronic prostatitis.", "ben:p"),
]
PROSTATE_PIN = [
    F(
        [
            "High-grade prostatic intraepithelial neoplasia (HGPIN).",
            "No invasive carcinoma identified.",
        ],
        "pin:p adc:a",
    ),
    F("Benign prostatic tissue with focal high-grade PIN.", "ben:p pin:p"),
    F("Isolated high-grade PIN (one gland).", "pin:p"),
    F("HGPIN, multifocal (three glands); no invasive carcinoma.", "pin:p adc:a"),
]
PROSTATE_ATYPICAL = [
    F(
        "Atypical small acinar proliferation (ASAP); see comment.",
        "aty:p",
        note="A small cluster of crowded glands with mild nuclear enlargement is present; the "
        "focus is too limited for a definitive diagnosis. Repeat sampling of this region is "
        "suggested.",
    ),
    F("Atypical glands suspicious for carcinoma.", "aty:p adc:u"),
    F("Small focus of atypical glands; adenocarcinoma cannot be excluded.", "aty:p adc:u"),
    F(
        "High-grade PIN with adjacent atypical glands (PINATYP); see comment.",
        "pin:p aty:p",
        note="The small glands adjacent to the PIN could represent tangential sectioning or an "
        "outpouching of PIN; immunostains are non-contributory.",
    ),
    F(
        "Atypical glands, most likely partial atrophy; carcinoma is unlikely.",
        "aty:p adc:ul",
    ),
]

GLEASON_BY_GG = {
    1: [(3, 3)],
    2: [(3, 4)],
    3: [(4, 3)],
    4: [(4, 4), (3, 5), (5, 3)],
    5: [(4, 5), (5, 4), (5, 5)],
}


def prostate_cancer_frag(rng: random.Random, gg: int, style: int) -> Frag:
    """A positive core with a varied but always complete Gleason statement."""
    p, s = rng.choice(GLEASON_BY_GG[gg])
    t = p + s
    pct = rng.choice([5, 10, 15, 20, 30, 40, 50, 60, 70, 80, 90])
    mm = rng.choice([1.5, 2, 3, 4, 6, 8, 11])
    p4 = rng.choice([10, 20, 30]) if gg == 2 else rng.choice([60, 70, 80])
    forms = [
        f"Prostatic adenocarcinoma, Gleason score {p}+{s}={t} (Grade Group {gg}), involving {pct}% of the core.",
        f"Adenocarcinoma of the prostate, Gleason {p}+{s}={t}, ISUP grade group {gg}; tumor in {pct}% of tissue.",
        f"Prostatic adenocarcinoma, GS {p}+{s}={t} (GG{gg}), {mm} mm linear extent.",
        f"Acinar adenocarcinoma, Gleason {t} ({p}+{s}), involving {pct}% of the specimen.",
        f"Adenocarcinoma, Gleason score {p} + {s} = {t}; Grade Group {gg}. Perineural invasion present.",
        f"Prostatic adenocarcinoma, Grade Group {gg} (Gleason score {p}+{s}={t}), {pct}% of core.",
    ]
    if gg in (2, 3):
        forms.append(
            f"Prostatic adenocarcinoma, Gleason score {p}+{s}={t} (Grade Group {gg}); "
            f"Gleason pattern 4 comprises {p4}%. Tumor involves {pct}% of the core."
        )
    if style == 3:
        forms.append(f"adenoCA, GS {p}+{s}={t} (GG{gg}), {pct}%.")
    if gg >= 4:
        forms.append(
            f"Prostatic adenocarcinoma, Gleason score {p}+{s}={t} (Grade Group {gg}), with "
            f"cribriform pattern, involving {pct}% of the core."
        )
    text = rng.choice(forms)
    return F(text, "adc:p", {"gleason_score": f"{p}+{s}={t}", "grade_group": str(gg)})


PROSTATE_CANCER_SPECIAL = [
    F(
        "Minute focus of adenocarcinoma, Gleason score 3+3=6 (Grade Group 1), involving <5% of the core.",
        "adc:p",
        {"gleason_score": "3+3=6", "grade_group": "1"},
    ),
    F(
        [
            "Small focus most likely representing adenocarcinoma, Gleason score 3+3=6 (Grade Group 1), 0.5 mm.",
            "See comment.",
        ],
        "adc:l",
        {"gleason_score": "3+3=6", "grade_group": "1"},
        note="The focus is small; the diagnosis was reviewed by a second pathologist, who agrees.",
    ),
    F(
        "Prostatic adenocarcnoma, Gleason score 3+4=7 (Grade group 2).",
        "adc:p",
        {"gleason_score": "3+4=7", "grade_group": "2"},
    ),
    F(
        "Prostatic adenocarcinoma, Gleason score 3+4=7 (Grade Group 2), with intraductal carcinoma.",
        "adc:p",
        {"gleason_score": "3+4=7", "grade_group": "2"},
    ),
]

PROSTATE_SITES_12 = (
    "Right base",
    "Right mid",
    "Right apex",
    "Right lateral base",
    "Right lateral mid",
    "Right lateral apex",
    "Left base",
    "Left mid",
    "Left apex",
    "Left lateral base",
    "Left lateral mid",
    "Left lateral apex",
)
PROSTATE_SITES_6 = ("Right base", "Right mid", "Right apex", "Left base", "Left mid", "Left apex")
PROSTATE_TARGETS = (
    "MRI target 1 (left anterior transition zone, PI-RADS 4)",
    "MRI target 1 (right posterolateral peripheral zone, PI-RADS 5)",
    "MRI target 2 (left apex peripheral zone, PI-RADS 3)",
    "MRI target 1 (right mid peripheral zone, PI-RADS 4)",
)
PROSTATE_CORE_PROCS = ("needle core biopsy", "core biopsies", "biopsy", "needle biopsy")

# ----------------------------------------------------------------- cervix fragments

CERVIX_BIOPSY = [
    F("High-grade squamous intraepithelial lesion (HSIL; CIN 3).", "hsil:p"),
    F("HSIL (CIN 2), p16 block-positive.", "hsil:p"),
    F(
        "CIN 2-3 with extension into endocervical glands.",
        "hsil:p",
        micro="Full-thickness loss of maturation with mitoses in the upper third; the lesion "
        "extends into underlying endocervical gland crypts.",
    ),
    F(
        "Low-grade squamous intraepithelial lesion (LSIL; CIN 1) with koilocytic change.",
        "lsil:p",
        micro="Koilocytes with perinuclear haloes, binucleation and raisinoid nuclei are present "
        "in the upper layers; the basal third shows mild atypia only.",
    ),
    F(["LSIL (CIN 1).", "Negative for HSIL."], "lsil:p hsil:a"),
    F("Squamous mucosa with koilocytic atypia (condyloma); p16 patchy, non-block.", "lsil:p"),
    F(
        [
            "Chronic cervicitis with squamous metaplasia.",
            "Negative for intraepithelial lesion or malignancy.",
        ],
        "ben:p sil:a mal:a",
    ),
    F("Benign ectocervical mucosa; no dysplasia.", "ben:p sil:a"),
    F("Squamous mucosa with reactive changes; LSIL cannot be excluded.", "lsil:u"),
    F(
        "HSIL (CIN 2) is favored over immature squamous metaplasia; p16 shows block positivity.",
        "hsil:l",
    ),
    F(
        "Atrophic squamous mucosa; HSIL is unlikely (p16 negative, Ki-67 confined to the basal layer).",
        "hsil:ul",
    ),
    F(
        "High-grade squamous intraepithelial lesion (CIN 3) with extension into endocervcal glands.",
        "hsil:p",
    ),
    F(
        "HSIL (CIN 3); suspicious for early invasive squamous cell carcinoma, see comment.",
        "hsil:p scc:u",
        note="An excisional procedure (LEEP or cone) is recommended for definitive assessment of "
        "invasion.",
    ),
    F("Invasive squamous cell carcinoma, keratinizing, moderately differentiated.", "scc:p"),
    F("Invasive squamous cell carcinoma, non-keratinizing, arising in HSIL.", "scc:p hsil:p"),
    F(
        ["Adenocarcinoma in situ (AIS), usual type.", "No invasive adenocarcinoma identified."],
        "ais:p adc:a",
        micro="Endocervical glands retain their normal lobular architecture but are lined by "
        "stratified, hyperchromatic nuclei with apical mitoses and apoptotic bodies.",
    ),
    F("Endocervical adenocarcinoma in situ with coexisting HSIL (CIN 3).", "ais:p hsil:p"),
    F("Atypical endocervical glands, suspicious for adenocarcinoma in situ.", "ais:u"),
    F("Invasive endocervical adenocarcinoma, usual (HPV-associated) type.", "adc:p"),
    F(
        ["Benign endocervical polyp.", "Negative for dysplasia and malignancy."],
        "ben:p sil:a mal:a",
    ),
    F("Squamous mucosa with HPV cytopathic effect, consistent with LSIL.", "lsil:p"),
    F(
        "Microglandular hyperplasia; negative for intraepithelial lesion and malignancy.",
        "ben:p sil:a mal:a",
    ),
]
# which biopsy fragments can share a report (a case has one leading lesion and milder companions)
CERVIX_TIERS = {
    "benign": [6, 7, 19, 21, 10],
    "low": [3, 4, 5, 8, 20],
    "high": [0, 1, 2, 9, 11, 12],
    "glandular": [15, 16, 17],
    "invasive_sq": [13, 14],
    "invasive_gl": [18],
}
CERVIX_COMPANIONS = {
    "benign": ["benign"],
    "low": ["low", "benign"],
    "high": ["high", "low", "benign"],
    "glandular": ["glandular", "high", "benign"],
    "invasive_sq": ["high", "benign"],
    "invasive_gl": ["glandular", "benign"],
}
CERVIX_ECC = [
    F("Scant fragments of benign endocervical mucosa; no dysplasia identified.", "ben:p sil:a"),
    F(
        "Mucus and detached benign glandular epithelium; negative for intraepithelial lesion or "
        "malignancy.",
        "ben:p sil:a mal:a",
    ),
    F("Detached fragments of HSIL (CIN 3) within mucus.", "hsil:p"),
    F(["Strips of LSIL (CIN 1) admixed with mucus.", "Negative for HSIL."], "lsil:p hsil:a"),
    F("Insufficient for diagnosis: mucus and blood only.", ""),
]
CERVIX_LEEP = [
    F(
        [
            "HSIL (CIN 3) with gland involvement.",
            "Ectocervical, endocervical and deep margins are negative for HSIL; closest margin 1.5 mm.",
        ],
        "hsil:p",
        {"margin_status": "negative"},
    ),
    F(
        ["HSIL (CIN 2-3).", "HSIL extends to the endocervical margin."],
        "hsil:p",
        {"margin_status": "involved"},
    ),
    F(
        ["LSIL (CIN 1) and focal HSIL (CIN 2).", "Margins free of dysplasia."],
        "lsil:p hsil:p",
        {"margin_status": "negative"},
    ),
    F(
        "Cervical tissue with chronic cervicitis and squamous metaplasia; no residual dysplasia identified.",
        "sil:a",
    ),
    F(
        [
            "Adenocarcinoma in situ, margins negative (closest: endocervical, 2 mm).",
            "No invasive carcinoma identified.",
        ],
        "ais:p inv:a",
        {"margin_status": "negative"},
    ),
    F(
        "HSIL (CIN 3) involving the deep and endocervical margins.",
        "hsil:p",
        {"margin_status": "involved"},
        micro="The lesion is present in multiple radial slices and extends to the inked deep and "
        "endocervical edges.",
    ),
]
CERVIX_SITES = (
    "Cervix, 12 o'clock",
    "Cervix, 3 o'clock",
    "Cervix, 6 o'clock",
    "Cervix, 9 o'clock",
    "Ectocervix, 2 o'clock",
    "Cervix, anterior lip",
    "Cervix, posterior lip",
    "Cervix, transformation zone",
)

# ----------------------------------------------------------------- duodenum fragments

DUO_PARTS = [
    F(
        [
            "Duodenal mucosa with no significant histopathologic abnormality.",
            "No villous atrophy; intraepithelial lymphocytes are not increased.",
        ],
        "nl:p va:a iel:a",
        micro="Villi are tall and slender with a villus:crypt ratio of about 4:1; "
        "intraepithelial lymphocytes number about 12 per 100 enterocytes.",
    ),
    F("Unremarkable duodenal mucosa (Marsh 0).", "nl:p", {"marsh_grade": "0"}),
    F(
        "Duodenal mucosa within normal limits. No villous atrophy or intraepithelial lymphocytosis.",
        "nl:p va:a iel:a",
    ),
    F(
        [
            "Increased intraepithelial lymphocytes without villous atrophy (modified Marsh 1).",
            "See comment.",
        ],
        "iel:p va:a cd:u",
        {"marsh_grade": "1"},
        note="Intraepithelial lymphocytosis with normal villi is non-specific (NSAIDs, H. pylori "
        "gastritis, infection); celiac disease is possible and correlation with serology is "
        "recommended.",
    ),
    F(
        "Increased intraepithelial lymphocytes and crypt hyperplasia, without villous atrophy (Marsh 2).",
        "iel:p ch:p va:a",
        {"marsh_grade": "2"},
    ),
    F(
        "Partial villous atrophy with increased intraepithelial lymphocytes and crypt "
        "hyperplasia (modified Marsh type 3a), consistent with celiac disease.",
        "va:p iel:p ch:p cd:l",
        {"marsh_grade": "3a"},
        micro="Villi are shortened and broadened; crypts are elongated with increased mitoses; "
        "intraepithelial lymphocytes are increased along the villous tips.",
    ),
    F(
        [
            "Subtotal villous atrophy, crypt hyperplasia and marked intraepithelial lymphocytosis; Marsh 3b.",
            "Findings are consistent with celiac disease in the appropriate clinical setting.",
        ],
        "va:p iel:p ch:p cd:l",
        {"marsh_grade": "3b"},
    ),
    F(
        "Total villous atrophy with intraepithelial lymphocytosis (Marsh IIIc), compatible with "
        "gluten-sensitive enteropathy.",
        "va:p iel:p ch:p cd:l",
        {"marsh_grade": "3c"},
    ),
    F("Duodenal mucosa, modified Marsh type 3a.", "va:p iel:p ch:p", {"marsh_grade": "3a"}),
    F(
        [
            "Mild villous blunting with increased IELs (approximately 35/100 enterocytes).",
            "See comment.",
        ],
        "va:p iel:p cd:u",
        note="Possible early celiac disease; NSAID effect or infection are alternatives. "
        "Correlation with tTG serology is recommended.",
    ),
    F(
        "Celiac disease: partial villous atrophy, crypt hyperplasia and intraepithelial "
        "lymphocytosis (Marsh 3a).",
        "cd:p va:p ch:p iel:p",
        {"marsh_grade": "3a"},
    ),
    F(
        [
            "Chronic active duodenitis with gastric foveolar metaplasia, consistent with peptic injury.",
            "No villous atrophy; intraepithelial lymphocytes are not increased.",
        ],
        "va:a iel:a",
        micro="Neutrophils infiltrate the surface epithelium, and patches of mucin-filled "
        "foveolar cells replace the absorptive epithelium.",
    ),
    F(
        [
            "Duodenal mucosa, no diagnostic abnormality.",
            "No histologic evidence of celiac disease.",
        ],
        "nl:p cd:a",
    ),
    F(
        "Duodenal mucosa with Giardia trophozoites on the surface; villous architecture preserved.",
        "",
        micro="Pear-shaped binucleate organisms lie in the luminal mucus between villi.",
    ),
    F(
        [
            "Normal villous architecture; intraepithelial lymphocytes are not increased (18 per 100 enterocytes).",
            "Celiac disease unlikely.",
        ],
        "iel:a cd:ul",
    ),
    F(
        "Patchy villous blunting; intraepithelial lymphocytosis cannot be excluded in this "
        "tangentially sectioned material.",
        "va:p iel:u",
    ),
    F("Lymphocytic duodenosis (Marsh 1).", "iel:p", {"marsh_grade": "1"}),
    F(
        "Subtotal villous atrophy with crypt hyperplasia and increased intraepithelial "
        "lymphocyes (Marsh 3b).",
        "va:p ch:p iel:p",
        {"marsh_grade": "3b"},
    ),
    F("Brunner gland hyperplasia; no villous atrophy.", "va:a"),
]
DUO_NORMALISH = [0, 1, 2, 12]  # indices of the normal fragments above
# fragments that can sit side by side in one report (bulb and D2 may differ, but not wildly)
DUO_GROUPS = {
    "normal": [0, 1, 2, 12, 14, 18],
    "mild": [3, 4, 16],
    "atrophy": [5, 6, 7, 8, 9, 10, 15, 17],
    "other": [11, 13],
}
GASTRIC_PARTS = [
    F(
        "Gastric antral mucosa with mild chronic inactive gastritis; Helicobacter organisms not identified.",
        "",
    ),
    F("Chronic active Helicobacter pylori gastritis (organisms seen on H&E and immunostain).", ""),
    F("Gastric body mucosa with mild chronic inflammation; negative for H. pylori.", ""),
    F("Reactive (chemical) gastropathy.", ""),
]
DUO_REGIONS = (
    (("Duodenum, bulb", "biopsy"), ("Duodenal bulb", "biopsies")),
    (
        ("Duodenum, second portion", "biopsies"),
        ("Duodenum, D2", "biopsy"),
        ("Second part of duodenum", "biopsies"),
    ),
    (("Duodenum, distal", "biopsies"),),
)
GASTRIC_SITES = (("Stomach, antrum", "biopsy"), ("Stomach, antrum and body", "biopsies"))

# ----------------------------------------------------------------- lung fragments

LUNG_SMALL = [
    F(
        "Invasive adenocarcinoma, acinar predominant (acinar 60%, lepidic 30%, papillary 10%).",
        "adc:p",
    ),
    F("Adenocarcinoma, solid pattern, TTF-1 positive.", "adc:p"),
    F(
        "Squamous cell carcinoma, keratinizing, moderately differentiated (p40 positive, TTF-1 negative).",
        "scc:p",
    ),
    F(
        "Non-small cell carcinoma, favor squamous cell carcinoma (p40 positive; TTF-1 and napsin A negative).",
        "nsclc:p scc:l",
    ),
    F(
        "Non-small cell carcinoma, not otherwise specified (NSCLC-NOS); immunostains are non-contributory.",
        "nsclc:p",
    ),
    F(
        ["Small cell carcinoma.", "Synaptophysin and INSM1 positive; Ki-67 approximately 90%."],
        "sclc:p",
        micro="Sheets of small cells with scant cytoplasm, finely granular chromatin, nuclear "
        "moulding and extensive crush artefact.",
    ),
    F(
        "Combined small cell carcinoma (small cell carcinoma with an adenocarcinoma component, about 20%).",
        "sclc:p adc:p",
    ),
    F("Large cell neuroendocrine carcinoma.", "lcc:p"),
    F("Large cell carcinoma (null immunophenotype).", "lcc:p"),
    F("Typical carcinoid tumor; mitoses <2 per 2 mm2, no necrosis.", "car:p"),
    F("Atypical carcinoid (4 mitoses per 2 mm2; focal punctate necrosis).", "car:p"),
    F(
        [
            "Metastatic adenocarcinoma, consistent with colorectal primary (CK20 and CDX2 positive; CK7 and TTF-1 negative).",
            "Primary lung adenocarcinoma is not favored.",
        ],
        "met:p adc:ul",
    ),
    F("Benign bronchial mucosa with squamous metaplasia; negative for malignancy.", "ben:p mal:a"),
    F("Organizing pneumonia; no malignancy identified.", "ben:p mal:a"),
    F(
        "Rare atypical cells suspicious for small cell carcinoma; crush artefact limits assessment.",
        "sclc:u",
    ),
    F(
        "Poorly differentiated carcinoma, favor adenocarcinoma (napsin A focally positive, p40 negative).",
        "adc:l",
    ),
    F(
        "Squamous cell carcinoma; a metastasis from an upper aerodigestive tract primary cannot be "
        "excluded on morphology alone.",
        "scc:p met:u",
    ),
    F(
        "Adenocarcinoma with mucinous features; metastasis from a gastrointestinal primary is "
        "unlikely (TTF-1 positive, CDX2 negative).",
        "adc:p met:ul",
    ),
    F("Invasive adenocarcnoma, papillary predominant.", "adc:p"),
    F("SCLC (synaptophysin+, INSM1+, Ki-67 ~90%).", "sclc:p", styles={3}),
    F(
        "Necrotizing granulomatous inflammation; negative for malignancy. See comment.",
        "ben:p mal:a",
        note="Ziehl-Neelsen and Grocott stains show no organisms; culture correlation is advised.",
    ),
]
LUNG_SMALL_SITES = (
    ("Lung, right upper lobe", "CT-guided core needle biopsy"),
    ("Lung, left lower lobe", "CT-guided core biopsy"),
    ("Bronchus, right main", "endobronchial biopsy"),
    ("Bronchus, left upper lobe orifice", "endobronchial biopsy"),
    ("Lung, right middle lobe", "transbronchial biopsy"),
    ("Lung, left upper lobe", "navigational bronchoscopic biopsy"),
)
LUNG_NODE_NEG = [
    F(
        "Negative for malignancy; abundant lymphocytes consistent with adequate nodal sampling.",
        "ben:p mal:a",
    ),
    F("Benign lymph node with anthracotic pigment; negative for malignancy.", "ben:p mal:a"),
    F(
        "Non-necrotizing granulomatous lymphadenitis, consistent with sarcoidosis; negative for malignancy.",
        "ben:p mal:a",
    ),
    F("Non-diagnostic: blood and bronchial epithelium only, no lymphoid tissue.", ""),
]
LUNG_NODE_POS = [
    F(
        "Metastatic non-small cell carcinoma, favor adenocarcinoma (TTF-1 positive, p40 negative).",
        "met:p nsclc:p adc:l",
    ),
    F("Metastatic squamous cell carcinoma.", "met:p scc:p"),
    F(
        "Metastatic small cell carcinoma (synaptophysin and INSM1 positive; Ki-67 >80%).",
        "met:p sclc:p",
    ),
    F("Metastatic adenocarcinoma of lung origin (TTF-1 and napsin A positive).", "met:p adc:p"),
]
LUNG_STATIONS = ("4R", "4L", "7", "10R", "11L", "2R", "11R")

# ----------------------------------------------------------------- breast fragments

BREAST_BENIGN = [
    F("Fibroadenoma.", "fa:p"),
    F(["Fibroadenoma.", "No atypia."], "fa:p adh:a"),
    F("Fibroepithelial lesion, most consistent with fibroadenoma.", "fa:l"),
    F(
        "Benign breast tissue with fibrocystic changes (apocrine metaplasia, cysts and stromal fibrosis).",
        "ben:p",
    ),
    F("Benign breast parenchyma with stromal fibrosis; negative for malignancy.", "ben:p mal:a"),
    F("Benign breast tissue with radial scar; no atypia.", "ben:p adh:a"),
    F(
        [
            "Columnar cell change with flat epithelial atypia.",
            "No atypical ductal hyperplasia or carcinoma.",
        ],
        "adh:a mal:a",
    ),
    F(
        "Intraductal papilloma without atypia; negative for in situ or invasive carcinoma.",
        "adh:a mal:a",
    ),
    F(
        [
            "Atypical ductal hyperplasia associated with calcifications.",
            "Negative for in situ and invasive carcinoma.",
        ],
        "adh:p mal:a",
        micro="A duct space is partly filled by a monotonous population of evenly spaced cells "
        "forming rigid bridges; the process spans less than two duct spaces.",
    ),
    F(
        "Atypical ductal hyperplasia; low-grade DCIS cannot be excluded. Excision is recommended.",
        "adh:p dcis:u",
    ),
    F("Lobular carcinoma in situ, classic type; no invasive carcinoma.", "lcis:p inv:a"),
    F("LCIS, classic type, w/ calcs; no invasive ca.", "lcis:p inv:a", styles={3}),
    F("Benign breast tissue with usual ductal hyperplasia and sclerosing adenosis.", "ben:p"),
    F("Fibroadenoma with calcifications; benign breast tissue.", "fa:p ben:p"),
]
BREAST_DCIS = [
    F(
        [
            "Ductal carcinoma in situ, high nuclear grade, solid type with comedonecrosis.",
            "No invasive carcinoma identified.",
        ],
        "dcis:p inv:a",
    ),
    F(
        "DCIS, intermediate nuclear grade, cribriform pattern, associated with calcifications.",
        "dcis:p",
    ),
    F(
        "Ductal carcinoma in situ, low nuclear grade, micropapillary type; invasive ductal "
        "carcinoma cannot be excluded in this core (see comment).",
        "dcis:p idc:u",
        note="Rare single cells in the stroma adjacent to the DCIS are equivocal on H&E; the "
        "excision specimen will allow full assessment.",
    ),
]


def nottingham_phrase(rng: random.Random, grade: int, *, british: bool = False) -> str:
    """A Nottingham statement whose component scores add up to the grade."""
    triples = {
        1: [(1, 2, 1), (2, 2, 1), (1, 1, 1), (3, 1, 1)],
        2: [(3, 2, 1), (2, 2, 2), (3, 2, 2), (2, 3, 1)],
        3: [(3, 3, 2), (3, 3, 3), (2, 3, 3)],
    }
    t, n, m = rng.choice(triples[grade])
    total = t + n + m
    forms = [
        f"Nottingham grade {grade} (score {total}/9)",
        f"Nottingham histologic grade {grade} (tubules {t}, nuclei {n}, mitoses {m}; total {total})",
        f"grade {grade} (Nottingham score {total}: tubules {t}, nuclear pleomorphism {n}, mitoses {m})",
        f"Nottingham grade {grade}",
    ]
    return rng.choice(forms)


def biomarker_lines(rng: random.Random, profile: str) -> tuple[list[str], dict[str, str]]:
    """ER/PR/HER2 sentences for a profile (luminal, luminal_b, her2, triple_neg)."""
    lines: list[str] = []
    vals: dict[str, str] = {}
    if profile in ("luminal", "luminal_b", "her2_lum"):
        er = rng.choice(
            [
                "ER positive (95%, strong)",
                "Estrogen receptor: positive, 80% of nuclei, moderate to strong intensity",
                "ER: positive (Allred score 8/8)",
                "ER: positive, 100%, strong",
            ]
        )
        vals["er_status"] = "positive"
        if profile == "luminal" and rng.random() < 0.75:
            pr = rng.choice(
                [
                    "PR positive (60%, moderate)",
                    "Progesterone receptor: positive, 30%",
                    "PR: positive (90%)",
                ]
            )
            vals["pr_status"] = "positive"
        else:
            pr = rng.choice(
                [
                    "PR: negative (<1%)",
                    "Progesterone receptor negative (0%)",
                    "PR: low (5%, weak) - positive",
                ]
            )
            vals["pr_status"] = "negative" if "negative" in pr else "positive"
    elif profile == "low_er":
        er = "ER: low positive (4%, weak); see comment"
        vals["er_status"] = "positive"
        pr = "PR: negative (0%)"
        vals["pr_status"] = "negative"
    else:
        er = rng.choice(["ER: negative (0%)", "Estrogen receptor negative (<1%)"])
        pr = rng.choice(["PR: negative (0%)", "PR negative (<1%)"])
        vals["er_status"] = "negative"
        vals["pr_status"] = "negative"
    if profile in ("her2", "her2_lum"):
        her2, v = rng.choice(
            [
                ("HER2 (IHC) 3+, positive", "positive"),
                ("HER2 IHC 2+ (equivocal); ISH amplified (HER2/CEP17 ratio 2.8)", "positive"),
                (
                    "HER2: positive (score 3+, complete intense membrane staining in >10% of cells)",
                    "positive",
                ),
            ]
        )
    elif profile == "luminal_b" and rng.random() < 0.5:
        her2, v = ("HER2 IHC 2+ (equivocal); reflex ISH to follow", "equivocal")
    else:
        her2, v = rng.choice(
            [
                ("HER2 negative (1+)", "negative"),
                ("HER2 (IHC): score 0, negative", "negative"),
                (
                    "HER2 IHC 2+ (equivocal); ISH not amplified (ratio 1.3, mean HER2 copy number 2.7)",
                    "negative",
                ),
                ("HER2: 1+ (negative)", "negative"),
            ]
        )
    vals["her2_status"] = v
    ki = rng.choice(["Ki-67: 12%", "Ki-67 approximately 30%", "Ki-67: 60%", "Ki-67 8%"])
    lines = [er + ".", pr + ".", her2 + ".", ki + "."]
    return lines, vals


MARKER_PREFIX = re.compile(r"^(?:ER|PR|HER2|Estrogen receptor|Progesterone receptor)\s*:?\s*")


def strip_marker(line: str) -> str:
    """'ER: positive (95%)' -> 'positive (95%)' for a synoptic field that names the marker."""
    return MARKER_PREFIX.sub("", line.rstrip(".")).strip()


BREAST_CORE_SITES = (
    ("Left breast, 10 o'clock, 4 cm from nipple", "ultrasound-guided core biopsy"),
    ("Right breast, 2 o'clock", "ultrasound-guided core biopsy"),
    ("Left breast, upper outer quadrant", "stereotactic core biopsy (calcifications)"),
    ("Right breast, 7 o'clock, 6 cm FN", "ultrasound-guided core biopsy"),
    ("Right breast, retroareolar", "core needle biopsy"),
    ("Left breast, 12 o'clock", "vacuum-assisted biopsy"),
)

# ---------------------------------------------------------------------------------------
# Cases
# ---------------------------------------------------------------------------------------


@dataclass
class PartSpec:
    site: str
    proc: str
    frag: Frag
    gross: str = ""


@dataclass
class DemoCase:
    """One invented report with its hand-coded gold."""

    case_id: str
    scheme: str
    style: int
    text: str = ""
    labels: dict[str, str] = field(default_factory=dict)
    values: dict[str, str] = field(default_factory=dict)
    kind: str = ""


@dataclass
class Draft:
    """What a builder decides; ``render`` turns it into text and gold."""

    scheme: str
    style: int
    parts: list[PartSpec]
    history: str = ""
    notes: list[str] = field(default_factory=list)  # label-free comment sentences
    synoptic_title: str = ""
    synoptic: list[tuple[str, str]] = field(default_factory=list)
    syn_labels: str = ""
    syn_values: dict[str, str] = field(default_factory=dict)
    british: bool = False
    upper: bool = False
    micro: bool = False
    kind: str = ""
    gross_block: str = ""  # one gross paragraph for all parts (many-core prostate sets)


# ---------------------------------------------------------------------------------------
# Text helpers
# ---------------------------------------------------------------------------------------

TNM_TOKEN = re.compile(r"\b[yr]{0,2}p[TNM][0-9a-zA-Z]*\b|\bmm2\b|\bKi-67\b")


def caps(text: str) -> str:
    """Upper-case a line the way old report systems did, keeping TNM tokens readable."""
    out: list[str] = []
    last = 0
    for m in TNM_TOKEN.finditer(text):
        out.append(text[last : m.start()].upper())
        out.append(m.group(0) if m.group(0).startswith(("p", "y", "r")) else m.group(0).upper())
        last = m.end()
    out.append(text[last:].upper())
    return "".join(out)


BRITISH = {
    "tumor": "tumour",
    "tumors": "tumours",
    "favor": "favour",
    "favored": "favoured",
    "favors": "favours",
    "celiac": "coeliac",
    "hemorrhage": "haemorrhage",
    "hemorrhagic": "haemorrhagic",
    "anemia": "anaemia",
    "center": "centre",
    "fiber": "fibre",
    "gray": "grey",
    "keratinizing": "keratinising",
    "organizing": "organising",
    "cauterized": "cauterised",
    "labeled": "labelled",
    "hematoxylin": "haematoxylin",
    "estrogen": "oestrogen",
    "esophagus": "oesophagus",
    "diarrhea": "diarrhoea",
    "necrotizing": "necrotising",
    "characterized": "characterised",
    "cecum": "caecum",
    "histopathologic": "histopathological",
    "color": "colour",
}
BRITISH_RE = re.compile(
    r"\b(" + "|".join(sorted(BRITISH, key=len, reverse=True)) + r")\b", re.IGNORECASE
)


def brit(text: str) -> str:
    def sub(m: re.Match[str]) -> str:
        word = m.group(0)
        repl = BRITISH[word.lower()]
        if word.isupper():
            return repl.upper()
        if word[0].isupper():
            return repl[0].upper() + repl[1:]
        return repl

    return BRITISH_RE.sub(sub, text)


def join_sentences(sentences: Sequence[str]) -> str:
    return " ".join(s.strip() for s in sentences if s.strip())


# ---------------------------------------------------------------------------------------
# Gross descriptions (gross text never decides a label)
# ---------------------------------------------------------------------------------------


def gross_for(kind: str, desc: str, rng: random.Random) -> str:
    r = rng
    a = round(r.uniform(0.2, 0.6), 1)
    b = round(a + r.uniform(0.1, 0.6), 1)
    n = r.randint(2, 6)
    if kind == "polyp":
        return r.choice(
            [
                f'Received in formalin labeled "{desc}" is a single tan-pink polypoid fragment, {b} x {a} x {a} cm. The base is inked. Bisected and entirely submitted.',
                f'Labeled "{desc}": {words(n)} tan soft tissue fragments, {a} to {b} cm. Entirely submitted in one cassette.',
                f'The specimen, labeled "{desc}", consists of a pedunculated polyp measuring {b + 0.5:.1f} cm with a 0.3 cm stalk. Stalk margin inked blue; serially sectioned and entirely submitted.',
                f'"{desc}": multiple pink-tan fragments aggregating {b} x {a} x 0.2 cm, submitted in toto.',
            ]
        )
    if kind in ("bx", "duo", "gastric"):
        return r.choice(
            [
                f'Received in formalin labeled "{desc}" are {words(n)} tan-white fragments of soft tissue, each {a}-{b} cm. Entirely submitted in one cassette.',
                f'{words(n).capitalize()} fragments of pink-tan mucosa, {a} cm to {b} cm, labeled "{desc}", submitted in toto.',
                f'Labeled "{desc}": {n} minute tan fragments, the largest {b} cm. All embedded.',
            ]
        )
    if kind == "core":
        l1 = round(r.uniform(0.8, 1.8), 1)
        return r.choice(
            [
                f'Received in formalin labeled "{desc}" is a tan-white needle core, {l1} cm in length and 0.1 cm in diameter. Entirely submitted (inked).',
                f'"{desc}": {words(r.randint(1, 3))} thin cores, up to {l1} cm. Entirely submitted in one cassette.',
                f'One core of tan tissue, {l1} cm, labeled "{desc}", wrapped and submitted in its entirety.',
            ]
        )
    if kind == "ecc":
        return f'Labeled "{desc}" is {r.randint(1, 4)} mL of mucoid tan material with scant tissue fragments, filtered and entirely submitted.'
    if kind == "leep":
        return (
            f'Received fresh, labeled "{desc}", is a loop excision specimen, {r.choice(["2.4 x 1.9 x 0.8", "2.1 x 2.0 x 1.0", "3.0 x 2.2 x 1.1"])} cm, '
            "with a suture at 12 o'clock. The endocervical margin is inked black and the deep margin green. "
            f"Serially sectioned radially into {r.randint(8, 12)} slices and entirely submitted."
        )
    if kind == "turp":
        return f"Received in formalin are multiple tan-white rubbery chips of prostatic tissue weighing {r.randint(8, 40)} g in aggregate. Twelve cassettes submitted."
    if kind == "node":
        return f'Labeled "{desc}" is a fragment of fibroadipose tissue, {b + 2:.1f} x {b + 1:.1f} x {b:.1f} cm, with {words(r.randint(2, 9))} candidate lymph nodes. All submitted.'
    if kind == "ebus":
        return f'Received are {r.randint(2, 8)} mL of bloody fluid and small tissue fragments labeled "{desc}", processed as a cell block.'
    if kind == "liver":
        return f'Labeled "{desc}" is a wedge of liver, {b + 2:.1f} x {b + 1:.1f} x 1.0 cm, containing a firm white nodule. Capsule inked; serially sectioned and submitted.'
    if kind == "wedge":
        return f'Received fresh, labeled "{desc}", is a stapled wedge of lung, {r.randint(6, 11)}.0 x {r.randint(2, 4)}.5 x 1.8 cm. The staple line is removed and the margin inked. Serially sectioned; representative sections submitted.'
    return f'Received in formalin labeled "{desc}". Representative sections submitted.'


# ---------------------------------------------------------------------------------------
# Clinical histories (never decide a label; some carry deliberate traps)
# ---------------------------------------------------------------------------------------

HISTORIES: dict[str, dict[str, list[str]]] = {
    "colorectal": {
        "polyps": [
            "Screening colonoscopy. Polyps removed.",
            "Surveillance colonoscopy; history of tubular adenomas (2021).",
            "Family history of colon cancer (father, age 58). Screening colonoscopy.",
            "Positive FIT. Colonoscopy with polypectomies.",
            "History of adenocarcinoma of colon, status post right hemicolectomy (2019); surveillance.",
            "Rectal bleeding. Rule out adenoma.",
            "Iron deficiency anemia; rule out malignancy.",
            "Prior sessile serrated lesions; 3-year surveillance.",
            "Change in bowel habit. Multiple small polyps.",
        ],
        "random": [
            "Chronic watery diarrhea; rule out microscopic colitis.",
            "Ulcerative colitis, surveillance. No endoscopic lesion.",
            "Abdominal pain and diarrhea for 3 months. Normal-appearing mucosa.",
            "History of colon cancer in a sibling; diarrhea. Random biopsies.",
        ],
        "mass": [
            "Sigmoid mass seen at colonoscopy; rule out carcinoma.",
            "Ulcerated rectal mass, 8 cm from the anal verge.",
            "Weight loss and anemia. Circumferential mass in the ascending colon.",
        ],
        "resection": [
            "Colon cancer diagnosed on biopsy. Resection.",
            "Adenocarcinoma on prior biopsy (LRP-25-019342).",
            "Obstructing mass; resection.",
            "Screen-detected malignant polyp; completion resection.",
        ],
    },
    "prostate": {
        "biopsy": [
            "Elevated PSA (6.8 ng/mL); rule out carcinoma.",
            "PSA 9.2 ng/mL, abnormal DRE (left nodule).",
            "Rising PSA (4.1 to 6.3 ng/mL over 18 months). Prior negative biopsy (2023).",
            "PSA 11.4. MRI: PI-RADS 4 lesion.",
            "Family history of prostate cancer (brother). PSA 5.5.",
            "Prior biopsy (2024) with HGPIN. Repeat sampling.",
            "PSA density 0.21. Systematic and targeted biopsy.",
        ],
        "resection": [
            "Prostatic adenocarcinoma on biopsy. Robotic radical prostatectomy.",
            "Biopsy-proven adenocarcinoma (Grade Group 2 on biopsy). Prostatectomy.",
        ],
        "turp": [
            "Lower urinary tract symptoms; BPH. TURP.",
            "Urinary retention. Enlarged prostate.",
        ],
    },
    "cervix": {
        "biopsy": [
            "Pap: HSIL. HPV 16 positive. Colposcopy.",
            "Pap ASC-H; high-risk HPV positive.",
            "LSIL on Pap smear; colposcopy with biopsies.",
            "Colposcopy: acetowhite lesion at the transformation zone; rule out CIN.",
            "Persistent HPV 18 positivity; normal cytology.",
            "History of CIN 3 treated with LEEP (2021). Follow-up colposcopy.",
            "Postcoital bleeding; friable cervix.",
        ],
        "leep": [
            "HSIL on biopsy; LEEP.",
            "CIN 2-3 on prior biopsy. Loop excision.",
            "Pap: AGC; HPV 18 positive. Cold knife cone.",
        ],
    },
    "duodenum": {
        "celiac": [
            "Rule out celiac disease. tTG-IgA 85 U/mL.",
            "Iron deficiency anemia; rule out celiac disease.",
            "Positive tissue transglutaminase serology. Bloating and diarrhea.",
            "Known celiac disease on a gluten-free diet for 2 years; persistent symptoms.",
            "Dyspepsia. Mother has celiac disease.",
            "Chronic diarrhea and weight loss.",
            "Type 1 diabetes; positive celiac serology.",
        ],
        "other": [
            "Epigastric pain; rule out H. pylori and peptic ulcer disease.",
            "Nausea, early satiety. EGD with random biopsies.",
            "Diarrhea after travel; rule out Giardia.",
        ],
    },
    "lung": {
        "resection": [
            "Former smoker (40 pack-years) with a spiculated lung nodule. Resection.",
            "PET-avid lung mass; resection with mediastinal node sampling.",
            "Enlarging lung nodule on surveillance CT; resection.",
            "Incidental nodule on cardiac CT, growing over 2 years.",
        ],
        "small": [
            "Right hilar mass with mediastinal lymphadenopathy. Rule out malignancy.",
            "Heavy smoker, cavitating RUL mass.",
            "History of colon adenocarcinoma (2022); new pulmonary nodules.",
            "Persistent consolidation; rule out lymphoma vs carcinoma.",
            "History of laryngeal squamous cell carcinoma; new lung mass.",
        ],
        "ebus": [
            "Lung mass with enlarged subcarinal and paratracheal nodes; EBUS staging.",
            "Mediastinal lymphadenopathy; rule out sarcoidosis vs malignancy.",
        ],
    },
    "breast": {
        "core": [
            "BI-RADS 5 irregular mass at 10 o'clock on ultrasound.",
            "Palpable lump; family history of breast cancer (mother, age 44).",
            "Screen-detected calcifications, BI-RADS 4B; rule out DCIS.",
            "History of right breast IDC (2018), now new left breast mass.",
            "Enlarging well-circumscribed mass, 2.1 cm, in a 29-year-old; probable fibroadenoma.",
            "BRCA2 carrier; MRI enhancement.",
        ],
        "excision": [
            "Invasive carcinoma on core biopsy. Wide local excision and sentinel node biopsy.",
            "Core biopsy: IDC. Lumpectomy.",
            "Completed neoadjuvant chemotherapy. Surgery.",
            "Left breast cancer; mastectomy at patient preference.",
        ],
    },
}

GENERIC_NOTES = [
    "Results were communicated to the clinical team on the day of sign-out.",
    "Slides were reviewed at the intradepartmental consensus conference; the reviewers concur.",
    "Correlation with the clinical and imaging findings is recommended.",
    "Dr. {other} has reviewed selected slides and agrees with the interpretation.",
    "Case discussed with the submitting physician.",
]

# ---------------------------------------------------------------------------------------
# Rendering
# ---------------------------------------------------------------------------------------


@dataclass
class Meta:
    case_id: str
    patient_last: str
    patient_first: str
    age: int
    sex: str
    mrn: str
    path: str
    other: str
    clin: str
    collected: Day
    signed: Day
    label_style: str


def part_label(style: str, i: int) -> str:
    letter = "ABCDEFGHIJKLMNOP"[i]
    return {
        "alpha": f"{letter}.",
        "num": f"{i + 1}.",
        "part": f"Part {i + 1}:",
        "paren": f"({letter})",
        "numparen": f"{i + 1})",
    }[style]


def render(d: Draft, meta: Meta, rng: random.Random) -> str:
    style = d.style
    parts = d.parts
    multi = len(parts) > 1 or rng.random() < 0.4
    labels = [part_label(meta.label_style, i) if multi else "" for i in range(len(parts))]
    notes = [(lab, p.frag.note) for lab, p in zip(labels, parts) if p.frag.note]
    generic = [n.format(other=meta.other) for n in d.notes]

    def dx_lines_style1() -> list[str]:
        out: list[str] = []
        for lab, p in zip(labels, parts):
            head = f"{lab} {p.site}, {p.proc}:".strip()
            out.append(caps(head))
            for s in p.frag.dx:
                out.append("   - " + (caps(s) if d.upper else s))
        return out

    def dx_lines_style2() -> list[str]:
        out: list[str] = []
        inline = rng.random() < 0.4
        for lab, p in zip(labels, parts):
            head = f"{lab} {p.site}, {p.proc}:".strip()
            if inline:
                out.append(f"{head} {join_sentences(p.frag.dx)}")
            else:
                out.append(head)
                out.extend("    " + s for s in p.frag.dx)
        return out

    def dx_inline() -> str:
        bits = []
        for lab, p in zip(labels, parts):
            bits.append(f"{lab} {p.site}, {p.proc}: {join_sentences(p.frag.dx)}".strip())
        return " ".join(bits)

    def gross_lines() -> list[str]:
        if d.gross_block:
            return [d.gross_block]
        out = []
        for lab, p in zip(labels, parts):
            out.append(f"{lab} {p.gross}".strip())
        return out

    def micro_lines() -> list[str]:
        out = []
        for lab, p in zip(labels, parts):
            if p.frag.micro:
                out.append(f"{lab} {p.frag.micro}".strip())
        return out

    lines: list[str] = []
    if style == 1:
        lines += [
            LAB.upper(),
            rng.choice(["SURGICAL PATHOLOGY REPORT", "SURGICAL PATHOLOGY CONSULTATION REPORT"]),
            "",
            f"ACCESSION #: {meta.case_id}      COLLECTED: {meta.collected.us()}      RECEIVED: {meta.collected.plus(1).us()}",
            f"PATIENT: {meta.patient_last.upper()}, {meta.patient_first.upper()}      AGE/SEX: {meta.age}/{meta.sex}      MRN: {meta.mrn}",
            f"SUBMITTING PHYSICIAN: {meta.clin.upper()}, MD",
            "",
        ]
        if d.history:
            lines += [
                rng.choice(["CLINICAL HISTORY:", "CLINICAL DATA:", "CLINICAL INFORMATION:"]),
                d.history.upper(),
                "",
            ]
        lines += [rng.choice(["GROSS DESCRIPTION:", "GROSS:"]), *gross_lines(), ""]
        micro = micro_lines()
        if d.micro and micro:
            lines += ["MICROSCOPIC DESCRIPTION:", *micro, ""]
        lines += [rng.choice(["FINAL DIAGNOSIS:", "DIAGNOSIS:", "FINAL PATHOLOGIC DIAGNOSIS:"])]
        lines += dx_lines_style1()
        if d.synoptic:
            lines += ["", f"SYNOPTIC REPORT - {d.synoptic_title.upper()}"]
            lines += [f"{k}: {v}" for k, v in d.synoptic]
        if notes or generic:
            lines += ["", "COMMENT:"]
            lines += [f"{lab} {n}".strip() for lab, n in notes]
            lines += generic
        lines += [
            "",
            f"ELECTRONICALLY SIGNED OUT BY {meta.path.upper()}, MD, ON {meta.signed.us()} {rng.randint(8, 17):02d}:{rng.randint(0, 59):02d}",
        ]
    elif style == 2:
        dr = "Dr" if d.british else "Dr."
        date = (lambda x: x.uk()) if d.british else (lambda x: x.us())
        lines += [
            f"{LAB} - {'Histopathology' if d.british else 'Surgical Pathology'} Report",
            f"{'Lab no.' if d.british else 'Case number'}: {meta.case_id}    Specimen date: {date(meta.collected)}    Report date: {date(meta.signed)}",
            f"Patient: {meta.patient_first} {meta.patient_last} ({meta.age} y, {meta.sex})    {'Hospital no.' if d.british else 'MRN'}: {meta.mrn}",
            f"Requesting clinician: {dr} {meta.clin}",
            "",
        ]
        if d.history:
            lines += [
                rng.choice(["Clinical information:", "Clinical details:", "Clinical history:"]),
                d.history,
                "",
            ]
        if 1 < len(parts) <= 6:
            specs = "; ".join(f"{lab} {p.site}, {p.proc}".strip() for lab, p in zip(labels, parts))
            lines += [f"Specimens: {specs}", ""]
        lines += [
            "Macroscopic description:" if d.british else "Gross description:",
            *gross_lines(),
            "",
        ]
        micro = micro_lines()
        if micro:
            lines += [rng.choice(["Microscopic description:", "Microscopy:"]), *micro, ""]
        lines += [rng.choice(["Diagnosis:", "Final diagnosis:", "Diagnosis:"])]
        lines += dx_lines_style2()
        if d.synoptic:
            lines += ["", f"Synoptic summary ({d.synoptic_title}):"]
            lines += [f"  {k}: {v}" for k, v in d.synoptic]
        if notes or generic:
            lines += ["", "Comment:"]
            lines += [f"{lab} {n}".strip() for lab, n in notes]
            lines += generic
        title = "Consultant Histopathologist" if d.british else "Pathologist"
        lines += ["", f"Reported by: {dr} {meta.path}, {title}"]
    elif style == 3:
        last = meta.patient_last.upper()
        lines += [
            f"{meta.case_id}  LRPA  {last}, {meta.patient_first[0]}.  {meta.age}{meta.sex}  COLL {meta.collected.iso()}  DR {meta.clin.split()[0][0]}. {meta.clin.split()[-1].upper()}"
        ]
        if d.history:
            lines.append(f"{rng.choice(['HX', 'HISTORY', 'CLIN'])}: {d.history}")
        noun = "cores" if d.scheme == "prostate" else "tan fragments"
        short_gross = (
            " ".join(f"{lab} {words(rng.randint(2, 6))} {noun}, AE.".strip() for lab in labels)
            if multi
            else f"{words(rng.randint(2, 6)).capitalize()} {noun}, AE."
        )
        if d.kind in ("resection", "prostatectomy", "excision", "lobectomy"):
            short_gross = gross_lines()[0]
        lines.append(f"GROSS: {short_gross}")
        lines.append(f"DIAGNOSIS: {dx_inline()}")
        if d.synoptic:
            lines.append("SUMMARY: " + "; ".join(f"{k}: {v}" for k, v in d.synoptic) + ".")
        if notes or generic:
            lines.append("NOTE: " + " ".join([f"{lab} {n}".strip() for lab, n in notes] + generic))
        initials = "".join(w[0] for w in meta.path.split())
        lines.append(f"{initials} {meta.signed.iso()}")
    elif style == 4:
        lines += [
            f"{LAB.upper()} | SYNOPTIC SURGICAL PATHOLOGY REPORT",
            f"Accession No.: {meta.case_id}",
            f"Procedure date: {meta.collected.iso()}    Sign-out: {meta.signed.iso()}",
            f"Patient: {meta.patient_last}, {meta.patient_first}, {meta.age} {meta.sex}    Surgeon/clinician: {meta.clin}",
            "",
        ]
        if d.history:
            lines += ["Clinical history:", d.history, ""]
        lines += ["Gross description:", *gross_lines(), ""]
        lines += ["FINAL DIAGNOSIS:"]
        for lab, p in zip(labels, parts):
            lines.append(f"{lab} {p.site}, {p.proc}: {join_sentences(p.frag.dx)}".strip())
        if d.synoptic:
            lines += ["", f"SYNOPTIC SUMMARY - {d.synoptic_title.upper()}"]
            lines += [f"{k}: {v}" for k, v in d.synoptic]
        if notes or generic:
            lines += ["", "Comment:"]
            lines += [f"{lab} {n}".strip() for lab, n in notes]
            lines += generic
        lines += ["", f"Pathologist: {meta.path}, MD (electronically signed {meta.signed.iso()})"]
    else:  # style 5: no headers at all
        bits = []
        for p in parts:
            s = f"{p.site}, {p.proc}: {join_sentences(p.frag.dx)}"
            if p.frag.note:
                s += " " + p.frag.note
            bits.append(s)
        if d.synoptic:
            bits.append("; ".join(f"{k} {v}" for k, v in d.synoptic) + ".")
        lines = [(" " if rng.random() < 0.5 else "\n").join(bits)]
    text = "\n".join(lines).strip() + "\n"
    text = re.sub(r"\n{3,}", "\n\n", text)
    if d.british:
        text = brit(text)
    return text


def gold_of(d: Draft) -> tuple[dict[str, str], dict[str, str]]:
    """Case-level gold from the hand-coded part states (most definite state wins)."""
    states: dict[str, str] = {}
    for p in d.parts:
        for k, v in parse_labels(d.scheme, p.frag.labels).items():
            states[k] = merge_state(states.get(k), v) or v
    for k, v in parse_labels(d.scheme, d.syn_labels).items():
        states[k] = merge_state(states.get(k), v) or v
    values: dict[str, str] = {}
    gleasons: list[tuple[int, int, int]] = []
    marsh: list[str] = []
    for p in d.parts:
        for k, v in p.frag.values:
            if k == "gleason_score":
                ps, _, _t = v.partition("=")
                a, b = (int(x) for x in ps.split("+"))
                gleasons.append((grade_group(a, b), a + b, a))
            elif k == "grade_group":
                continue
            elif k == "marsh_grade":
                marsh.append(v)
            else:
                if k in values and values[k] != v:
                    raise ValueError(f"conflicting {k} values in one case: {values[k]} / {v}")
                values[k] = v
    for k, v in d.syn_values.items():
        if k in values and values[k] != v:
            raise ValueError(f"synoptic {k}={v} disagrees with part value {values[k]}")
        values[k] = v
    if gleasons:
        # several cores with different scores: the case carries the highest grade (practice)
        gg, total, primary = max(gleasons)
        values["gleason_score"] = f"{primary}+{total - primary}={total}"
        values["grade_group"] = str(gg)
    if marsh:
        order = ["0", "1", "2", "3a", "3b", "3c", "4"]
        values["marsh_grade"] = max(marsh, key=order.index)
    return states, values


# ---------------------------------------------------------------------------------------
# Builders (one per scheme); each returns a Draft for a given style
# ---------------------------------------------------------------------------------------


def pick(
    rng: random.Random,
    pool: Sequence[Frag],
    style: int,
    used: set[str] | None = None,
    *,
    avoid: Sequence[Frag] = (),
) -> Frag:
    """A fragment usable in ``style``; prefers ones not yet used, never repeats ``avoid``."""
    options = [f for f in pool if style in f.styles]
    own = [f for f in options if f.styles != ALL_STYLES and f not in avoid]
    if own and rng.random() < 0.35:  # give the style's own shorthand a fair chance
        options = own
    distinct = [f for f in options if f not in avoid]
    if distinct:
        options = distinct
    if used is not None:
        fresh = [f for f in options if f.dx[0] not in used]
        if fresh:
            options = fresh
    f = rng.choice(options)
    if used is not None:
        used.add(f.dx[0])
    return f


def no_value_clash(frags: Sequence[Frag]) -> bool:
    seen: set[str] = set()
    for f in frags:
        for k, _ in f.values:
            if k in seen:
                return False
            seen.add(k)
    return True


class Builder:
    def __init__(self, rng: random.Random) -> None:
        self.rng = rng
        self.used: set[str] = set()

    def hist(self, scheme: str, kind: str) -> str:
        return self.rng.choice(HISTORIES[scheme][kind])

    def notes(self) -> list[str]:
        return [self.rng.choice(GENERIC_NOTES)] if self.rng.random() < 0.35 else []

    # ----------------------------------------------------------- colorectal
    def colorectal(self, style: int, kind: str) -> Draft:
        r = self.rng
        if kind == "resection":
            return self.crc_resection(style)
        if kind == "polyps":
            n = r.choice([1, 1, 2, 2, 3, 4])
            while True:
                frags: list[Frag] = []
                for _ in range(n):
                    frags.append(pick(r, CRC_POLYP, style, self.used, avoid=frags))
                if no_value_clash(frags):
                    break
            sites = r.sample(COLON_POLYP_SITES, len(frags))
            parts = [
                PartSpec(
                    s, "hot snare polypectomy" if f.values else r.choice(COLON_POLYP_PROCS), f, ""
                )
                for s, f in zip(sites, frags)
            ]
            if r.random() < 0.25:
                extra_site = r.choice([s for s in COLON_RANDOM_SITES if s not in sites])
                parts.append(
                    PartSpec(extra_site, "random biopsies", pick(r, CRC_RANDOM, style, self.used))
                )
        elif kind == "random":
            n = r.choice([1, 2, 3, 4])
            frags = [pick(r, CRC_RANDOM, style, self.used) for _ in range(n)]
            sites = r.sample(COLON_RANDOM_SITES, n)
            parts = [
                PartSpec(s, r.choice(["random biopsies", "biopsies", "biopsy"]), f)
                for s, f in zip(sites, frags)
            ]
        else:  # mass
            f = pick(r, CRC_MASS, style, self.used)
            site = r.choice(
                [
                    "Sigmoid colon, mass",
                    "Rectum, mass at 10 cm",
                    "Ascending colon, mass",
                    "Cecum, ulcerated lesion",
                ]
            )
            parts = [PartSpec(site, "biopsy", f)]
            if r.random() < 0.5:
                parts.append(
                    PartSpec(
                        r.choice(COLON_POLYP_SITES),
                        "polypectomy",
                        pick(r, CRC_POLYP, style, self.used),
                    )
                )
        for p in parts:
            gk = "polyp" if "polyp" in p.proc or "resection" in p.proc else "bx"
            p.gross = gross_for(gk, f"{p.site.lower()} {p.proc}", r)
        return Draft(
            "colorectal",
            style,
            parts,
            history=self.hist("colorectal", kind) if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            upper=r.random() < 0.6,
            micro=r.random() < 0.5,
            kind=kind,
        )

    def crc_resection(self, style: int) -> Draft:
        r = self.rng
        site, proc, rectal = r.choice(
            [
                ("Right colon and terminal ileum", "right hemicolectomy", False),
                ("Sigmoid colon", "sigmoid colectomy", False),
                ("Rectum", "low anterior resection", True),
                ("Rectum and anus", "abdominoperineal resection", True),
                ("Transverse colon", "transverse colectomy", False),
                ("Left colon", "left hemicolectomy", False),
                ("Rectosigmoid", "anterior resection", True),
            ]
        )
        neo = rectal and r.random() < 0.5
        y = "y" if neo else ""
        typ, lab = r.choice(
            [
                ("Adenocarcinoma", "adc:p"),
                ("Adenocarcinoma", "adc:p"),
                ("Adenocarcinoma", "adc:p"),
                ("Mucinous adenocarcinoma", "adc:p"),
                ("Adenocarcinoma with a signet-ring cell component (about 20%)", "adc:p"),
                ("Medullary carcinoma", "adc:p"),
            ]
        )
        if typ.startswith(("Medullary", "Adenocarcinoma with a signet")):
            grade = "high grade (poorly differentiated)"
        else:
            grade = r.choice(
                [
                    "low grade (moderately differentiated)",
                    "low grade (well to moderately differentiated)",
                    "high grade (poorly differentiated)",
                ]
            )
        depth = r.choice(
            [
                ("T1", "into the submucosa"),
                ("T2", "into the muscularis propria"),
                ("T3", "through the muscularis propria into pericolorectal adipose tissue"),
                ("T3", "through the muscularis propria into the subserosal fat"),
                ("T3", "through the muscularis propria into pericolorectal tissue"),
                ("T4a", "through the visceral peritoneum"),
            ]
        )
        size = float(r.randint(12, 40) if neo else r.randint(18, 78))
        exam = r.randint(12, 31)
        pos = r.choice([0, 0, 0, 0, 0, 1, 2, 3, 5, 8])
        pos = min(pos, exam)
        pn = crc_pn(pos)
        margin_inv = r.random() < 0.15
        lvi = r.random() < 0.4
        pm1 = (not neo) and r.random() < 0.12
        dims = r.random() < 0.5
        size_txt = (
            f"{cm(size)} x {cm(size * 0.7)} x {cm(max(size * 0.2, 5))} cm"
            if dims
            else f"{cm(size)} cm"
        )
        margin_close = r.choice([2, 4, 8, 12, 25])
        values = {
            "pt": f"{y}p{depth[0]}",
            "pn": f"{y}p{pn}",
            "lymph_nodes_positive": str(pos),
            "lymph_nodes_examined": str(exam),
            "margin_status": "involved" if margin_inv else "negative",
            "tumor_size_mm": f"{size:.1f}",
            "lymphovascular_invasion": "present" if lvi else "absent",
        }
        if pm1:
            values["pm"] = "pM1a"
        background, bg_lab = r.choice(
            [
                ("", ""),
                ("", ""),
                ("Two tubular adenomas in the background mucosa.", "lgd:l"),
                (
                    "One tubular adenoma with low-grade dysplasia, 0.6 cm, separate from the carcinoma.",
                    "lgd:p",
                ),
                ("Hyperplastic polyp, 0.3 cm.", "hp:p"),
            ]
        )
        stage = f"{y}p{depth[0]} {y}p{pn}"
        stage_variants = [
            stage,
            f"{y}p{depth[0]} {pn}",
            f"{stage}, pM1a" if pm1 else f"{y}p{depth[0]} {pn} MX",
        ]
        stage_txt = r.choice(stage_variants) if not pm1 else f"{stage} pM1a"
        if neo:
            stage_txt = f"{y}p{depth[0]} {pn}"  # "ypT3 N1b": the y prefix covers the N category
        if margin_inv:
            margin_txt = r.choice(
                [
                    "Carcinoma extends to the inked radial (circumferential) margin.",
                    "Radial margin involved by carcinoma (0 mm).",
                ]
            )
        else:
            margin_txt = r.choice(
                [
                    f"Margins negative; closest (radial) margin {margin_close} mm.",
                    f"Proximal, distal and radial margins free of tumor (closest {margin_close} mm).",
                    "All surgical margins uninvolved by carcinoma.",
                ]
            )
        if pos == 0:
            node_txt = r.choice(
                [
                    f"{words(exam).capitalize()} lymph nodes, negative for metastatic carcinoma (0/{exam}).",
                    f"No metastatic carcinoma in {exam} lymph nodes (0/{exam}).",
                ]
            )
        else:
            node_txt = r.choice(
                [
                    f"Metastatic carcinoma in {words(pos)} of {words(exam)} lymph nodes ({pos}/{exam}).",
                    f"Lymph nodes: {pos}/{exam} positive for metastatic adenocarcinoma.",
                ]
            )
        lvi_txt = (
            r.choice(
                [
                    "Lymphovascular invasion present.",
                    "Lymphovascular invasion: present (extramural venous invasion).",
                ]
            )
            if lvi
            else r.choice(
                [
                    "No lymphovascular invasion identified.",
                    "Lymphovascular invasion: not identified.",
                ]
            )
        )
        response = (
            r.choice(
                [
                    "Treatment effect present; near-complete response (tumour regression score 1).",
                    "Partial treatment response (tumour regression score 2).",
                ]
            )
            if neo
            else ""
        )
        parts: list[PartSpec] = []
        syn: list[tuple[str, str]] = []
        if style == 4:
            dx = [f"{typ}, {grade.split(' (')[0]}, {stage} (see synoptic summary)."]
            frag = F(dx, lab + (" " + bg_lab if bg_lab else ""))
            syn = [
                ("Procedure", proc.capitalize()),
                ("Tumor site", site),
                ("Histologic type", typ),
                ("Histologic grade", grade.capitalize()),
                (
                    "Tumor size",
                    f"{size_txt} (greatest dimension {cm(size)} cm)" if dims else size_txt,
                ),
                ("Tumor extent", f"Invades {depth[1]}"),
                ("Lymphovascular invasion", "Present" if lvi else "Not identified"),
                ("Perineural invasion", r.choice(["Not identified", "Present"])),
                ("Tumor deposits", "Not identified"),
                (
                    "Margins",
                    "Involved (radial margin)"
                    if margin_inv
                    else f"Uninvolved by invasive carcinoma; closest (radial) {margin_close} mm",
                ),
            ]
            if neo:
                syn.append(("Treatment effect", response))
            syn += [
                (
                    "Regional lymph nodes",
                    r.choice(
                        [
                            f"{pos}/{exam} involved",
                            f"Number examined: {exam}; number involved: {pos}",
                        ]
                    ),
                ),
                ("Pathologic stage (AJCC 8th edition)", f"{y}p{depth[0]} {y}p{pn}"),
                ("Distant metastasis", "pM1a (liver)" if pm1 else "Not applicable"),
                ("Additional findings", background or "None"),
            ]
            parts.append(PartSpec(site, proc, frag))
            gross = gross_crc(r, site, proc, size, size_txt)
        elif style == 3:
            dx = [
                f"{typ}, {grade.split(' (')[1].rstrip(')')}, {cm(size)} cm, invading {depth[1].replace('the ', '')} ({y}p{depth[0]});",
                f"LNs {pos}/{exam} ({y}p{pn});",
                "margins neg." if not margin_inv else "radial margin POSITIVE.",
                "LVI present." if lvi else "LVI neg.",
            ]
            if pm1:
                dx.append("Liver metastasis (part B): pM1a.")
            if background:
                dx.append(background)
            parts.append(PartSpec(site, proc, F(dx, lab + (" " + bg_lab if bg_lab else ""))))
            gross = gross_crc(r, site, proc, size, size_txt)
        elif style == 5:
            dx = [
                f"{grade.split(' (')[1].rstrip(')')} {typ.lower()}, {cm(size)} cm, {stage}, {pos}/{exam} nodes, margins {'involved' if margin_inv else 'negative'}, LVI {'present' if lvi else 'absent'}."
            ]
            parts.append(PartSpec(site, proc, F(dx, lab)))
            gross = ""
        else:
            dx = [
                f"{typ}, {grade}, forming a {size_txt} ulcerated mass.",
                f"Tumor invades {depth[1]} ({y}p{depth[0]}).",
                node_txt,
                margin_txt,
                lvi_txt,
            ]
            if response:
                dx.append(response)
            if background:
                dx.append(background)
            dx.append(f"AJCC 8th edition: {stage_txt}.")
            parts.append(PartSpec(site, proc, F(dx, lab + (" " + bg_lab if bg_lab else ""))))
            gross = gross_crc(r, site, proc, size, size_txt)
        parts[0].gross = gross
        if pm1 and style != 5:
            parts.append(
                PartSpec(
                    "Liver, segment 6",
                    "wedge excision",
                    F("Metastatic adenocarcinoma, consistent with colorectal primary.", "adc:p"),
                    gross_for("liver", "liver segment 6 nodule", r),
                )
            )
        elif pm1:
            values.pop("pm")
        return Draft(
            "colorectal",
            style,
            parts,
            history=self.hist("colorectal", "resection") if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Colon and rectum resection",
            synoptic=syn,
            syn_values=values,
            upper=r.random() < 0.5,
            kind="resection",
            british=style == 2 and r.random() < 0.5,
        )

    # ----------------------------------------------------------- prostate
    def prostate(self, style: int, kind: str) -> Draft:
        r = self.rng
        if kind == "prostatectomy":
            return self.prostatectomy(style)
        if kind == "turp":
            return self.turp(style)
        if kind == "targets":
            chosen = r.sample(PROSTATE_TARGETS, r.choice([1, 2]))
            sites = [
                t.replace("target 1", f"target {i + 1}").replace("target 2", f"target {i + 1}")
                for i, t in enumerate(chosen)
            ]
            sites += list(r.sample(PROSTATE_SITES_6, r.choice([1, 2])))
        else:
            sites = list(PROSTATE_SITES_12 if r.random() < 0.35 else PROSTATE_SITES_6)
            if r.random() < 0.3:
                sites.append(r.choice(PROSTATE_TARGETS))
        n = len(sites)
        scenario = r.choices(["benign", "pin", "asap", "cancer"], weights=[2, 1, 1.3, 5])[0]
        frags: list[Frag] = [pick(r, PROSTATE_BENIGN, style) for _ in range(n)]
        # benign cores in one report tend to repeat the same words: keep two phrasings at most
        common = [pick(r, PROSTATE_BENIGN, style), pick(r, PROSTATE_BENIGN, style)]
        frags = [common[0] if r.random() < 0.7 else common[1] for _ in range(n)]
        slots = list(range(n))
        r.shuffle(slots)
        if scenario == "pin":
            frags[slots.pop()] = pick(r, PROSTATE_PIN, style, self.used)
        elif scenario == "asap":
            frags[slots.pop()] = pick(r, PROSTATE_ATYPICAL, style, self.used)
            if r.random() < 0.4:
                frags[slots.pop()] = pick(r, PROSTATE_PIN, style)
        elif scenario == "cancer":
            top = r.choices([1, 2, 3, 4, 5], weights=[3, 4, 2, 1.5, 1.5])[0]
            k = r.randint(1, min(5, n))
            if r.random() < 0.2 and top in (1, 2):
                frags[slots.pop()] = r.choice(
                    PROSTATE_CANCER_SPECIAL[:2] if top == 1 else PROSTATE_CANCER_SPECIAL[2:]
                )
                k -= 1
            else:
                frags[slots.pop()] = prostate_cancer_frag(r, top, style)
                k -= 1
            for _ in range(k):
                frags[slots.pop()] = prostate_cancer_frag(r, r.randint(1, top), style)
            if r.random() < 0.25 and slots:
                frags[slots.pop()] = pick(r, PROSTATE_PIN, style)
        parts = [
            PartSpec(
                f"Prostate, {s.lower() if not s.startswith('MRI') else s}",
                r.choice(PROSTATE_CORE_PROCS),
                f,
            )
            for s, f in zip(sites, frags)
        ]
        for p in parts:
            p.gross = gross_for("core", p.site.replace("Prostate, ", "").lower(), r)
        block = ""
        if n > 6:
            block = (
                f"Received are {words(n)} containers, each labeled with the patient's name and the "
                f"biopsy site and each holding {r.choice(['one', 'one or two'])} tan-white needle core(s), "
                f"0.{r.randint(6, 9)} to 1.{r.randint(4, 9)} cm. Each container is entirely submitted in a "
                "separate cassette."
            )
        syn: list[tuple[str, str]] = []
        syn_labels = ""
        if style == 4:
            # table-like core summary; the per-core lines are the diagnosis proper
            d = Draft("prostate", 1, parts)
            _, vals = gold_of(d)
            pos_cores = sum(1 for f in frags if ("adc", "p") in _pairs(f) or "adc:l" in f.labels)
            syn = [
                ("Specimen", f"Prostate needle biopsies, {n} sites"),
                ("Cores with carcinoma", f"{pos_cores} of {n} sites" if pos_cores else "None"),
            ]
            if not pos_cores:
                syn_labels = "adc:a"  # "cores with carcinoma: none" negates it in the checklist
            if "gleason_score" in vals:
                a, rest = vals["gleason_score"].split("+")
                b, t = rest.split("=")
                syn += [
                    ("Highest Gleason score", f"{a}+{b}={t}"),
                    ("Grade Group (ISUP 2014/WHO 2016)", vals["grade_group"]),
                    ("Perineural invasion", r.choice(["Present", "Not identified"])),
                    ("Extraprostatic extension", "Not identified"),
                ]
        return Draft(
            "prostate",
            style,
            parts,
            history=self.hist("prostate", "biopsy") if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Prostate needle biopsy summary",
            synoptic=syn,
            syn_labels=syn_labels,
            upper=r.random() < 0.6,
            kind="biopsy",
            gross_block=block,
            british=style == 2 and r.random() < 0.4,
        )

    def prostatectomy(self, style: int) -> Draft:
        r = self.rng
        gg = r.choices([1, 2, 3, 4, 5], weights=[1, 4, 3, 1, 1.5])[0]
        p, s = r.choice(GLEASON_BY_GG[gg])
        t = p + s
        pt = r.choice(["pT2", "pT2", "pT3a", "pT3a", "pT3b"])
        nodes_done = r.random() < 0.8
        exam = r.randint(4, 18)
        pos = r.choice([0, 0, 0, 0, 1, 2]) if nodes_done else 0
        pn = ("pN1" if pos else "pN0") if nodes_done else "pNX"
        margin_inv = r.random() < 0.3
        lvi = r.random() < 0.2
        size = float(r.randint(8, 32))
        pin = r.random() < 0.5
        weight = r.randint(32, 78)
        values = {
            "gleason_score": f"{p}+{s}={t}",
            "grade_group": str(gg),
            "pt": pt,
            "pn": pn,
            "margin_status": "involved" if margin_inv else "negative",
            "lymphovascular_invasion": "present" if lvi else "absent",
            "tumor_size_mm": f"{size:.1f}",
        }
        if nodes_done:
            values["lymph_nodes_positive"] = str(pos)
            values["lymph_nodes_examined"] = str(exam)
        epe = "Present, focal (right posterolateral)" if pt != "pT2" else "Not identified"
        svi = "Present (left)" if pt == "pT3b" else "Not identified"
        parts: list[PartSpec] = []
        syn: list[tuple[str, str]] = []
        labels = "adc:p" + (" pin:p" if pin else "")
        gl_txt = r.choice(
            [
                f"Gleason score {p}+{s}={t} (Grade Group {gg})",
                f"Gleason {t} ({p}+{s}), ISUP Grade Group {gg}",
                f"Gleason score {p} + {s} = {t}, Grade Group {gg}",
            ]
        )
        margin_txt = (
            r.choice(
                [
                    "Carcinoma extends to the inked margin at the right posterolateral aspect (3 mm linear extent).",
                    "Margin positive (apex), 2 mm.",
                ]
            )
            if margin_inv
            else r.choice(
                [
                    "Surgical margins negative for carcinoma.",
                    "Margins free of tumor; closest 1 mm (left apex).",
                ]
            )
        )
        if style == 4:
            dx = [f"Prostatic adenocarcinoma (acinar type), {gl_txt}; see synoptic summary."]
            parts.append(
                PartSpec("Prostate and seminal vesicles", "radical prostatectomy", F(dx, labels))
            )
            syn = [
                (
                    "Procedure",
                    "Radical prostatectomy"
                    + (" with bilateral pelvic lymph node dissection" if nodes_done else ""),
                ),
                ("Prostate weight", f"{weight} g"),
                ("Histologic type", "Acinar adenocarcinoma"),
                ("Gleason score", f"Primary pattern {p}, secondary pattern {s}, total {t}"),
                ("Grade Group", str(gg)),
                ("Tumor size (dominant nodule)", f"{cm(size)} cm"),
                ("Extraprostatic extension", epe),
                ("Seminal vesicle invasion", svi),
                (
                    "Margins",
                    "Involved (right posterolateral, 3 mm, Gleason pattern 4)"
                    if margin_inv
                    else "Uninvolved by carcinoma",
                ),
                ("Lymphovascular invasion", "Present" if lvi else "Not identified"),
                ("Perineural invasion", "Present"),
                ("High-grade PIN", "Present" if pin else "Not identified"),
            ]
            if nodes_done:
                syn.append(("Regional lymph nodes", f"{pos} involved / {exam} examined"))
            syn.append(("Pathologic stage (AJCC 8th)", f"{pt} {pn}"))
            labels_extra = "pin:a" if not pin else ""
            d_labels = labels_extra
        else:
            dx = [
                f"Prostatic adenocarcinoma, acinar type, {gl_txt}.",
                f"Tumor forms a dominant nodule measuring {cm(size)} cm and involves both lobes.",
                f"Extraprostatic extension: {epe.lower()}; seminal vesicle invasion: {svi.lower()}.",
                margin_txt,
                "Lymphovascular invasion present." if lvi else "No lymphovascular invasion.",
            ]
            if pin:
                dx.append("High-grade PIN present.")
            dx.append(f"pTNM: {pt} {pn}.")
            parts.append(
                PartSpec("Prostate and seminal vesicles", "radical prostatectomy", F(dx, labels))
            )
            if nodes_done:
                node_frag = (
                    F(
                        f"Metastatic carcinoma in {words(pos)} of {words(exam)} lymph nodes ({pos}/{exam}).",
                        "adc:p",
                    )
                    if pos
                    else F(
                        f"{words(exam).capitalize()} lymph nodes, no metastatic carcinoma (0/{exam}).",
                        "",
                    )
                )
                parts.append(PartSpec("Lymph nodes, bilateral pelvic", "dissection", node_frag))
            d_labels = ""
        parts[0].gross = (
            f'Received fresh, labeled "prostate", is a radical prostatectomy specimen weighing {weight} g, '
            f"{r.randint(4, 6)}.0 x {r.randint(3, 5)}.5 x 3.0 cm, with attached seminal vesicles. The surface is inked "
            "(right green, left blue). Apex and base margins amputated and cone-sectioned; the gland is serially "
            "sectioned and entirely submitted."
        )
        for p_ in parts[1:]:
            p_.gross = (
                f'Labeled "pelvic lymph nodes" are two fragments of fibroadipose tissue, {r.randint(4, 7)}.0 x '
                f"{r.randint(2, 4)}.5 x 1.2 cm in aggregate. All lymph node candidates are submitted."
            )
        return Draft(
            "prostate",
            style,
            parts,
            history=self.hist("prostate", "resection") if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Radical prostatectomy",
            synoptic=syn,
            syn_labels=d_labels,
            syn_values=values,
            upper=r.random() < 0.5,
            kind="prostatectomy",
        )

    def turp(self, style: int) -> Draft:
        r = self.rng
        if r.random() < 0.6:
            f = F(
                [
                    "Benign nodular prostatic hyperplasia with chronic inflammation.",
                    "Negative for carcinoma.",
                ],
                "ben:p adc:a",
            )
        else:
            f = F(
                [
                    "Benign nodular hyperplasia.",
                    "Incidental prostatic adenocarcinoma, Gleason score 3+3=6 (Grade Group 1), involving <5% of the resected tissue (2 of 41 chips).",
                ],
                "ben:p adc:p",
                {"gleason_score": "3+3=6", "grade_group": "1"},
            )
        part = PartSpec(
            "Prostate", "transurethral resection (TURP)", f, gross_for("turp", "prostate chips", r)
        )
        return Draft(
            "prostate",
            style,
            [part],
            history=self.hist("prostate", "turp") if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            upper=r.random() < 0.5,
            kind="turp",
        )

    # ----------------------------------------------------------- cervix
    def cervix(self, style: int, kind: str) -> Draft:
        r = self.rng
        parts: list[PartSpec] = []
        syn: list[tuple[str, str]] = []
        if kind == "leep":
            f = pick(r, CERVIX_LEEP, style, self.used)
            parts.append(
                PartSpec(
                    "Cervix",
                    r.choice(["loop electrosurgical excision (LEEP)", "LEEP", "cold knife cone"]),
                    f,
                    gross_for("leep", "cervix LEEP, suture 12 o'clock", r),
                )
            )
            if r.random() < 0.6:
                fe = pick(r, CERVIX_ECC, style)
                parts.append(
                    PartSpec(
                        "Endocervix, post-excision",
                        "curettage",
                        fe,
                        gross_for("ecc", "post-excision ECC", r),
                    )
                )
            if style == 4:
                states = parse_labels("cervix", f.labels)
                highest = (
                    "Adenocarcinoma in situ"
                    if "adenocarcinoma_in_situ" in states
                    and states["adenocarcinoma_in_situ"] == "present"
                    else "HSIL (CIN 2-3)"
                    if states.get("hsil") == "present"
                    else "No dysplasia identified"
                )
                mv = dict(f.values).get("margin_status")
                syn = [
                    ("Specimen", "Cervix, loop excision, oriented (suture at 12 o'clock)"),
                    ("Highest-grade lesion", highest),
                    ("Invasive carcinoma", "Not identified"),
                    (
                        "Margins",
                        "Involved"
                        if mv == "involved"
                        else "Negative"
                        if mv == "negative"
                        else "Not applicable",
                    ),
                    ("p16 immunostain", r.choice(["Block-positive", "Not performed"])),
                ]
                syn_labels = "inv:a"
            else:
                syn_labels = ""
        else:
            n = r.choice([1, 2, 2, 3])
            sites = r.sample(CERVIX_SITES, n)
            tier = r.choices(list(CERVIX_TIERS), weights=[2, 3, 4, 1.5, 1.2, 0.6])[0]
            lead = [CERVIX_BIOPSY[i] for i in CERVIX_TIERS[tier]]
            for i, s in enumerate(sites):
                taken = [p.frag for p in parts]
                if i == 0:
                    f = pick(r, lead, style, self.used)
                else:
                    comp = r.choice(CERVIX_COMPANIONS[tier])
                    f = pick(
                        r,
                        [CERVIX_BIOPSY[j] for j in CERVIX_TIERS[comp]],
                        style,
                        self.used,
                        avoid=taken,
                    )
                parts.append(PartSpec(s, "biopsy", f))
            if r.random() < 0.6:
                ecc_pool = (
                    CERVIX_ECC
                    if tier not in ("benign", "low")
                    else [CERVIX_ECC[k] for k in (0, 1, 3, 4)]
                )
                parts.append(PartSpec("Endocervix", "curettage (ECC)", pick(r, ecc_pool, style)))
            for p in parts:
                p.gross = gross_for(
                    "ecc" if "curettage" in p.proc else "bx", f"{p.site.lower()} {p.proc}", r
                )
            syn_labels = ""
            if style == 4:
                dd = Draft("cervix", 1, parts)
                st, _ = gold_of(dd)
                order = [
                    ("squamous_cell_carcinoma", "Invasive squamous cell carcinoma"),
                    ("adenocarcinoma", "Invasive adenocarcinoma"),
                    ("adenocarcinoma_in_situ", "Adenocarcinoma in situ"),
                    ("hsil", "HSIL"),
                    ("lsil", "LSIL"),
                ]
                hi = next((txt for k, txt in order if st.get(k) == "present"), None)
                syn = [
                    (
                        "Specimens",
                        f"{len(parts)} (colposcopic biopsies"
                        + (" and ECC)" if any("curettage" in p.proc for p in parts) else ")"),
                    ),
                    ("Highest-grade lesion", hi or "See diagnosis"),
                    ("Transformation zone sampled", r.choice(["Yes", "Yes", "Not identified"])),
                ]
        return Draft(
            "cervix",
            style,
            parts,
            history=self.hist("cervix", "leep" if kind == "leep" else "biopsy")
            if style != 5
            else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Cervical specimen summary",
            synoptic=syn,
            syn_labels=syn_labels,
            upper=r.random() < 0.6,
            micro=r.random() < 0.5,
            kind=kind,
            british=style == 2 and r.random() < 0.5,
        )

    # ----------------------------------------------------------- duodenum
    def duodenum(self, style: int, kind: str) -> Draft:
        r = self.rng
        if style == 4:
            return self.duo_synoptic(kind)
        n = r.choice([1, 2, 2, 3])
        regions = sorted(r.sample(range(3), n)) if n > 1 else [1]
        sites = [r.choice(DUO_REGIONS[i]) for i in regions]
        frags: list[Frag] = []
        if kind == "normal":
            frags = [DUO_PARTS[r.choice(DUO_NORMALISH)] for _ in range(n)]
        else:
            groups = ["mild", "atrophy", "atrophy"] if kind == "celiac" else ["other", "normal"]
            group = r.choice(groups)
            pool = [DUO_PARTS[i] for i in DUO_GROUPS[group]]
            frags = [pick(r, pool, style, self.used)]
            for _ in range(n - 1):
                extra = [DUO_PARTS[i] for i in DUO_GROUPS[group] + DUO_GROUPS["other"][:1]]
                frags.append(frags[0] if r.random() < 0.4 else r.choice(extra))
        parts = [PartSpec(s, proc, f) for (s, proc), f in zip(sites, frags)]
        if r.random() < 0.35:
            gs, gp = r.choice(GASTRIC_SITES)
            parts.append(PartSpec(gs, gp, r.choice(GASTRIC_PARTS)))
        for p in parts:
            p.gross = gross_for("duo", f"{p.site.lower()} {p.proc}", r)
        return Draft(
            "duodenum",
            style,
            parts,
            history=self.hist("duodenum", "celiac" if kind != "other" else "other")
            if style != 5
            else "",
            notes=self.notes() if style != 5 else [],
            upper=r.random() < 0.5,
            micro=r.random() < 0.6,
            kind=kind,
            british=style == 2 and r.random() < 0.6,
        )

    def duo_synoptic(self, kind: str) -> Draft:
        r = self.rng
        grade = r.choice(["0", "1", "2", "3a", "3b", "3c"]) if kind != "normal" else "0"
        roman = {"0": "0", "1": "1", "2": "2", "3a": "3a", "3b": "3b", "3c": "3c"}
        iel = {"0": r.randint(8, 20), "1": r.randint(28, 45), "2": r.randint(30, 50)}.get(
            grade, r.randint(35, 70)
        )
        atrophy = {"3a": "Present, partial", "3b": "Present, subtotal", "3c": "Present, total"}.get(
            grade, "Absent"
        )
        crypts = "Hyperplastic" if grade in ("2", "3a", "3b", "3c") else "Normal"
        interp, ilab = {
            "0": (
                "Normal duodenal mucosa; no histological evidence of celiac disease",
                "nl:p cd:a",
            ),
            "1": (
                "Increased intraepithelial lymphocytes with normal villous architecture; celiac disease possible, correlate with serology",
                "cd:u",
            ),
            "2": ("Findings compatible with celiac disease; correlate with serology", "cd:l"),
        }.get(grade, ("Consistent with celiac disease", "cd:l"))
        labs = {
            "0": "va:a iel:a ch:a",
            "1": "va:a iel:p ch:a",
            "2": "va:a iel:p ch:p",
        }.get(grade, "va:p iel:p ch:p")
        syn = [
            ("Biopsy sites", "Duodenal bulb and second portion"),
            ("Number of fragments / well oriented", f"{r.randint(4, 8)} / {r.randint(2, 4)}"),
            ("Villous atrophy", atrophy),
            (
                "Intraepithelial lymphocytes",
                f"{iel} per 100 enterocytes ({'increased' if iel >= 25 else 'not increased'})",
            ),
            ("Crypt hyperplasia", "Present" if crypts == "Hyperplastic" else "Absent"),
            ("Modified Marsh (Oberhuber) type", roman[grade]),
            ("Interpretation", interp),
        ]
        f = F(f"See synoptic summary. {interp}.", "")
        parts = [
            PartSpec(
                "Duodenum, bulb and D2", "biopsies", f, gross_for("duo", "duodenum bulb and D2", r)
            )
        ]
        return Draft(
            "duodenum",
            4,
            parts,
            history=self.hist("duodenum", "celiac"),
            synoptic_title="Duodenal biopsy, celiac assessment",
            synoptic=syn,
            syn_labels=f"{labs} {ilab}",
            syn_values={"marsh_grade": grade},
            kind=kind,
            british=r.random() < 0.5,
        )

    # ----------------------------------------------------------- lung
    def lung(self, style: int, kind: str) -> Draft:
        r = self.rng
        if kind == "resection":
            return self.lung_resection(style)
        parts: list[PartSpec] = []
        if kind == "ebus":
            stations = r.sample(LUNG_STATIONS, r.choice([2, 3, 4]))
            positive = r.random() < 0.6
            pos_frag = r.choice(LUNG_NODE_POS)
            for i, st in enumerate(stations):
                if positive and i == 0:
                    f = pos_frag
                else:
                    f = r.choice(LUNG_NODE_NEG[:3]) if r.random() < 0.85 else LUNG_NODE_NEG[3]
                parts.append(
                    PartSpec(
                        f"Lymph node, station {st}",
                        r.choice(["EBUS-TBNA", "EBUS-guided FNA"]),
                        f,
                        gross_for("ebus", f"LN {st}", r),
                    )
                )
            hist = self.hist("lung", "ebus")
        else:
            s, proc = r.choice(LUNG_SMALL_SITES)
            f = pick(r, LUNG_SMALL, style, self.used)
            parts.append(
                PartSpec(
                    s, proc, f, gross_for("core" if "core" in proc else "bx", f"{s.lower()}", r)
                )
            )
            if r.random() < 0.3:
                st = r.choice(LUNG_STATIONS)
                nf = r.choice(LUNG_NODE_NEG[:3])
                parts.append(
                    PartSpec(
                        f"Lymph node, station {st}",
                        "EBUS-TBNA",
                        nf,
                        gross_for("ebus", f"LN {st}", r),
                    )
                )
            hist = self.hist("lung", "small")
        return Draft(
            "lung",
            style,
            parts,
            history=hist if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            upper=r.random() < 0.6,
            micro=r.random() < 0.5,
            kind=kind,
            british=style == 2 and r.random() < 0.5,
        )

    def lung_resection(self, style: int) -> Draft:
        r = self.rng
        lobe = r.choice(
            [
                "right upper lobe",
                "right lower lobe",
                "left upper lobe",
                "left lower lobe",
                "right middle lobe",
            ]
        )
        proc = r.choice(["lobectomy", "lobectomy", "wedge resection", "segmentectomy"])
        typ, lab = r.choice(
            [
                ("Invasive adenocarcinoma, acinar predominant", "adc:p"),
                ("Invasive adenocarcinoma, lepidic predominant", "adc:p"),
                ("Invasive adenocarcinoma, solid predominant", "adc:p"),
                ("Invasive mucinous adenocarcinoma", "adc:p"),
                ("Minimally invasive adenocarcinoma", "adc:p"),
                ("Squamous cell carcinoma, keratinizing", "scc:p"),
                ("Squamous cell carcinoma, non-keratinizing (p40 positive)", "scc:p"),
                ("Typical carcinoid tumor", "car:p"),
                ("Large cell neuroendocrine carcinoma", "lcc:p"),
            ]
        )
        mia = typ.startswith("Minimally")
        size = float(r.randint(9, 20) if mia else r.randint(8, 62))
        vpi = (not mia) and r.random() < 0.25
        pt = "T1mi" if mia else lung_pt(size, vpi)
        nodes_done = proc != "wedge resection" or r.random() < 0.3
        exam = r.randint(5, 16)
        pos = r.choice([0, 0, 0, 1, 2]) if nodes_done and not mia else 0
        pn = ("N1" if pos == 1 else "N2" if pos else "N0") if nodes_done else "NX"
        margin_inv = r.random() < 0.1
        lvi = r.random() < 0.3
        values = {
            "pt": f"p{pt}",
            "pn": f"p{pn}",
            "margin_status": "involved" if margin_inv else "negative",
            "tumor_size_mm": f"{size:.1f}",
            "lymphovascular_invasion": "present" if lvi else "absent",
        }
        if nodes_done:
            values["lymph_nodes_positive"] = str(pos)
            values["lymph_nodes_examined"] = str(exam)
        met = "met:p" if pos else ""
        site = f"Lung, {lobe}"
        parts: list[PartSpec] = []
        syn: list[tuple[str, str]] = []
        margin_txt = (
            "Carcinoma is present at the bronchial margin."
            if margin_inv
            else r.choice(
                [
                    "Bronchial, vascular and parenchymal margins negative.",
                    f"Margins free of tumor (closest: parenchymal/staple line, {r.randint(5, 30)} mm).",
                ]
            )
        )
        if style == 4:
            parts.append(PartSpec(site, proc, F(f"{typ} (see synoptic summary).", lab)))
            syn = [
                ("Procedure", proc.capitalize()),
                ("Tumor focality", "Single"),
                ("Histologic type", typ),
                (
                    "Tumor size",
                    f"{cm(size)} cm"
                    + (f" (invasive component {r.randint(2, 5)} mm)" if mia else ""),
                ),
                ("Visceral pleural invasion", "Present (PL1)" if vpi else "Not identified"),
                ("Lymphovascular invasion", "Present" if lvi else "Not identified"),
                ("Margins", "Involved (bronchial)" if margin_inv else "Negative for carcinoma"),
            ]
            if nodes_done:
                syn.append(
                    (
                        "Regional lymph nodes",
                        f"{pos}/{exam} involved by metastatic carcinoma (station 7)"
                        if pos
                        else f"0/{exam} involved",
                    )
                )
            syn.append(("Pathologic stage (AJCC 8th)", f"p{pt} p{pn}"))
        elif style in (3, 5):
            dx = [
                f"{typ}, {cm(size)} cm; VPI {'present' if vpi else 'absent'}; LVI {'present' if lvi else 'absent'}; margins {'POSITIVE (bronchial)' if margin_inv else 'neg'};",
                (
                    (f"LN {pos}/{exam} with metastatic carcinoma;" if pos else f"LN 0/{exam};")
                    if nodes_done
                    else "no LN submitted;"
                )
                + f" p{pt} p{pn}.",
            ]
            parts.append(PartSpec(site, proc, F(dx, lab + (" " + met if met else ""))))
        else:
            dx = [
                f"{typ}, {cm(size)} cm in greatest dimension.",
                "Visceral pleural invasion present (PL1; elastic stain)."
                if vpi
                else "No visceral pleural invasion (elastic stain).",
                "Lymphovascular invasion present."
                if lvi
                else "Lymphovascular invasion: not identified.",
                margin_txt,
            ]
            if nodes_done:
                dx.append(
                    f"Metastatic carcinoma in {words(pos)} of {words(exam)} lymph nodes ({pos}/{exam})."
                    if pos
                    else f"{words(exam).capitalize()} regional lymph nodes, no metastatic carcinoma (0/{exam})."
                )
            dx.append(f"pTNM (AJCC 8th): p{pt} p{pn}.")
            if nodes_done and not pos:
                met = "met:a"  # "no metastatic carcinoma" negates the label explicitly
            parts.append(PartSpec(site, proc, F(dx, lab + (" " + met if met else ""))))
        syn_labels = "met:p" if style == 4 and pos else ""
        parts[0].gross = (
            f'Received fresh, labeled "{lobe}", is a {proc} specimen, {r.randint(9, 18)}.0 x {r.randint(6, 11)}.0 x {r.randint(3, 6)}.0 cm. '
            f"Sectioning reveals a firm, tan-gray mass measuring {cm(size)} cm, {r.randint(2, 30)} mm from the pleura. "
            "The uninvolved parenchyma is spongy. Representative sections submitted."
        )
        return Draft(
            "lung",
            style,
            parts,
            history=self.hist("lung", "resection") if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Lung resection",
            synoptic=syn,
            syn_labels=syn_labels,
            syn_values=values,
            upper=r.random() < 0.5,
            kind="lobectomy",
            british=style == 2 and r.random() < 0.5,
        )

    # ----------------------------------------------------------- breast
    def breast(self, style: int, kind: str) -> Draft:
        r = self.rng
        if kind == "excision":
            return self.breast_excision(style)
        s, proc = r.choice(BREAST_CORE_SITES)
        syn: list[tuple[str, str]] = []
        syn_values: dict[str, str] = {}
        if kind == "invasive":
            typ, lab = r.choice(
                [
                    ("Invasive ductal carcinoma", "idc:p"),
                    ("Invasive carcinoma of no special type (ductal)", "idc:p"),
                    ("Invasive ductal carcinoma", "idc:p"),
                    ("Invasive lobular carcinoma, classic type", "ilc:p"),
                    ("Invasive carcinoma, favor lobular type (E-cadherin pending)", "ilc:l"),
                    (
                        "Invasive mammary carcinoma with mixed ductal and lobular features",
                        "idc:p ilc:p",
                    ),
                    ("Invasive ductal carcinomma", "idc:p"),
                ]
            )
            if style == 3 and r.random() < 0.6:  # ward shorthand
                typ, lab = r.choice([("IDC", "idc:p"), ("ILC, classic type", "ilc:p")])
            grade = r.choice([1, 2, 2, 3, 3])
            ng = nottingham_phrase(r, grade)
            dcis = r.random() < 0.4
            profile = r.choice(
                ["luminal", "luminal", "luminal_b", "her2", "her2_lum", "triple_neg"]
            )
            bio, vals = biomarker_lines(r, profile)
            dx = [f"{typ}, {ng}."]
            if dcis:
                dx.append(
                    r.choice(
                        [
                            "Ductal carcinoma in situ, intermediate nuclear grade, is also present.",
                            "Associated DCIS, high grade, solid type.",
                        ]
                    )
                )
                lab += " dcis:p"
            if style == 4:
                syn = [
                    ("Histologic type", typ),
                    ("Histologic grade", ng),
                    ("DCIS", "Present" if dcis else "Not identified"),
                    ("Lymphovascular invasion", "Not identified"),
                    ("Estrogen receptor", strip_marker(bio[0])),
                    ("Progesterone receptor", strip_marker(bio[1])),
                    ("HER2", strip_marker(bio[2])),
                    ("Ki-67", bio[3].rstrip(".").split(":")[-1].replace("Ki-67", "").strip()),
                ]
                syn_values = dict(vals)
                syn_values["lymphovascular_invasion"] = "absent"
                syn_values["nottingham_grade"] = str(grade)
                f = F(dx, lab)
            else:
                vdict = dict(vals)
                vdict["nottingham_grade"] = str(grade)
                dx = [*dx, "Biomarkers: " + " ".join(bio)] if style in (1, 2) else dx + bio
                f = F(dx, lab, vdict)
            parts = [PartSpec(s, proc, f, gross_for("core", f"{s.lower()}", r))]
            if r.random() < 0.3:
                parts.append(
                    PartSpec(
                        f"{s.split(',')[0]} axilla, lymph node",
                        "ultrasound-guided core biopsy",
                        r.choice(
                            [
                                F("Metastatic carcinoma, consistent with breast primary.", ""),
                                F("Lymph node tissue, negative for metastatic carcinoma.", ""),
                            ]
                        ),
                        gross_for("core", "axillary node", r),
                    )
                )
        elif kind == "dcis":
            f = pick(r, BREAST_DCIS, style, self.used)
            parts = [PartSpec(s, proc, f, gross_for("core", f"{s.lower()}", r))]
        else:
            f = pick(r, BREAST_BENIGN, style, self.used)
            parts = [PartSpec(s, proc, f, gross_for("core", f"{s.lower()}", r))]
            if r.random() < 0.25:
                s2, p2 = r.choice([x for x in BREAST_CORE_SITES if x[0] != s])
                parts.append(
                    PartSpec(
                        s2,
                        p2,
                        pick(r, BREAST_BENIGN, style, self.used, avoid=[f]),
                        gross_for("core", s2.lower(), r),
                    )
                )
                if not no_value_clash([p.frag for p in parts]):
                    parts.pop()
        if style == 4 and not syn:
            syn = [
                ("Specimen", "Breast core biopsy"),
                (
                    "Imaging-pathology correlation",
                    r.choice(["Concordant", "Concordant; calcifications present in cores"]),
                ),
            ]
        return Draft(
            "breast",
            style,
            parts,
            history=self.hist("breast", "core") if style != 5 else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Breast biopsy",
            synoptic=syn,
            # a checklist "DCIS: Not identified" negates DCIS explicitly
            syn_labels="dcis:a"
            if any(k == "DCIS" and v == "Not identified" for k, v in syn)
            else "",
            syn_values=syn_values,
            upper=r.random() < 0.5,
            micro=r.random() < 0.5,
            kind=kind,
            british=style == 2 and r.random() < 0.5,
        )

    def breast_excision(self, style: int) -> Draft:
        r = self.rng
        side = r.choice(["Left", "Right"])
        proc = r.choice(
            ["wide local excision", "lumpectomy", "partial mastectomy", "total mastectomy"]
        )
        neo = r.random() < 0.2
        y = "y" if neo else ""
        typ, lab = r.choice(
            [
                ("Invasive ductal carcinoma", "idc:p"),
                ("Invasive carcinoma of no special type", "idc:p"),
                ("Invasive lobular carcinoma", "ilc:p"),
                ("Invasive ductal carcinoma", "idc:p"),
            ]
        )
        size = float(r.randint(3, 9) if neo else r.randint(6, 38))
        grade = r.choice([1, 2, 2, 3])
        ng = nottingham_phrase(r, grade)
        dcis = r.random() < 0.5
        exam = r.randint(1, 4)
        pos = r.choice([0, 0, 0, 1])
        pos = min(pos, exam)
        margin_inv = r.random() < 0.12
        lvi = r.random() < 0.3
        bio_here = r.random() < 0.6
        profile = r.choice(["luminal", "luminal", "her2", "triple_neg", "luminal_b"])
        bio, bvals = biomarker_lines(r, profile)
        pt = f"{y}p{breast_pt(size)}"
        pn = f"{y}p{breast_pn(pos)}"
        values = {
            "pt": pt,
            "pn": pn,
            "lymph_nodes_positive": str(pos),
            "lymph_nodes_examined": str(exam),
            "margin_status": "involved" if margin_inv else "negative",
            "tumor_size_mm": f"{size:.1f}",
            "lymphovascular_invasion": "present" if lvi else "absent",
            "nottingham_grade": str(grade),
        }
        if bio_here:
            values.update(bvals)
        close = r.choice([1, 2, 3, 5, 8])
        labels = lab + (" dcis:p" if dcis else "")
        parts: list[PartSpec] = []
        syn: list[tuple[str, str]] = []
        node_part = PartSpec(
            f"{side} axilla, sentinel lymph node{'s' if exam > 1 else ''}",
            "excision",
            F(
                f"Metastatic carcinoma in {words(pos)} of {words(exam)} lymph node{'s' if exam > 1 else ''} ({pos}/{exam}), macrometastasis 4 mm."
                if pos
                else f"{words(exam).capitalize()} lymph node{'s' if exam > 1 else ''}, negative for metastatic carcinoma (0/{exam}).",
                "",
            ),
            gross_for("node", "sentinel node", r),
        )
        if style == 4:
            parts.append(
                PartSpec(f"{side} breast", proc, F(f"{typ}, {ng}; see synoptic summary.", labels))
            )
            syn = [
                ("Procedure", proc.capitalize()),
                ("Histologic type", typ),
                ("Histologic grade (Nottingham)", ng),
                (
                    "Tumor size",
                    f"{size:.0f} mm (invasive component)"
                    if not neo
                    else f"{size:.0f} mm residual invasive carcinoma",
                ),
                (
                    "Ductal carcinoma in situ",
                    "Present, intermediate grade, solid and cribriform"
                    if dcis
                    else "Not identified",
                ),
                ("Lymphovascular invasion", "Present" if lvi else "Not identified"),
                (
                    "Margins",
                    "Invasive carcinoma present at the anterior margin"
                    if margin_inv
                    else f"Negative; closest margin (posterior) {close} mm",
                ),
                ("Regional lymph nodes", f"{pos}/{exam} sentinel node(s) involved"),
            ]
            if bio_here:
                syn += [
                    ("ER", strip_marker(bio[0])),
                    ("PR", strip_marker(bio[1])),
                    ("HER2", strip_marker(bio[2])),
                ]
            else:
                syn += [("Biomarkers", "Performed on the core biopsy; see that report")]
            if neo:
                syn.append(
                    (
                        "Treatment effect",
                        "Present; partial response (residual cancer burden class II)",
                    )
                )
            syn.append(("Pathologic stage (AJCC 8th)", f"{pt} {pn}"))
            node_part.frag = F(node_part.frag.dx[0].split(" (")[0] + ".", "")
        else:
            dx = [
                f"{typ}, {ng}.",
                f"Invasive tumor size {cm(size)} cm"
                + (" (residual, post-treatment)." if neo else "."),
            ]
            if dcis:
                dx.append(
                    "Ductal carcinoma in situ, intermediate nuclear grade, cribriform type, admixed with the invasive tumor."
                )
            dx.append(
                "Invasive carcinoma extends to the inked anterior margin."
                if margin_inv
                else r.choice(
                    [
                        f"Margins negative; closest (posterior) margin {close} mm.",
                        f"All margins free of carcinoma (closest {close} mm, superior).",
                    ]
                )
            )
            dx.append(
                "Lymphovascular invasion present."
                if lvi
                else "No lymphovascular invasion identified."
            )
            if bio_here:
                dx.append(
                    ("Biomarkers (repeated on excision): " if style != 3 else "") + " ".join(bio)
                )
            dx.append(f"Stage: {pt} {pn}" + ("" if r.random() < 0.6 else " MX") + ".")
            parts.append(PartSpec(f"{side} breast", proc, F(dx, labels)))
        parts[0].gross = (
            f'Received fresh, labeled "{side.lower()} breast {proc}", is an oriented excision, {r.randint(5, 9)}.5 x {r.randint(4, 7)}.0 x {r.randint(2, 4)}.5 cm. '
            "Margins inked (superior blue, inferior green, anterior yellow, posterior black). Sectioning shows a firm, "
            f"stellate white mass, {cm(size)} cm, with a clip. Entirely submitted."
        )
        parts.append(node_part)
        return Draft(
            "breast",
            style,
            parts,
            history=(
                "Completed neoadjuvant chemotherapy. Surgery."
                if neo
                else r.choice(
                    [h for h in HISTORIES["breast"]["excision"] if "neoadjuvant" not in h]
                )
            )
            if style != 5
            else "",
            notes=self.notes() if style != 5 else [],
            synoptic_title="Invasive breast carcinoma resection",
            synoptic=syn,
            syn_labels="dcis:a" if syn and not dcis else "",
            syn_values=values,
            upper=r.random() < 0.5,
            kind="excision",
            british=style == 2 and r.random() < 0.5,
        )


def _pairs(f: Frag) -> set[tuple[str, str]]:
    return {(tok.split(":")[0], tok.split(":")[1]) for tok in f.labels.split()}


def gross_crc(r: random.Random, site: str, proc: str, size: float, size_txt: str) -> str:
    length = r.randint(18, 42)
    return (
        f'Received fresh, labeled "{proc}", is a segment of bowel, {length}.0 cm in length, with attached mesentery. '
        f"There is an ulcerated, fungating mass measuring {size_txt}, located {r.randint(3, 14)} cm from the nearest "
        "resection margin. The serosa overlying the mass is puckered. Representative sections of the tumour, margins "
        "and all identified lymph nodes are submitted."
    ).replace("tumour", "tumor")


# ---------------------------------------------------------------------------------------
# Case plan: how many of each kind and style per scheme (specials fill the rest to 40+)
# ---------------------------------------------------------------------------------------

# (kind, style) for generated cases; the mixture keeps every style >= 5 per scheme once the
# hand-written cases below are added.
PLAN: dict[str, list[tuple[str, int]]] = {
    "colorectal": (
        [("polyps", 1)] * 5
        + [("polyps", 2)] * 4
        + [("polyps", 3)] * 5
        + [("polyps", 5)] * 4
        + [("random", 1), ("random", 2), ("random", 3), ("random", 5)]
        + [("mass", 1), ("mass", 2), ("mass", 3)]
        + [("resection", 4)] * 5
        + [("resection", 1), ("resection", 2), ("resection", 3)]
    ),
    "prostate": (
        [("systematic", 1)] * 6
        + [("systematic", 2)] * 5
        + [("systematic", 3)] * 5
        + [("systematic", 4)] * 4
        + [("targets", 3), ("targets", 5), ("targets", 5), ("targets", 2), ("targets", 4)]
        + [("systematic", 5)]
        + [("prostatectomy", 4)] * 3
        + [("prostatectomy", 1), ("prostatectomy", 2)]
        + [("turp", 1), ("turp", 5), ("turp", 3)]
    ),
    "cervix": (
        [("biopsy", 1)] * 7
        + [("biopsy", 2)] * 6
        + [("biopsy", 3)] * 6
        + [("biopsy", 5)] * 4
        + [("biopsy", 4)] * 2
        + [("leep", 4)] * 4
        + [("leep", 1), ("leep", 2), ("leep", 3), ("leep", 2), ("biopsy", 5)]
    ),
    "duodenum": (
        [("celiac", 1)] * 6
        + [("celiac", 2)] * 6
        + [("celiac", 3)] * 5
        + [("celiac", 5)] * 4
        + [("celiac", 4)] * 4
        + [("normal", 1), ("normal", 2), ("normal", 3), ("normal", 4)]
        + [("other", 1), ("other", 2), ("other", 3), ("celiac", 5), ("celiac", 3)]
    ),
    "lung": (
        [("small", 1)] * 4
        + [("small", 2)] * 4
        + [("small", 3)] * 4
        + [("small", 5)] * 3
        + [
            ("ebus", 1),
            ("ebus", 2),
            ("ebus", 3),
            ("ebus", 4),
            ("ebus", 2),
            ("small", 5),
            ("small", 1),
        ]
        + [("resection", 3)]
        + [("resection", 4)] * 6
        + [("resection", 1), ("resection", 2), ("resection", 2), ("resection", 3), ("resection", 5)]
    ),
    "breast": (
        [("invasive", 1)] * 3
        + [("invasive", 2)] * 3
        + [("invasive", 3)] * 2
        + [("invasive", 4)] * 3
        + [("invasive", 5)]
        + [("benign", 1)] * 3
        + [("benign", 2)] * 2
        + [("benign", 3)] * 2
        + [("benign", 5)] * 3
        + [("dcis", 1), ("dcis", 3), ("dcis", 2), ("benign", 4)]
        + [("excision", 4)] * 5
        + [("excision", 1), ("excision", 2), ("excision", 3)]
    ),
}


# ---------------------------------------------------------------------------------------
# Hand-written cases (addenda, amendments, awkward hedges).  ``{id}`` is the accession.
# ---------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Special:
    scheme: str
    style: int
    text: str
    labels: str
    values: Mapping[str, str] = field(default_factory=dict)
    kind: str = "special"


SPECIALS: list[Special] = [
    # ------------------------------------------------------------------ colorectal
    Special(
        "colorectal",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT - AMENDED

ACCESSION #: {id}      COLLECTED: 01/13/2026      RECEIVED: 01/13/2026
PATIENT: PELLOW, GRETA A.      AGE/SEX: 61/F      MRN: 4471092
SUBMITTING PHYSICIAN: TOBIAS WREN, MD

CLINICAL HISTORY:
SURVEILLANCE COLONOSCOPY. HISTORY OF SESSILE SERRATED LESIONS (2022). 12 MM FLAT POLYP IN THE ASCENDING COLON; 5 MM SIGMOID POLYP.

GROSS DESCRIPTION:
A. Received in formalin labeled "ascending colon polyp, cold snare" are three tan-pink fragments, 0.3 to 0.9 cm. Entirely submitted in A1-A2.
B. Received in formalin labeled "sigmoid polyp" is a single polypoid fragment, 0.4 cm. Bisected and entirely submitted in B1.

FINAL DIAGNOSIS:
A. ASCENDING COLON, COLD SNARE POLYPECTOMY:
   - HYPERPLASTIC POLYP.
B. SIGMOID COLON, POLYPECTOMY:
   - TUBULAR ADENOMA.

AMENDED DIAGNOSIS (01/21/2026):
A. ASCENDING COLON, COLD SNARE POLYPECTOMY:
   - SESSILE SERRATED LESION.
   - DEEPER LEVELS SHOW SEVERAL CRYPTS WITH BASAL DILATATION AND HORIZONTAL GROWTH ALONG THE MUSCULARIS MUCOSAE; THIS IS NOT A HYPERPLASTIC POLYP AS ORIGINALLY REPORTED.
B. UNCHANGED.
REASON FOR AMENDMENT: CHANGE IN DIAGNOSIS AFTER REVIEW AT THE GASTROINTESTINAL PATHOLOGY CONSENSUS CONFERENCE. DR. WREN NOTIFIED BY TELEPHONE ON 01/21/2026.

ORIGINAL REPORT SIGNED OUT BY CASIMIR ODUYA, MD, ON 01/15/2026
AMENDMENT SIGNED OUT BY IMOGEN VALE, MD, ON 01/21/2026
""",
        "ssl:p hp:a lgd:l",
    ),
    Special(
        "colorectal",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 4 February 2026    Report date: 6 February 2026
Patient: Bram Tessaro (67 y, M)    Hospital no.: 6620418
Requesting clinician: Dr Elspeth Mowbray

Clinical information:
Bowel cancer screening programme, FIT positive. 22 mm pedunculated polyp in the sigmoid colon removed by hot snare.

Macroscopic description:
Labelled "sigmoid polyp 22 mm". A pedunculated polyp, head 20 x 16 x 12 mm, with a 6 mm stalk. The stalk margin is inked. Bisected through the stalk and entirely embedded in three cassettes.

Microscopy:
The polyp has a tubulovillous architecture. In the head there is an area of marked architectural complexity with cribriform glands, loss of polarity and nuclear pleomorphism. The stalk contains submucosa with prominent vessels.

Diagnosis:
Sigmoid colon, hot snare polypectomy: Tubulovillous adenoma with high-grade dysplasia; see comment.

Comment:
Levels have been requested to assess the stalk; a supplementary report will follow.

Reported by: Dr Rosalind Ferrante, Consultant Histopathologist

SUPPLEMENTARY REPORT (10 February 2026):
Further levels show a small focus of invasive adenocarcinoma, moderately differentiated, infiltrating the submucosa of the polyp head (Haggitt level 2), maximum depth of invasion 1.2 mm. No lymphovascular invasion is seen. The cauterised stalk margin is clear (1.5 mm).
Revised diagnosis: Adenocarcinoma arising in a tubulovillous adenoma with high-grade dysplasia. Discussed at the colorectal MDT.
""",
        "adc:p hgd:p",
        {"lymphovascular_invasion": "absent", "margin_status": "negative"},
    ),
    Special(
        "colorectal",
        3,
        """
{id}  LRPA  CORVELL, D.  58M  COLL 2026-03-02  DR T. WREN
HX: Screening. Fam hx colon ca (father, 52). 4 polyps removed.
GROSS: A. 3 fragments 0.2-0.5 cm, AE. B. 2 polyps 0.4 and 0.6 cm, AE. C. 1 fragment 0.3 cm, AE. D. Polyp 1.4 x 1.1 x 0.8 cm, stalk inked, bisected, AE.
DIAGNOSIS: A. Cecum, cold snare: SSA/P, no cytologic dysplsia. B. Transverse colon, polypectomy x2: TA x2. C. Rectum, bx: HP. D. Sigmoid, hot snare: tubulovilous adenoma w/ focal HGD; neg for invasive ca. Stalk margin clear.
IV 2026-03-04
""",
        "ssl:p lgd:l hgd:p hp:p adc:a",
        {"margin_status": "negative"},
    ),
    Special(
        "colorectal",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 19 May 2026    Report date: 22 May 2026
Patient: Ottilie Marwick (49 y, F)    Hospital no.: 3381046
Requesting clinician: Dr Elspeth Mowbray

Clinical details:
Long-standing extensive ulcerative colitis (18 years), in clinical remission. Dysplasia surveillance with dye-spray chromoendoscopy. Family history of colorectal cancer.

Specimens: 1) Caecum and ascending colon, random biopsies; 2) Transverse colon, random biopsies; 3) Descending colon, random biopsies; 4) Sigmoid colon, 8 mm raised lesion, biopsies; 5) Rectum, random biopsies

Macroscopic description:
1-3) and 5) Each pot contains four to six mucosal fragments, 2-4 mm, all embedded. 4) Three fragments, up to 5 mm, all embedded.

Microscopy:
Parts 1-3 and 5 show mild architectural distortion with crypt branching and a patchy lymphoplasmacytic infiltrate; there is no active cryptitis. Part 4 shows a well-circumscribed area of crowded tubules lined by enlarged, hyperchromatic, pencillate nuclei extending to the surface. One poorly oriented fragment shows more complex glands.

Diagnosis:
1), 2), 3) and 5) Colon and rectum, random biopsies: Chronic quiescent colitis, consistent with ulcerative colitis. No dysplasia.
4) Sigmoid colon, raised lesion, biopsies: Low-grade dysplasia (adenoma-like lesion). High-grade dysplasia cannot be excluded in one tangentially cut fragment.

Comment:
Endoscopic resection of the sigmoid lesion is suggested, with a tattoo for later surveillance.

Reported by: Dr Saoirse Kilbride, Consultant Histopathologist
""",
        "lgd:p hgd:u",
    ),
    Special(
        "colorectal",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 06/08/2026      RECEIVED: 06/08/2026
PATIENT: DUNMORE, FELIX      AGE/SEX: 57/M      MRN: 8824051
SUBMITTING PHYSICIAN: GIDEON TARRANT, MD

CLINICAL HISTORY:
RECTAL ADENOCARCINOMA (BIOPSY LRP-25-011873, MODERATELY DIFFERENTIATED), STATUS POST NEOADJUVANT CHEMORADIATION. LOW ANTERIOR RESECTION.

GROSS DESCRIPTION:
Received fresh is a segment of rectosigmoid, 21.0 cm, with mesorectum (complete, grade 3 quality). At 6 cm from the distal margin there is a 2.1 x 1.5 cm puckered scar with superficial ulceration; no mass is seen. The scar and the surrounding mesorectum are entirely submitted; all lymph nodes are submitted.

FINAL DIAGNOSIS:
RECTUM AND SIGMOID COLON, LOW ANTERIOR RESECTION:
   - NO RESIDUAL CARCINOMA IDENTIFIED; COMPLETE PATHOLOGIC RESPONSE (TUMOR REGRESSION SCORE 0).
   - AREA OF MUCOSAL ULCERATION AND SUBMUCOSAL FIBROSIS WITH ACELLULAR MUCIN POOLS AT THE TREATED TUMOR BED.
   - FOURTEEN LYMPH NODES, NEGATIVE FOR METASTATIC CARCINOMA (0/14).
   - PROXIMAL, DISTAL AND RADIAL MARGINS NEGATIVE.
   - ypT0 ypN0.

COMMENT:
The entire scar has been examined histologically (blocks A5-A19).

ELECTRONICALLY SIGNED OUT BY ANSELM BRIGHTWATER, MD, ON 06/12/2026 09:18
""",
        "adc:a",
        {
            "pt": "ypT0",
            "pn": "ypN0",
            "lymph_nodes_positive": "0",
            "lymph_nodes_examined": "14",
            "margin_status": "negative",
        },
    ),
    Special(
        "colorectal",
        5,
        """
Rectosigmoid junction, biopsy of ulcerated mass: atypical glands within inflamed granulation tissue, suspicious for invasive adenocarcinoma. Repeat biopsy with deeper sampling is recommended.
""",
        "adc:u",
    ),
    Special(
        "colorectal",
        2,
        """
Larkspur Ridge Pathology Associates - Surgical Pathology Report
Case number: {id}    Specimen date: 07/15/2026    Report date: 07/16/2026
Patient: Constance Yardley (74 y, F)    MRN: 1189347
Requesting clinician: Dr. Priya Okonkwo

Clinical history:
History of adenocarcinoma of the colon (right hemicolectomy 2021). Chronic watery diarrhea for 4 months; rule out microscopic colitis. Colonoscopy: normal mucosa, no polyps.

Specimens: 1) Right colon (near anastomosis), random biopsies; 2) Left colon, random biopsies

Gross description:
1) Labeled "right colon random": five tan fragments, 0.2-0.4 cm, entirely submitted.
2) Labeled "left colon random": six tan fragments, 0.2-0.3 cm, entirely submitted.

Microscopic description:
Both parts show intact surface epithelium, a normal subepithelial collagen layer and no increase in intraepithelial lymphocytes. Crypt architecture is regular.

Diagnosis:
1) Right colon, random biopsies:
    Colonic mucosa with no significant histopathologic abnormality.
2) Left colon, random biopsies:
    Unremarkable colonic mucosa.
    No evidence of microscopic colitis.

Reported by: Dr. Wendell Achterberg, Pathologist
""",
        "nl:p",
    ),
    Special(
        "colorectal",
        3,
        """
{id}  LRPA  AMADI, R.  72F  COLL 2026-08-18  DR P. OKONKWO
HX: Surveillance; prior TVA (2023). 18 mm flat rectal lesion, EMR.
GROSS: A. EMR specimen 1.8 x 1.5 x 0.4 cm, pinned, deep margin inked, serially sectioned, AE. B. 2 fragments 0.3 cm, AE.
DIAGNOSIS: A. Rectum, EMR: tubulovillous adenoma with low-grade dysplasia; deep and lateral margins free of adenoma. B. Sigmoid, cold snare: hyperplastic polyp.
ADDENDUM 2026-08-24: Deeper levels of A show a 2 mm focus of high-grade dysplasia at the surface; no invasive carcinoma. Margins unchanged (free).
NH 2026-08-24
""",
        "lgd:p hgd:p hp:p adc:a",
        {"margin_status": "negative"},
    ),
    # ------------------------------------------------------------------ prostate
    Special(
        "prostate",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 03/02/2026      RECEIVED: 03/03/2026
PATIENT: OSTRANDER, MAGNUS      AGE/SEX: 66/M      MRN: 5518320
SUBMITTING PHYSICIAN: HALVARD STROUD, MD

CLINICAL HISTORY:
PSA 8.7 NG/ML, PI-RADS 4 LESION IN THE RIGHT MID PERIPHERAL ZONE. SYSTEMATIC 12-CORE BIOPSY.

GROSS DESCRIPTION:
Received are twelve containers, A through L, each labeled with the patient's name and site and each containing one tan-white needle core, 1.0 to 1.7 cm in length. Each core is entirely submitted in a separate cassette.

FINAL DIAGNOSIS:
A. PROSTATE, RIGHT BASE, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.
B. PROSTATE, RIGHT MID, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.
C. PROSTATE, RIGHT LATERAL MID, NEEDLE BIOPSY:
   - PROSTATIC ADENOCARCINOMA, GLEASON SCORE 3+4=7 (GRADE GROUP 2), INVOLVING 30% OF THE CORE (4 MM).
   - PERINEURAL INVASION PRESENT.
D. PROSTATE, RIGHT APEX, NEEDLE BIOPSY:
   - PROSTATIC ADENOCARCINOMA, GLEASON SCORE 3+3=6 (GRADE GROUP 1), INVOLVING 10% OF THE CORE.
E. PROSTATE, RIGHT LATERAL BASE, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE WITH PARTIAL ATROPHY.
F. PROSTATE, RIGHT LATERAL APEX, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.
G. PROSTATE, LEFT BASE, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.
H. PROSTATE, LEFT MID, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.
I. PROSTATE, LEFT APEX, NEEDLE BIOPSY:
   - HIGH-GRADE PROSTATIC INTRAEPITHELIAL NEOPLASIA, FOCAL.
J. PROSTATE, LEFT LATERAL BASE, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.
K. PROSTATE, LEFT LATERAL MID, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE WITH CHRONIC INFLAMMATION.
L. PROSTATE, LEFT LATERAL APEX, NEEDLE BIOPSY:
   - BENIGN PROSTATIC TISSUE.

ELECTRONICALLY SIGNED OUT BY PETRA LINDQVIST, MD, ON 03/05/2026 15:12

AMENDED REPORT (03/12/2026)
REASON: CHANGE IN GRADE AFTER INTRADEPARTMENTAL REVIEW FOR THE MULTIDISCIPLINARY CONFERENCE.
C. PROSTATE, RIGHT LATERAL MID, NEEDLE BIOPSY:
   - PROSTATIC ADENOCARCINOMA, GLEASON SCORE 4+3=7 (GRADE GROUP 3), INVOLVING 30% OF THE CORE (4 MM). POORLY FORMED AND FUSED GLANDS (PATTERN 4) MAKE UP APPROXIMATELY 60% OF THE TUMOR.
THE HIGHEST GRADE IN THIS BIOPSY SET IS THEREFORE GRADE GROUP 3. DR. STROUD NOTIFIED ON 03/12/2026.
AMENDMENT SIGNED OUT BY ANSELM BRIGHTWATER, MD
""",
        "adc:p pin:p ben:p",
        {"gleason_score": "4+3=7", "grade_group": "3"},
    ),
    Special(
        "prostate",
        2,
        """
Larkspur Ridge Pathology Associates - Surgical Pathology Report
Case number: {id}    Specimen date: 04/14/2026    Report date: 04/16/2026
Patient: Emil Varga (71 y, M)    MRN: 3092274
Requesting clinician: Dr. Mireille Dufresne

Clinical history:
PSA 5.9 ng/mL; free PSA 11%. Sextant biopsy.

Specimens: 1) Right base; 2) Right mid; 3) Right apex; 4) Left base; 5) Left mid; 6) Left apex

Gross description:
Six containers, each with two tan needle cores (1.1 to 1.6 cm), entirely submitted, one cassette per container.

Diagnosis:
1) Prostate, right base, needle biopsies: Benign prostatic tissue.
2) Prostate, right mid, needle biopsies: Benign prostatic tissue.
3) Prostate, right apex, needle biopsies: Benign prostatic tissue with mild chronic inflammation.
4) Prostate, left base, needle biopsies: Atypical small acinar proliferation (ASAP); see comment.
5) Prostate, left mid, needle biopsies: Benign prostatic tissue.
6) Prostate, left apex, needle biopsies: Benign prostatic tissue.

Comment:
Part 4 contains a small cluster of glands with enlarged nuclei and occasional nucleoli. Immunohistochemistry has been requested and an addendum will follow.

Reported by: Dr. Noor Haddad, Pathologist

ADDENDUM (04/20/2026):
Immunohistochemistry on part 4 (p63, CK5/6 and AMACR): basal cells are present around the glands in question and AMACR is negative.
Revised diagnosis, part 4: Benign prostatic tissue with partial atrophy. No atypical glands or carcinoma.
Addendum reported by: Dr. Noor Haddad
""",
        "aty:a adc:a ben:p",
    ),
    Special(
        "prostate",
        3,
        """
{id}  LRPA  WEXLEY, S.  69M  COLL 2026-05-07  DR H. STROUD
HX: Active surveillance for adenocarcinoma, Gleason 3+3=6 (GG1), left mid, dx 2024. PSA 5.1 -> 7.9 ng/mL. MRI PI-RADS 3, L PZ.
GROSS: 1-6. Each two cores, 0.9-1.6 cm, AE.
DIAGNOSIS: 1. L mid (MRI target), bx: benign prostatic tissue w/ chronic inflammation. 2. L base, bx: benign. 3. L apex, bx: HGPIN, focal; no ca. 4. R base, bx: benign prostatic tissue. 5. R mid, bx: benign. 6. R apex, bx: benign prostatic tissue w/ partial atrophy.
NOTE: No carcinoma identified in this sampling. Sampling variation is a recognised limitation; continued surveillance per urology.
AB 2026-05-09
""",
        "ben:p pin:p adc:a",
    ),
    Special(
        "prostate",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 9 June 2026    Report date: 15 June 2026
Patient: Cormac Birkett (63 y, M)    Hospital no.: 7720915
Requesting clinician: Dr Osric Pennington

Clinical details:
Adenocarcinoma on biopsy (Gleason 3+4=7, Grade Group 2; LRP-25-020417). Robotic radical prostatectomy and extended pelvic lymph node dissection.

Macroscopic description:
A) Prostate: 48 g, 5.1 x 4.4 x 3.9 cm, with attached seminal vesicles. Inked (right green, left blue). Apex and base amputated and cone-sectioned; remainder sliced at 4 mm and entirely embedded. A firm yellow area is noted in the right posterior peripheral zone, 2.3 cm.
B) Right pelvic lymph nodes: fibrofatty tissue, 6.0 x 3.5 x 1.5 cm, with five candidate nodes.
C) Left pelvic lymph nodes: fibrofatty tissue, 5.5 x 3.0 x 1.2 cm, with four candidate nodes.

Microscopy:
The tumour is an acinar adenocarcinoma composed predominantly of poorly formed and fused glands with a minor component of well-formed glands and a small focus (<5%) of single cells. It extends beyond the prostatic capsule into periprostatic fat at the right posterolateral aspect (focal, 1 mm). The seminal vesicles are free of tumour.

Diagnosis:
A) Prostate and seminal vesicles, radical prostatectomy:
    Acinar adenocarcinoma, Gleason 7 (4+3) with tertiary pattern 5 (<5%); ISUP Grade Group 3.
    Dominant nodule, right posterior, 2.3 cm.
    Focal extraprostatic extension (right posterolateral); seminal vesicles not involved.
    Tumour reaches the inked margin at the right posterolateral aspect over 2 mm (pattern 4).
    No lymphovascular invasion.
    High-grade PIN present.
B) and C) Pelvic lymph nodes, right and left, dissection:
    Nine lymph nodes (5 right, 4 left), all free of metastatic carcinoma (0/9).

pTNM (AJCC 8th edition): pT3a pN0

Reported by: Dr Saoirse Kilbride, Consultant Histopathologist
""",
        "adc:p pin:p",
        {
            "gleason_score": "4+3=7",
            "grade_group": "3",
            "pt": "pT3a",
            "pn": "pN0",
            "lymph_nodes_positive": "0",
            "lymph_nodes_examined": "9",
            "margin_status": "involved",
            "lymphovascular_invasion": "absent",
            "tumor_size_mm": "23.0",
        },
    ),
    Special(
        "prostate",
        5,
        """
Prostate needle biopsies, 12 sites: right apex core with adenocarcnoma, Gleason 4+4=8 (GG4), 70% of core; the remaining eleven cores show benign prostatic tissue.
""",
        "adc:p ben:p",
        {"gleason_score": "4+4=8", "grade_group": "4"},
    ),
    Special(
        "prostate",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 10/06/2026      RECEIVED: 10/06/2026
PATIENT: HOLTBY, AMBROSE      AGE/SEX: 77/M      MRN: 6613002
SUBMITTING PHYSICIAN: OSRIC PENNINGTON, MD

CLINICAL HISTORY:
URINARY RETENTION. PSA 3.2. TURP.

GROSS DESCRIPTION:
Received in formalin are multiple tan-white rubbery chips weighing 18 g in aggregate. Entirely submitted in fourteen cassettes.

FINAL DIAGNOSIS:
PROSTATE, TRANSURETHRAL RESECTION (18 GRAMS):
   - BENIGN NODULAR HYPERPLASIA WITH FOCAL INFARCTION.
   - A SMALL CLUSTER OF CROWDED GLANDS IS MOST LIKELY ADENOSIS; CARCINOMA IS UNLIKELY (BASAL CELLS PRESENT ON p63/CK5/6 STAINING).

ELECTRONICALLY SIGNED OUT BY CASIMIR ODUYA, MD, ON 10/09/2026 11:52
""",
        "ben:p adc:ul",
    ),
    Special(
        "prostate",
        2,
        """
Larkspur Ridge Pathology Associates - Surgical Pathology Report
Case number: {id}    Specimen date: 08/11/2026    Report date: 08/13/2026
Patient: Ugo Leclair (59 y, M)    MRN: 2290474
Requesting clinician: Dr. Halvard Stroud

Clinical history:
PSA 4.6 ng/mL; MRI PI-RADS 4 lesion, right apex. Targeted and systematic biopsies.

Specimens: 1) MRI target, right apex; 2) Right, systematic; 3) Left, systematic

Gross description:
1) "MRI target, right apex": three cores, 0.8 to 1.5 cm, entirely submitted.
2) "Right, systematic": six cores, up to 1.7 cm, entirely submitted.
3) "Left, systematic": six cores, up to 1.6 cm, entirely submitted.

Diagnosis:
1) Prostate, MRI target (right apex), needle biopsies: Benign prostatic tissue with stromal hyperplasia; negative for carcinoma. See comment.
2) Prostate, right systematic, needle biopsies: Benign prostatic tissue.
3) Prostate, left systematic, needle biopsies: Benign prostatic tissue with focal high-grade PIN.

Comment:
Part 1 does not account for the imaging finding; deeper levels have been requested.

Reported by: Dr. Wendell Achterberg, Pathologist

Addendum (08/18/2026):
Deeper levels of part 1 show a small focus of prostatic adenocarcinoma, Gleason score 3+4=7 (Grade Group 2), pattern 4 approximately 10%, involving 15% of one core.
Revised diagnosis, part 1: Prostatic adenocarcinoma, Gleason score 3+4=7 (Grade Group 2).
""",
        "adc:p ben:p pin:p",
        {"gleason_score": "3+4=7", "grade_group": "2"},
    ),
    # ------------------------------------------------------------------ cervix
    Special(
        "cervix",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 02/09/2026      RECEIVED: 02/10/2026
PATIENT: JESSOP, TAMSIN R.      AGE/SEX: 34/F      MRN: 6203318
SUBMITTING PHYSICIAN: BEATRIX OLUMIDE, MD

CLINICAL HISTORY:
PAP ASC-H, HPV 16 POSITIVE. COLPOSCOPY: DENSE ACETOWHITE LESION AT 12 O'CLOCK.

GROSS DESCRIPTION:
A. Labeled "cervix 12 o'clock": two tan fragments, 0.3 and 0.4 cm, entirely submitted.
B. Labeled "ECC": 2 mL of mucoid material with scant tissue, filtered and entirely submitted.

FINAL DIAGNOSIS:
A. CERVIX, 12 O'CLOCK, BIOPSY:
   - SQUAMOUS INTRAEPITHELIAL LESION; GRADE TO BE DETERMINED BY p16 IMMUNOSTAIN (SEE ADDENDUM).
B. ENDOCERVIX, CURETTAGE:
   - BENIGN ENDOCERVICAL MUCOSA; NO DYSPLASIA.

COMMENT:
The lesion in part A shows atypia extending into the middle third of the epithelium in a tangentially sectioned fragment. A p16 immunostain has been ordered.

ELECTRONICALLY SIGNED OUT BY ROSALIND FERRANTE, MD, ON 02/12/2026 10:41

ADDENDUM (02/16/2026):
p16 IMMUNOSTAIN ON BLOCK A1 SHOWS STRONG, DIFFUSE (BLOCK-TYPE) STAINING INVOLVING THE LOWER TWO-THIRDS OF THE EPITHELIUM.
FINAL DIAGNOSIS, PART A: HIGH-GRADE SQUAMOUS INTRAEPITHELIAL LESION (HSIL; CIN 2).
""",
        "hsil:p lsil:a ben:p",
    ),
    Special(
        "cervix",
        4,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES | SYNOPTIC SURGICAL PATHOLOGY REPORT
Accession No.: {id}
Procedure date: 2026-07-21    Sign-out: 2026-07-24
Patient: Okafor, Delphine, 41 F    Surgeon/clinician: Lena Castellanos

Clinical history:
HSIL (CIN 3) on biopsy; colposcopy suspicious for early invasion. LEEP.

Gross description:
Loop excision specimen, 2.6 x 2.2 x 1.1 cm, suture at 12 o'clock; endocervical margin inked black, deep margin green. Serially sectioned into 11 radial slices, entirely submitted.

FINAL DIAGNOSIS:
Cervix, LEEP: Squamous cell carcinoma, superficially invasive, arising in HSIL (CIN 3); see synoptic summary.

SYNOPTIC SUMMARY - CERVIX, EXCISION
Histologic type: Squamous cell carcinoma, HPV-associated
Depth of stromal invasion: 1.8 mm
Horizontal extent: 4 mm
Tumor size (greatest dimension): 4 mm
Lymphovascular space invasion: Not identified
Associated lesion: HSIL (CIN 3), with gland involvement
Margins: Negative for invasive carcinoma and HSIL; closest (endocervical) 1.5 mm
Pathologic stage (AJCC 8th): pT1a1 (FIGO 2018 IA1)

Pathologist: Wendell Achterberg, MD (electronically signed 2026-07-24)
""",
        "scc:p hsil:p",
        {
            "tumor_size_mm": "4.0",
            "lymphovascular_invasion": "absent",
            "margin_status": "negative",
            "pt": "pT1a1",
        },
    ),
    Special(
        "cervix",
        3,
        """
{id}  LRPA  VICKERY, F.  26F  COLL 2026-04-22  DR B. OLUMIDE
HX: Pap HSIL, HPV16+. Colpo: acetowhite 3 & 9 o'clock, r/o CIN 2-3.
GROSS: A. 2 fragments 0.2-0.3 cm, AE. B. 1 fragment 0.4 cm, AE. C. Scant mucoid material, AE.
DIAGNOSIS: A. Cervix 3 o'clock, bx: LSIL (CIN 1) w/ koilocytes. B. Cervix 9 o'clock, bx: LSIL; cannot exclude focal HSIL (tangential sectioning, p16 equivocal). C. ECC: neg for dysplasia, scant.
NOTE: Cytology-histology discordance; review of the Pap and close follow-up or excision per guidelines.
RF 2026-04-24
""",
        "lsil:p hsil:u",
    ),
    Special(
        "cervix",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 18 March 2026    Report date: 23 March 2026
Patient: Ingrid Thornbury (38 y, F)    Hospital no.: 4417260
Requesting clinician: Dr Honor Fairlie

Clinical details:
Atypical glandular cells on cytology; HPV 18 positive. Cold knife cone biopsy.

Macroscopic description:
Cone biopsy, 2.8 x 2.5 x 1.9 cm, suture at 12 o'clock. Endocervical margin inked black, deep margin green. Sliced radially into 12 blocks, all embedded.

Diagnosis:
Cervix, cold knife cone biopsy:
    Adenocarcinoma in situ (AIS), HPV-associated, involving 5 of 12 blocks.
    No invasive adenocarcinoma identified.
    Margins clear of AIS (closest: endocervical, 3 mm).

Reported by: Dr Petra Lindqvist, Consultant Histopathologist

AMENDED DIAGNOSIS (27 March 2026):
Further levels from block 7 show a small focus of invasive endocervical adenocarcinoma, usual type, arising in AIS: depth of invasion 2.5 mm, horizontal extent 5 mm. Lymphovascular space invasion is not identified. Margins remain clear of invasive and in situ disease (closest: endocervical, 3 mm).
Amended diagnosis: Invasive endocervical adenocarcinoma, usual (HPV-associated) type, arising in adenocarcinoma in situ; pT1a1 (FIGO 2018 IA1).
""",
        "adc:p ais:p",
        {
            "lymphovascular_invasion": "absent",
            "margin_status": "negative",
            "pt": "pT1a1",
            "tumor_size_mm": "5.0",
        },
    ),
    Special(
        "cervix",
        5,
        """
Cervical biopsy, 6 o'clock: HSIL (CIN 3) extending into endocervical glands; negative for invasive carcinoma.
""",
        "hsil:p inv:a",
    ),
    Special(
        "cervix",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY CONSULTATION REPORT

ACCESSION #: {id}      COLLECTED: 09/29/2026      RECEIVED: 09/30/2026
PATIENT: SANDOVAL, MARISOL      AGE/SEX: 52/F      MRN: 9021755
SUBMITTING PHYSICIAN: LENA CASTELLANOS, MD

CLINICAL HISTORY:
POSTMENOPAUSAL BLEEDING. EXOPHYTIC CERVICAL MASS, 3 CM. NO PRIOR SCREENING.

GROSS DESCRIPTION:
Labeled "cervical mass": four friable tan-red fragments, 0.4 to 1.1 cm in aggregate. Entirely submitted.

FINAL DIAGNOSIS:
CERVIX, MASS AT 3-6 O'CLOCK, BIOPSY:
   - INVASIVE CARCINOMA, POORLY DIFFERENTIATED, FAVOR SQUAMOUS CELL CARCINOMA (p40 DIFFUSELY POSITIVE, p16 BLOCK-POSITIVE).
   - ADENOCARCINOMA IS UNLIKELY (MUCICARMINE AND CEA NEGATIVE).
   - LYMPHOVASCULAR INVASION PRESENT.

COMMENT:
Staging imaging is recommended. Dr. Castellanos was informed of the diagnosis on 10/01/2026.

ELECTRONICALLY SIGNED OUT BY NOOR HADDAD, MD, ON 10/01/2026 16:05
""",
        "scc:l adc:ul",
        {"lymphovascular_invasion": "present"},
    ),
    Special(
        "cervix",
        3,
        """
{id}  LRPA  GALLOWAY, M.  31F  COLL 2026-09-03  DR L. CASTELLANOS
HX: CIN 2-3 on bx. LEEP + ECC.
GROSS: 1. LEEP 2.3 x 2.0 x 0.9 cm, suture 12:00, inked, 10 slices, AE. 2. ECC, scant mucoid material, AE.
DIAGNOSIS: 1. Cervix, LEEP: HSIL (CIN 3) w/ gland involvement; margins neg. 2. ECC: neg for intraepithelial lesion or malignancy.
ADDENDUM 2026-09-10: Recut of slice 7 shows HSIL at the inked endocervical margin. Margin status revised: endocervical margin INVOLVED by HSIL.
PL 2026-09-10
""",
        "hsil:p ben:p sil:a mal:a",
        {"margin_status": "involved"},
    ),
    # ------------------------------------------------------------------ duodenum
    Special(
        "duodenum",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 3 February 2026    Report date: 5 February 2026
Patient: Hazel Fenwick (27 y, F)    Hospital no.: 5530187
Requesting clinician: Dr Elspeth Mowbray

Clinical details:
Bloating and iron deficiency. Coeliac serology pending. ? coeliac disease.

Macroscopic description:
1) "D1": two fragments, 2 and 3 mm. 2) "D2": four fragments, 2 to 4 mm. All embedded.

Microscopy:
Villous architecture is preserved in both parts, with a villus to crypt ratio of about 3:1. Lymphocytes appear mildly prominent at the villous tips.

Diagnosis:
1) and 2) Duodenum, D1 and D2, biopsies: Duodenal mucosa with preserved villous architecture. An increase in intraepithelial lymphocytes cannot be excluded on H&E; CD3 immunostain requested (see addendum).

Reported by: Dr Rosalind Ferrante, Consultant Histopathologist

ADDENDUM (9 February 2026):
CD3 immunostain: 38 intraepithelial lymphocytes per 100 enterocytes at the villous tips (increased).
Revised diagnosis: Increased intraepithelial lymphocytes without villous atrophy (modified Marsh 1). Coeliac disease is possible; correlation with serology and HLA typing is recommended.
""",
        "iel:p va:a cd:u",
        {"marsh_grade": "1"},
    ),
    Special(
        "duodenum",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 05/26/2026      RECEIVED: 05/27/2026
PATIENT: PETTIGREW, LIESEL      AGE/SEX: 44/F      MRN: 2267719
SUBMITTING PHYSICIAN: JUNO ABERNETHY, MD

CLINICAL HISTORY:
KNOWN CELIAC DISEASE (DIAGNOSED 2023), ON A GLUTEN-FREE DIET. PERSISTENT DIARRHEA. ASSESS MUCOSAL HEALING.

GROSS DESCRIPTION:
A. Labeled "duodenal bulb": three tan fragments, 0.2 to 0.3 cm, entirely submitted.
B. Labeled "D2": five tan fragments, 0.2 to 0.4 cm, entirely submitted.

FINAL DIAGNOSIS:
A. DUODENUM, BULB, BIOPSIES:
   - MILD INCREASE IN INTRAEPITHELIAL LYMPHOCYTES; NO VILLOUS ATROPHY.
B. DUODENUM, SECOND PORTION, BIOPSIES:
   - PARTIAL VILLOUS ATROPHY WITH CRYPT HYPERPLASIA AND INCREASED INTRAEPITHELIAL LYMPHOCYTES (MODIFIED MARSH 3A).
   - FINDINGS ARE CONSISTENT WITH INCOMPLETELY TREATED CELIAC DISEASE.

COMMENT:
Compared with the prior biopsy (LRP-23-018812, Marsh 3c) villous architecture has improved. Dietary review is suggested.

ELECTRONICALLY SIGNED OUT BY SAOIRSE KILBRIDE, MD, ON 05/29/2026 13:30
""",
        "va:p ch:p iel:p cd:l",
        {"marsh_grade": "3a"},
    ),
    Special(
        "duodenum",
        3,
        """
{id}  LRPA  ROSS-ELLERY, N.  33M  COLL 2026-06-30  DR T. WREN
HX: Diarrhoea, wt loss, tTG-IgA 140 U/mL.
GROSS: A. 2 fragments, AE. B. 4 fragments, AE.
DIAGNOSIS: A. Duod bulb bx: peptic duodenitis; no incr IELs. B. D2 bx: subtotal villous atrophy, crypt hyperplasia, incr IELs (Marsh 3b), c/w GSE.
CV 2026-07-02
""",
        "va:p ch:p iel:p cd:l",
        {"marsh_grade": "3b"},
    ),
    Special(
        "duodenum",
        5,
        """
Duodenum, biopsies: no villous atrophy or increase in intraepithelial lymphocytes. No evidence of coeliac disease.
""",
        "va:a iel:a cd:a",
    ),
    Special(
        "duodenum",
        4,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES | SYNOPTIC SURGICAL PATHOLOGY REPORT
Accession No.: {id}
Procedure date: 2026-09-14    Sign-out: 2026-09-16
Patient: Coombe, Agnes, 63 F    Surgeon/clinician: Elspeth Mowbray

Clinical history:
Coeliac disease diagnosed 2019; strict gluten-free diet; persisting weight loss. ? refractory disease.

Gross description:
Eight fragments of duodenal mucosa, 0.2 to 0.4 cm, all embedded (levels x3).

FINAL DIAGNOSIS:
Duodenum, D2, biopsies: Flat mucosa; see synoptic summary.

SYNOPTIC SUMMARY - DUODENAL BIOPSY, COELIAC ASSESSMENT
Villous architecture: Total villous atrophy (flat mucosa)
Intraepithelial lymphocytes: Markedly increased (>60 per 100 enterocytes)
Crypts: Hyperplastic, with increased mitoses
Marsh-Oberhuber grade: IIIc
Interpretation: In keeping with coeliac disease. Refractory disease cannot be assessed on morphology alone; T-cell clonality studies are available on request.

Pathologist: Casimir Oduya, MD (electronically signed 2026-09-16)
""",
        "va:p iel:p ch:p cd:l",
        {"marsh_grade": "3c"},
    ),
    Special(
        "duodenum",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 12 August 2026    Report date: 14 August 2026
Patient: Jasper Nakashima (38 y, M)    Hospital no.: 8831204
Requesting clinician: Dr Juno Abernethy

Clinical details:
Iron deficiency anaemia. Serology not yet available.

Macroscopic description:
"D2": six fragments of mucosa, 2 to 4 mm. All embedded.

Diagnosis:
Duodenum, D2, biopsies: Partial villous atrophy with crypt hyperplasia and increased intraepithelial lymphocytes (modified Marsh 3a). See comment.

Comment:
Coeliac disease is possible; other causes of villous atrophy (for example olmesartan, infection or immunodeficiency) should be considered. Serology has been requested.

Reported by: Dr Imogen Vale, Consultant Histopathologist

ADDENDUM (20 August 2026):
Serology received: tTG-IgA >100 U/mL and endomysial antibody positive. In this context the histological findings are diagnostic of coeliac disease.
""",
        "va:p ch:p iel:p cd:p",
        {"marsh_grade": "3a"},
    ),
    Special(
        "duodenum",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT - CORRECTED

ACCESSION #: {id}      COLLECTED: 10/20/2026      RECEIVED: 10/20/2026
PATIENT: KOWALCZYK, EZRA      AGE/SEX: 22/M      MRN: 4409126
SUBMITTING PHYSICIAN: PRIYA OKONKWO, MD

CLINICAL HISTORY:
RULE OUT CELIAC DISEASE. TTG-IGA 64 U/ML.

GROSS DESCRIPTION:
A. Labeled "bulb": two fragments, 0.2 cm, entirely submitted.
B. Labeled "distal duodenum": four fragments, 0.2 to 0.3 cm, entirely submitted.

FINAL DIAGNOSIS:
A. DUODENUM, BULB, BIOPSY:
   - DUODENAL MUCOSA WITH BRUNNER GLAND HYPERPLASIA.
B. DUODENUM, DISTAL, BIOPSIES:
   - SUBTOTAL VILLOUS ATROPHY WITH CRYPT HYPERPLASIA AND INTRAEPITHELIAL LYMPHOCYTOSIS (MARSH 3B), CONSISTENT WITH CELIAC DISEASE.

CORRECTED REPORT (10/27/2026):
PART B: THE VILLOUS ATROPHY IS PARTIAL, NOT SUBTOTAL; THE MODIFIED MARSH GRADE IS CORRECTED TO 3A. THE INTERPRETATION (CONSISTENT WITH CELIAC DISEASE) IS UNCHANGED.

ELECTRONICALLY SIGNED OUT BY PETRA LINDQVIST, MD, ON 10/27/2026 08:47
""",
        "va:p ch:p iel:p cd:l",
        {"marsh_grade": "3a"},
    ),
    # ------------------------------------------------------------------ lung
    Special(
        "lung",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 04/02/2026      RECEIVED: 04/02/2026
PATIENT: TREVELYAN, ORRIN      AGE/SEX: 68/M      MRN: 7350281
SUBMITTING PHYSICIAN: DAGNY HOLLOWAY, MD

CLINICAL HISTORY:
3.4 CM LEFT UPPER LOBE MASS, FORMER SMOKER. CT-GUIDED BIOPSY.

GROSS DESCRIPTION:
Received in formalin labeled "LUL core" are three tan-white cores, 0.8 to 1.4 cm. Entirely submitted.

FINAL DIAGNOSIS:
LUNG, LEFT UPPER LOBE, CT-GUIDED CORE BIOPSY:
   - NON-SMALL CELL CARCINOMA; IMMUNOSTAINS TO FOLLOW (SEE ADDENDUM).

ELECTRONICALLY SIGNED OUT BY WENDELL ACHTERBERG, MD, ON 04/03/2026 17:20

ADDENDUM (04/07/2026):
IMMUNOHISTOCHEMISTRY: TTF-1 POSITIVE, NAPSIN A POSITIVE, p40 NEGATIVE.
FINAL DIAGNOSIS: NON-SMALL CELL CARCINOMA, FAVOR ADENOCARCINOMA.
PD-L1 (22C3): TUMOR PROPORTION SCORE 60%. MOLECULAR TESTING (EGFR, ALK, ROS1) HAS BEEN SENT.
""",
        "nsclc:p adc:l",
    ),
    Special(
        "lung",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 11 May 2026    Report date: 13 May 2026
Patient: Sunniva Eastwood (59 y, F)    Hospital no.: 6028813
Requesting clinician: Dr Cyrus Everard

Clinical details:
Endobronchial lesion, bronchus intermedius. Non-smoker.

Macroscopic description:
Four pale fragments, 1 to 3 mm. All embedded.

Diagnosis:
Bronchus intermedius, endobronchial biopsy: Neuroendocrine neoplasm, favour typical carcinoid. Ki-67 to follow.

Reported by: Dr Anselm Brightwater, Consultant Histopathologist

AMENDED DIAGNOSIS (18 May 2026):
The Ki-67 proliferation index is approximately 80%, and further levels show nuclear moulding, apoptotic debris and crush artefact that were not evident on the initial sections.
Amended diagnosis: Small cell carcinoma. This is not a carcinoid tumour.
The respiratory team was informed by telephone on 18 May 2026.
""",
        "sclc:p car:a",
    ),
    Special(
        "lung",
        3,
        """
{id}  LRPA  LOWELL, P.  66F  COLL 2026-03-25  DR D. HOLLOWAY
HX: hx colon adenoCA 2021 (pT3N1). New RLL nodule + mediastinal LAD. EBUS.
GROSS: 1. Bloody fluid 4 mL + cell block. 2. Fluid 3 mL + cell block. 3. Three tan fragments 0.1-0.2 cm, AE.
DIAGNOSIS: 1. LN stn 7, EBUS-FNA: metastatic adenocarcinoma, c/w colorectal primary (CDX2+, SATB2+, CK20+, TTF-1 neg); primary lung adenocarcinoma not favored. 2. LN stn 4R, EBUS-FNA: neg for malignancy, lymphoid tissue present. 3. RLL, EBB: metastatic adenocarcinoma, morphology identical to #1.
SK 2026-03-27
""",
        "met:p ben:p adc:ul scc:a sclc:a lcc:a nsclc:a car:a",
    ),
    Special(
        "lung",
        5,
        """
RUL wedge: invasive adenocarcinoma, lepidic predominant, 1.6 cm; margins free; pT1b pNX.
""",
        "adc:p",
        {"tumor_size_mm": "16.0", "margin_status": "negative", "pt": "pT1b", "pn": "pNX"},
    ),
    Special(
        "lung",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 7 July 2026    Report date: 9 July 2026
Patient: Hollis Underhill (71 y, M)    Hospital no.: 2218730
Requesting clinician: Dr Ivo Ramsgate

Clinical details:
Enlarging 1.9 cm part-solid nodule, right lower lobe. Not fit for surgery at present.

Macroscopic description:
Two cores, 9 and 12 mm. All embedded.

Microscopy:
Alveolar walls are lined by a crowded population of hobnailed pneumocytes with mild nuclear enlargement. There is no desmoplastic stroma in the limited sample.

Diagnosis:
Lung, right lower lobe, CT-guided core biopsy: Atypical pneumocyte proliferation in a lepidic pattern; invasive adenocarcinoma cannot be excluded on this limited sample.

Comment:
The differential diagnosis lies between atypical adenomatous hyperplasia, adenocarcinoma in situ and an invasive non-mucinous adenocarcinoma with lepidic growth; the distinction requires examination of the whole lesion. Discussed at the lung MDT.

Reported by: Dr Noor Haddad, Consultant Histopathologist
""",
        "adc:u",
    ),
    Special(
        "lung",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 08/04/2026      RECEIVED: 08/04/2026
PATIENT: DELACROIX, YVETTE      AGE/SEX: 58/F      MRN: 3174452
SUBMITTING PHYSICIAN: IVO RAMSGATE, MD

CLINICAL HISTORY:
HISTORY OF BREAST CANCER (2019). NEW 1.4 CM RIGHT LOWER LOBE NODULE; RULE OUT METASTASIS.

GROSS DESCRIPTION:
Received fresh, labeled "RLL wedge", is a stapled wedge of lung, 7.5 x 3.0 x 2.0 cm, containing a well-circumscribed, firm, gray-white nodule with a caseous center, 1.3 cm. Staple line removed and margin inked. Entirely submitted.

FINAL DIAGNOSIS:
LUNG, RIGHT LOWER LOBE, WEDGE RESECTION:
   - NECROTIZING GRANULOMA WITH SURROUNDING FIBROSIS.
   - NEGATIVE FOR MALIGNANCY.
   - GMS STAIN SHOWS SMALL BUDDING YEASTS MORPHOLOGICALLY CONSISTENT WITH HISTOPLASMA; AFB STAIN NEGATIVE.

ELECTRONICALLY SIGNED OUT BY CASIMIR ODUYA, MD, ON 08/07/2026 14:03
""",
        "ben:p mal:a",
    ),
    Special(
        "lung",
        3,
        """
{id}  LRPA  RADCLIFFE, T.  74M  COLL 2026-10-13  DR C. EVERARD
HX: 4.8 cm LLL mass, bulky subcarinal node. EBUS staging.
GROSS: 1. Stn 7: fluid 5 mL, cell block. 2. Stn 4L: fluid 2 mL, cell block.
DIAGNOSIS: 1. LN stn 7, EBUS-TBNA: atypical cells, suspicious for metastatic carcinoma; immunostains on cell block pending. 2. LN stn 4L, EBUS-TBNA: neg for malignancy; adequate lymphoid sample.
ADDENDUM 2026-10-16: Cell block from #1: tumor cells TTF-1 and napsin A positive, p40 negative. Revised dx #1: metastatic adenocarcinoma of lung origin.
WA 2026-10-16
""",
        "met:p adc:p ben:p scc:a sclc:a lcc:a nsclc:a car:a",
    ),
    # ------------------------------------------------------------------ breast
    Special(
        "breast",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT

ACCESSION #: {id}      COLLECTED: 02/17/2026      RECEIVED: 02/17/2026
PATIENT: GRIMALDI, CARMELA      AGE/SEX: 56/F      MRN: 5092267
SUBMITTING PHYSICIAN: YUSUF TALBOT, MD

CLINICAL HISTORY:
1.8 CM IRREGULAR MASS, LEFT BREAST 10 O'CLOCK, BI-RADS 5.

GROSS DESCRIPTION:
Received in formalin labeled "left breast 10:00" are four white-tan cores, 1.2 to 1.9 cm. Time to fixation under 1 hour; fixed 8 hours. Entirely submitted.

FINAL DIAGNOSIS:
LEFT BREAST, 10 O'CLOCK, ULTRASOUND-GUIDED CORE BIOPSY:
   - INVASIVE DUCTAL CARCINOMA, NOTTINGHAM GRADE 2 (TUBULES 3, NUCLEI 2, MITOSES 1; SCORE 6/9).
   - LYMPHOVASCULAR INVASION NOT IDENTIFIED.
   - ER: POSITIVE (90%, STRONG). PR: POSITIVE (25%, MODERATE).
   - HER2 (IHC): 2+, EQUIVOCAL. REFLEX ISH ORDERED.

ELECTRONICALLY SIGNED OUT BY IMOGEN VALE, MD, ON 02/19/2026 12:16

ADDENDUM (02/24/2026):
HER2 DUAL-PROBE ISH: NOT AMPLIFIED (HER2/CEP17 RATIO 1.4; AVERAGE HER2 COPY NUMBER 3.1 SIGNALS PER CELL).
FINAL HER2 STATUS: NEGATIVE.
""",
        "idc:p",
        {
            "nottingham_grade": "2",
            "er_status": "positive",
            "pr_status": "positive",
            "her2_status": "negative",
            "lymphovascular_invasion": "absent",
        },
    ),
    Special(
        "breast",
        2,
        """
Larkspur Ridge Pathology Associates - Histopathology Report
Lab no.: {id}    Specimen date: 30 April 2026    Report date: 4 May 2026
Patient: Fern Ashdown (62 y, F)    Hospital no.: 9940318
Requesting clinician: Dr Marguerite Szell

Clinical details:
Ill-defined 25 mm area of distortion, right breast upper outer quadrant. Core biopsy.

Macroscopic description:
Five cores, 10 to 17 mm. All embedded.

Diagnosis:
Right breast, upper outer quadrant, core biopsy: Invasive carcinoma, favour ductal (no special type), grade 2. E-cadherin immunostain to follow.
Oestrogen receptor: positive (Allred 8/8, 100%). Progesterone receptor: positive (70%). HER2: 1+ (negative).

Reported by: Dr Rosalind Ferrante, Consultant Histopathologist

AMENDED DIAGNOSIS (8 May 2026):
E-cadherin is negative in the tumour cells, with cytoplasmic p120 staining, and the single-file infiltrative pattern is more evident on levels.
Amended diagnosis: Invasive lobular carcinoma, classic type, grade 2. No invasive ductal (no special type) component identified.
""",
        "ilc:p idc:a",
        {
            "nottingham_grade": "2",
            "er_status": "positive",
            "pr_status": "positive",
            "her2_status": "negative",
        },
    ),
    Special(
        "breast",
        3,
        """
{id}  LRPA  NORCOTT, B.  47F  COLL 2026-06-02  DR Y. TALBOT
HX: FHx breast ca (mother, sister). BI-RADS 4B calcs L breast UOQ, 9 mm cluster.
GROSS: 8 cores with calcs on specimen radiograph, 1.0-1.8 cm, AE.
DIAGNOSIS: L breast UOQ, stereotactic core bx: ADH assoc w/ calcs; DCIS cannot be excluded, excision recommended. No invasive ca.
RF 2026-06-04
""",
        "adh:p dcis:u inv:a",
    ),
    Special(
        "breast",
        4,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES | SYNOPTIC SURGICAL PATHOLOGY REPORT
Accession No.: {id}
Procedure date: 2026-08-26    Sign-out: 2026-09-01
Patient: Winslow, Odalys, 45 F    Surgeon/clinician: Corin Abernethy

Clinical history:
Left breast HER2-positive invasive ductal carcinoma (core LRP-25-017730), completed neoadjuvant chemotherapy with anti-HER2 therapy. Clip in tumour bed.

Gross description:
Left breast lumpectomy, oriented, 7.5 x 6.0 x 3.5 cm, inked. A 2.5 cm ill-defined fibrotic area surrounds the clip. The fibrotic area is entirely submitted; the sentinel nodes are submitted separately.

FINAL DIAGNOSIS:
A. Left breast, lumpectomy: Residual invasive ductal carcinoma, 4 mm, within a 2.5 cm tumour bed; see synoptic summary.
B. Left axilla, sentinel lymph nodes, excision: Three lymph nodes with treatment-related fibrosis, negative for metastatic carcinoma.

SYNOPTIC SUMMARY - INVASIVE BREAST CARCINOMA, POST-NEOADJUVANT RESECTION
Histologic type: Invasive ductal carcinoma (no special type)
Residual invasive tumour size: 4 mm (largest contiguous focus)
Treatment effect: Present; residual cancer burden class I
Ductal carcinoma in situ: Not identified
Lymphovascular invasion: Not identified
Margins: Negative for invasive carcinoma; closest (superior) 6 mm
Regional lymph nodes: 0/3 (treatment-related fibrosis in one node, no residual tumour)
Biomarkers (pre-treatment core biopsy, reported here for completeness): ER negative (0%); PR negative (0%); HER2 positive (IHC 3+)
Pathologic stage (AJCC 8th): ypT1a N0

Pathologist: Petra Lindqvist, MD (electronically signed 2026-09-01)
""",
        "idc:p dcis:a",
        {
            "pt": "ypT1a",
            "pn": "ypN0",
            "lymph_nodes_positive": "0",
            "lymph_nodes_examined": "3",
            "margin_status": "negative",
            "lymphovascular_invasion": "absent",
            "tumor_size_mm": "4.0",
            "er_status": "negative",
            "pr_status": "negative",
            "her2_status": "positive",
        },
    ),
    Special(
        "breast",
        5,
        """
Right breast, 2 o'clock, core biopsy: fibroadenoma. No atypia.
""",
        "fa:p adh:a",
    ),
    Special(
        "breast",
        2,
        """
Larkspur Ridge Pathology Associates - Surgical Pathology Report
Case number: {id}    Specimen date: 09/08/2026    Report date: 09/10/2026
Patient: Priscilla Moreno (51 y, F)    MRN: 6651093
Requesting clinician: Dr. Yusuf Talbot

Clinical history:
Non-mass enhancement on MRI, right breast upper outer quadrant, 3 cm. Vacuum-assisted biopsy.

Gross description:
Nine cores, 1.0 to 2.0 cm, with calcifications on the specimen radiograph. Entirely submitted.

Diagnosis:
Right breast, upper outer quadrant, vacuum-assisted biopsy:
    Lobular carcinoma in situ, classic type, extensive, with associated calcifications.
    A single focus of discohesive cells in the stroma (<1 mm) is suspicious for invasive lobular carcinoma; E-cadherin negative, with no myoepithelial cells around the focus on p63/calponin staining.

Comment:
Excision is recommended. The case was shown to Dr. Brightwater, who agrees.

Reported by: Dr. Imogen Vale, Pathologist
""",
        "lcis:p ilc:u",
    ),
    Special(
        "breast",
        1,
        """
LARKSPUR RIDGE PATHOLOGY ASSOCIATES
SURGICAL PATHOLOGY REPORT - AMENDED

ACCESSION #: {id}      COLLECTED: 07/13/2026      RECEIVED: 07/13/2026
PATIENT: LECLAIR, AGNES      AGE/SEX: 64/F      MRN: 1022846
SUBMITTING PHYSICIAN: CORIN ABERNETHY, MD

CLINICAL HISTORY:
SCREEN-DETECTED CALCIFICATIONS, RIGHT BREAST, 6 MM. STEREOTACTIC BIOPSY.

GROSS DESCRIPTION:
Received are six cores, 1.1 to 1.6 cm, with calcifications on the specimen radiograph. Entirely submitted.

FINAL DIAGNOSIS:
RIGHT BREAST, STEREOTACTIC CORE BIOPSY:
   - DUCTAL CARCINOMA IN SITU, LOW NUCLEAR GRADE, CRIBRIFORM TYPE, WITH CALCIFICATIONS.

AMENDED DIAGNOSIS (07/22/2026):
RIGHT BREAST, STEREOTACTIC CORE BIOPSY:
   - ATYPICAL DUCTAL HYPERPLASIA WITH CALCIFICATIONS.
   - ON CONSENSUS REVIEW THE PROCESS INVOLVES TWO DUCT SPACES AND MEASURES 1.5 MM IN AGGREGATE; IT IS BEST CLASSIFIED AS ATYPICAL DUCTAL HYPERPLASIA. NO DUCTAL CARCINOMA IN SITU.
   - EXCISION IS RECOMMENDED.

AMENDMENT SIGNED OUT BY WENDELL ACHTERBERG, MD, ON 07/22/2026
""",
        "adh:p dcis:a",
    ),
]


# ---------------------------------------------------------------------------------------
# Assembly
# ---------------------------------------------------------------------------------------


def _meta(rng: random.Random, scheme: str, case_id: str) -> Meta:
    sex = (
        "M" if scheme == "prostate" else "F" if scheme in ("cervix", "breast") else rng.choice("MF")
    )
    first = rng.choice(FIRST_M if sex == "M" else FIRST_F)
    month = rng.randint(1, 11)
    day = rng.randint(1, 27)
    collected = Day(month, day)
    age_lo, age_hi = {
        "cervix": (24, 58),
        "prostate": (52, 78),
        "duodenum": (19, 71),
        "breast": (29, 81),
    }.get(scheme, (41, 84))
    path, other = rng.sample(PATHOLOGISTS, 2)
    return Meta(
        case_id=case_id,
        patient_last=rng.choice(SURNAMES),
        patient_first=first,
        age=rng.randint(age_lo, age_hi),
        sex=sex,
        mrn=str(rng.randint(1_000_000, 9_999_999)),
        path=path,
        other=other,
        clin=rng.choice(CLINICIANS[scheme]),
        collected=collected,
        signed=collected.plus(rng.randint(1, 4)),
        label_style=rng.choice(["alpha", "alpha", "num", "part", "paren", "numparen"]),
    )


def build_cases(seed: int = SEED) -> list[DemoCase]:
    """All demo cases, deterministic for a seed."""
    rng = random.Random(seed)
    ids = rng.sample(range(1000, 19999), 400)
    id_iter = iter(ids)
    cases: list[DemoCase] = []
    builder = Builder(rng)
    build: dict[str, Callable[[int, str], Draft]] = {
        "colorectal": builder.colorectal,
        "prostate": builder.prostate,
        "cervix": builder.cervix,
        "duodenum": builder.duodenum,
        "lung": builder.lung,
        "breast": builder.breast,
    }
    for scheme, plan in PLAN.items():
        for kind, style in plan:
            case_id = f"LRP-26-{next(id_iter):06d}"
            draft = build[scheme](style, kind)
            meta = _meta(rng, scheme, case_id)
            text = render(draft, meta, rng)
            states, values = gold_of(draft)
            cases.append(DemoCase(case_id, scheme, style, text, states, values, draft.kind or kind))
    for sp in SPECIALS:
        case_id = f"LRP-26-{next(id_iter):06d}"
        labels = parse_labels(sp.scheme, sp.labels)
        cases.append(
            DemoCase(
                case_id,
                sp.scheme,
                sp.style,
                sp.text.strip("\n").replace("{id}", case_id) + "\n",
                labels,
                dict(sp.values),
                sp.kind,
            )
        )
    cases.sort(key=lambda c: c.case_id)
    return cases


def report_rows(cases: Sequence[DemoCase]) -> list[list[str]]:
    return [["case_id", "scheme", "text"]] + [[c.case_id, c.scheme, c.text] for c in cases]


def gold_rows(cases: Sequence[DemoCase]) -> list[list[str]]:
    rows = [["case_id", "scheme", "label", "expected"]]
    for c in cases:
        for key in SCHEME_KEYS[c.scheme]:
            rows.append([c.case_id, c.scheme, key, c.labels.get(key, "unmentioned")])
        for key in VALUE_KEYS[c.scheme]:
            if key in c.values:
                rows.append([c.case_id, c.scheme, key, c.values[key]])
        unknown = set(c.values) - set(VALUE_KEYS[c.scheme])
        if unknown:
            raise ValueError(f"{c.case_id}: value keys not in scheme {c.scheme}: {sorted(unknown)}")
    return rows


def to_csv(rows: Sequence[Sequence[str]]) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n", quoting=csv.QUOTE_MINIMAL)
    w.writerows(rows)
    return buf.getvalue()


def outputs(seed: int = SEED) -> dict[Path, str]:
    """Every file this script writes, keyed by path."""
    cases = build_cases(seed)
    out = {
        HERE / "demo_reports.csv": to_csv(report_rows(cases)),
        HERE / "demo_gold.csv": to_csv(gold_rows(cases)),
    }
    # a handful of reports as plain .txt files, two per scheme, mixed styles
    picked: list[DemoCase] = []
    for scheme in SCHEME_KEYS:
        mine = [c for c in cases if c.scheme == scheme]
        styles_seen: set[int] = set()
        for c in mine:
            if c.style not in styles_seen and len(styles_seen) < 2:
                styles_seen.add(c.style)
                picked.append(c)
    for c in picked[:TXT_SAMPLE]:
        out[HERE / "reports_txt" / f"{c.case_id}.txt"] = c.text
    return out


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--check", action="store_true", help="only compare with the files on disk")
    args = ap.parse_args(argv)
    files = outputs()
    if args.check:
        stale = [
            p
            for p, text in files.items()
            if not p.exists() or p.read_text(encoding="utf-8") != text
        ]
        for p in stale:
            print(f"stale: {p.relative_to(HERE.parent)}", file=sys.stderr)
        return 1 if stale else 0
    txt_dir = HERE / "reports_txt"
    txt_dir.mkdir(exist_ok=True)
    for old in txt_dir.glob("*.txt"):
        if old not in files:
            old.unlink()
    for p, text in files.items():
        p.write_text(text, encoding="utf-8", newline="")
    print(f"wrote {len(files)} files under {HERE}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
