#!/usr/bin/env python3
"""Invented surgical pathology reports for benchmarks and scale tests.

Everything here is made up: the laboratory (Hollowmere Valley Regional
Laboratory), its pathologists, the patients, accession numbers and dates.
Reports are assembled from hand-written fragments in six house styles
(``classic``, ``synoptic``, ``terse``, ``narrative``, ``ocr`` with scanning
noise, ``addendum``), for one organ or a mix of all six, ~900 characters on
average.  A seed makes the stream reproducible: the same ``(n, seed, organ)``
always yields the same reports in the same order, and the first ``k`` reports
of a longer run equal a run of ``k``.

The text is for measuring speed and memory, not accuracy: no gold labels.

    >>> reports = list(generate(3, seed=7))
    >>> [r.case_id for r in reports]
    ['HV25-S000001', 'HV25-S000002', 'HV25-S000003']

Command line (streams; memory stays flat for any ``-n``)::

    python benchmarks/corpus.py -n 100000 --seed 1 --organ mixed -o reports.parquet
"""

from __future__ import annotations

import argparse
import json
import random
import sys
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

__all__ = [
    "LAB",
    "ORGANS",
    "STYLES",
    "Report",
    "frame",
    "generate",
    "main",
    "texts",
    "write_corpus",
]

LAB = "HOLLOWMERE VALLEY REGIONAL LABORATORY"
ORGANS = ("colorectal", "prostate", "cervix", "duodenum", "lung", "breast")
STYLES = ("classic", "synoptic", "terse", "narrative", "ocr", "addendum")
#: How often each house style occurs (a regional lab is mostly one house template).
_STYLE_WEIGHTS = (34, 14, 18, 14, 10, 10)


@dataclass(frozen=True, slots=True)
class Report:
    case_id: str
    organ: str
    style: str
    text: str


# ---------------------------------------------------------------------------------------
# People, places and dates (all invented)
# ---------------------------------------------------------------------------------------

_PATHOLOGISTS = (
    "Imogen Thackeray",
    "Barnaby Okonkwo-Reyes",
    "Lucinda Farrow",
    "Teodor Wexley",
    "Marisol Quennell",
    "Ambrose Vantongeren",
    "Priya Halvorsen",
    "Cormac Ellery",
)
_CLINICIANS = (
    "Hugo Penhallow",
    "Rosamund Achterberg",
    "Dmitri Ferncastle",
    "Nkechi Walmsley",
    "Oriel Castellane",
    "Sebastian Inchcape",
)
_SURNAMES = (
    "Ashdown",
    "Brackenridge",
    "Corvino",
    "Delacourt",
    "Eastwick",
    "Fairbairn",
    "Gallowglass",
    "Hartigan",
    "Illingworth",
    "Jaramillo",
    "Kettleborough",
    "Lindqvist",
    "Marchbanks",
    "Nettleford",
    "Oyelaran",
    "Pemberton-Shaw",
    "Quigley",
    "Rosenthorpe",
    "Stavanger",
    "Thistlewood",
    "Umberfield",
    "Valderrama",
    "Whitcombe",
    "Yardley",
)
_GIVEN = {
    "F": ("Agnes", "Beatrix", "Clementine", "Dolores", "Eulalia", "Fenella", "Greta", "Hester"),
    "M": (
        "Alaric",
        "Bartholomew",
        "Cuthbert",
        "Desmond",
        "Evander",
        "Fitzroy",
        "Gideon",
        "Horatio",
    ),
}


# ---------------------------------------------------------------------------------------
# Organ fragments: sites, procedures, diagnoses, histories, gross, synoptic lines
# ---------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Organ:
    sites: tuple[str, ...]
    procedures: tuple[str, ...]
    diagnoses: tuple[str, ...]
    histories: tuple[str, ...]
    gross: tuple[str, ...]
    comments: tuple[str, ...]
    synoptic: tuple[tuple[str, tuple[str, ...]], ...]
    resection: str
    sex: str = ""  # "" means either


_COLORECTAL = _Organ(
    sites=(
        "Sigmoid colon",
        "Rectum",
        "Ascending colon",
        "Transverse colon",
        "Descending colon",
        "Cecum",
        "Hepatic flexure",
        "Rectosigmoid junction",
    ),
    procedures=("polypectomy", "cold snare polypectomy", "biopsy", "biopsies", "hot snare"),
    diagnoses=(
        "Tubular adenoma.",
        "Tubular adenoma with low-grade dysplasia.",
        "Tubulovillous adenoma with focal high-grade dysplasia; margin of the stalk is free.",
        "Hyperplastic polyp.",
        "Hyperplastic polyp, microvesicular type.",
        "Sessile serrated lesion without dysplasia.",
        "Sessile serrated lesion with cytological dysplasia.",
        "Colonic mucosa with no significant abnormality.",
        "Fragments of benign colonic mucosa; negative for dysplasia and malignancy.",
        "Invasive adenocarcinoma, moderately differentiated.",
        "Intramucosal carcinoma arising in a villous adenoma.",
        "Polypoid colonic mucosa; no dysplasia identified.",
        "Findings consistent with a hyperplastic polyp.",
        "Suspicious for invasive adenocarcinoma; see comment.",
        "Tubular adenoma. No high-grade dysplasia or invasive malignancy.",
        "Adenocarcinoma cannot be excluded in this superficial sample; rebiopsy suggested.",
    ),
    histories=(
        "Screening colonoscopy; 8 mm sessile polyp.",
        "History of tubular adenoma (2019). Surveillance colonoscopy.",
        "Rectal bleeding. Rule out carcinoma.",
        "Family history of colon cancer (mother, age 61). Two small polyps removed.",
        "Change in bowel habit; ulcerated mass at 30 cm.",
        "Iron deficiency anaemia. Positive FIT.",
    ),
    gross=(
        "Received in formalin labeled with the patient's name and '{site}' is a tan polypoid "
        "fragment measuring 0.{a} x 0.{b} x 0.3 cm. Entirely submitted in one cassette.",
        "Received in formalin are {n} tan-pink soft tissue fragments, aggregate 0.{a} cm. "
        "Entirely submitted.",
        "The specimen consists of a stalked polyp, 1.{a} cm in greatest dimension; the stalk "
        "is inked blue and the polyp bisected. Entirely submitted.",
    ),
    comments=(
        "Deeper levels were examined.",
        "Surveillance interval per current guidelines is suggested.",
        "The case was reviewed at the intradepartmental GI consensus conference.",
        "Clinical correlation is recommended.",
    ),
    synoptic=(
        ("Procedure", ("Sigmoidectomy", "Right hemicolectomy", "Low anterior resection")),
        ("Histologic type", ("Adenocarcinoma", "Mucinous adenocarcinoma")),
        ("Histologic grade", ("G2, moderately differentiated", "Low grade", "High grade")),
        ("Tumor size", ("4.2 cm", "3.1 cm", "5.5 cm", "2.7 cm")),
        ("Tumor extent", ("Invades through muscularis propria into pericolorectal tissue",)),
        ("Lymphovascular invasion", ("Not identified", "Present")),
        ("Margins", ("Uninvolved by invasive carcinoma", "Negative for carcinoma")),
        ("Regional lymph nodes", ("2 / 17 involved", "0 of 14 positive", "3 positive / 21")),
        ("Pathologic stage (AJCC 8th)", ("pT3 pN1b", "pT2 pN0", "pT3 pN1a", "pT4a pN2a")),
    ),
    resection="Invasive adenocarcinoma, moderately differentiated, invading into pericolorectal "
    "tissue; see synoptic summary.",
)

_PROSTATE = _Organ(
    sites=(
        "Prostate, right base",
        "Prostate, right mid",
        "Prostate, right apex",
        "Prostate, left base",
        "Prostate, left mid",
        "Prostate, left apex",
        "Prostate, left lateral mid",
        "Prostate, right transition zone",
    ),
    procedures=("needle core biopsy", "core biopsies", "biopsy"),
    diagnoses=(
        "Prostatic adenocarcinoma, Gleason score 3+3=6 (Grade Group 1), involving 20% of one core.",
        "Prostatic adenocarcinoma, Gleason score 3+4=7 (Grade Group 2), 35% of tissue.",
        "Prostatic adenocarcinoma, Gleason score 4+3=7 (Grade Group 3), in 2 of 2 cores.",
        "Adenocarcinoma of prostate, Gleason 4+4=8, Grade Group 4; perineural invasion present.",
        "Prostatic adenocarcinoma, Gleason score 4+5=9 (Grade Group 5), 80% of core.",
        "Benign prostatic tissue.",
        "Benign prostatic tissue; negative for carcinoma.",
        "High-grade prostatic intraepithelial neoplasia (HGPIN).",
        "Atypical small acinar proliferation, suspicious for but not diagnostic of carcinoma.",
        "Atypical glands; cannot rule out adenocarcinoma. Repeat sampling recommended.",
        "Benign prostatic tissue with chronic inflammation; no carcinoma identified.",
        "Prostatic tissue, negative for malignancy.",
    ),
    histories=(
        "Elevated PSA (7.2 ng/mL).",
        "PSA 5.1. MRI PI-RADS 4 lesion, left mid gland.",
        "Previous benign biopsy (2023); rising PSA.",
        "Abnormal DRE, right lobe nodule.",
        "Family history of prostate cancer (father). PSA 4.8.",
    ),
    gross=(
        "Received in formalin labeled '{site}' are {n} tan cores, 1.{a} and 1.{b} cm. "
        "Entirely submitted.",
        "{n} thread-like cores of tan tissue ranging from 0.{a} to 1.{b} cm, inked and "
        "entirely submitted in one cassette.",
    ),
    comments=(
        "Immunostains for basal cells (p63/CK5) and AMACR support the diagnosis.",
        "The percentage of pattern 4 in the Grade Group 2 focus is about 10%.",
        "Controls stained appropriately.",
        "Dr. {colleague} reviewed selected slides and concurs.",
    ),
    synoptic=(
        ("Procedure", ("Radical prostatectomy",)),
        ("Histologic type", ("Acinar adenocarcinoma",)),
        ("Gleason score", ("3+4=7", "4+3=7", "4+4=8")),
        ("Grade Group", ("2", "3", "4")),
        ("Extraprostatic extension", ("Not identified", "Present, focal")),
        ("Margins", ("Uninvolved by carcinoma", "Involved at right posterolateral margin")),
        ("Regional lymph nodes", ("0 involved / 12 examined", "1 of 9 positive")),
        ("Pathologic stage (AJCC 8th)", ("pT2 pN0", "pT3a pN0", "pT3b pN1")),
    ),
    resection="Prostatic adenocarcinoma, acinar type, Gleason score 4+3=7 (Grade Group 3); "
    "see synoptic summary.",
    sex="M",
)

_CERVIX = _Organ(
    sites=(
        "Cervix, 12 o'clock",
        "Cervix, 3 o'clock",
        "Cervix, 6 o'clock",
        "Endocervical curettage",
        "Cervix, LEEP",
        "Cervix, cold knife cone",
    ),
    procedures=("biopsy", "punch biopsy", "excision", "curettage"),
    diagnoses=(
        "High-grade squamous intraepithelial lesion (HSIL; CIN 3).",
        "HSIL (CIN 2), extending into endocervical glands.",
        "Low-grade squamous intraepithelial lesion (LSIL; CIN 1) with koilocytic change.",
        "Negative for intraepithelial lesion or malignancy.",
        "Invasive squamous cell carcinoma, keratinizing type.",
        "Endocervical adenocarcinoma in situ.",
        "Scant strips of endocervical epithelium; no dysplasia identified.",
        "Squamous mucosa with reactive changes; negative for dysplasia.",
        "Findings suspicious for HSIL; see comment.",
        "Condyloma with HPV cytopathic effect.",
    ),
    histories=(
        "Pap: ASC-H. HPV 16 positive.",
        "HSIL on cytology; colposcopic biopsies.",
        "History of CIN 2 treated by LEEP (2021). Persistent HPV.",
        "Postcoital bleeding. Visible lesion at 6 o'clock.",
    ),
    gross=(
        "Received in formalin labeled '{site}' are {n} tan fragments, aggregate 0.{a} cm. "
        "Entirely submitted.",
        "A cone of cervix, 2.{a} x 2.{b} x 1.1 cm, inked and sectioned radially into {n} "
        "slices; entirely submitted clockwise.",
    ),
    comments=(
        "p16 immunostain shows block-type positivity in the lesional epithelium.",
        "Margins of the excision are free of dysplasia.",
        "Correlation with the cytology result is advised.",
    ),
    synoptic=(
        ("Procedure", ("Radical hysterectomy", "Cold knife cone")),
        (
            "Histologic type",
            ("Squamous cell carcinoma, keratinizing", "Adenocarcinoma, usual type"),
        ),
        ("Depth of invasion", ("4 mm", "7 mm", "11 mm")),
        ("Lymphovascular invasion", ("Not identified", "Present")),
        ("Margins", ("Negative for carcinoma", "Involved at ectocervical margin")),
        ("Pathologic stage (AJCC 8th)", ("pT1b1 pN0", "pT1a2 pN0", "pT2a1 pN1")),
    ),
    resection="Invasive squamous cell carcinoma, keratinizing type; see synoptic summary.",
    sex="F",
)

_DUODENUM = _Organ(
    sites=("Duodenum, second part", "Duodenal bulb", "Distal duodenum", "Duodenum, D2"),
    procedures=("biopsies", "biopsy", "endoscopic biopsies"),
    diagnoses=(
        "Duodenal mucosa with no significant abnormality.",
        "Increased intraepithelial lymphocytes (about 40 per 100 enterocytes) with subtotal "
        "villous atrophy and crypt hyperplasia, consistent with celiac disease (Marsh 3b).",
        "Partial villous atrophy with intraepithelial lymphocytosis (Marsh 3a); compatible with "
        "gluten-sensitive enteropathy in the appropriate serological context.",
        "Normal villous architecture; no increase in intraepithelial lymphocytes. No evidence "
        "of celiac disease.",
        "Intraepithelial lymphocytosis without villous atrophy (Marsh 1).",
        "Total villous atrophy with crypt hyperplasia (Marsh 3c).",
        "Peptic duodenitis with gastric foveolar metaplasia; no villous blunting.",
    ),
    histories=(
        "Anaemia. tTG-IgA 85 U/mL.",
        "Dyspepsia. Rule out celiac disease.",
        "Known celiac disease on gluten-free diet; follow-up biopsies.",
        "Diarrhoea and weight loss. Serology pending.",
    ),
    gross=(
        "Received in formalin are {n} tan mucosal fragments, 0.{a} to 0.{b} cm, oriented on "
        "mesh and entirely submitted.",
    ),
    comments=(
        "CD3 immunostain highlights the intraepithelial lymphocytes.",
        "Correlation with serology and HLA typing is suggested.",
        "Well-oriented sections with at least four consecutive villi were assessed.",
    ),
    synoptic=(),
    resection="",
)

_LUNG = _Organ(
    sites=(
        "Right upper lobe",
        "Left lower lobe",
        "Right middle lobe",
        "Lymph node, station 7",
        "Lymph node, station 4R",
        "Left upper lobe, lingula",
    ),
    procedures=("wedge resection", "core needle biopsy", "EBUS-TBNA", "transbronchial biopsy"),
    diagnoses=(
        "Invasive adenocarcinoma, acinar predominant.",
        "Squamous cell carcinoma, moderately differentiated.",
        "Small cell carcinoma.",
        "Non-small cell carcinoma, not otherwise specified; immunostains favor adenocarcinoma.",
        "Typical carcinoid tumor.",
        "Metastatic carcinoma consistent with colorectal primary.",
        "Lung parenchyma, negative for malignancy.",
        "Lymph node, negative for malignancy (0/1).",
        "Large cell neuroendocrine carcinoma.",
        "Organizing pneumonia; no malignancy identified.",
    ),
    histories=(
        "2.1 cm spiculated RUL nodule. Former smoker, 40 pack-years.",
        "History of colon adenocarcinoma (2020); new lung nodule. R/O metastasis.",
        "Mediastinal lymphadenopathy. Staging.",
        "Enlarging ground-glass nodule on CT.",
    ),
    gross=(
        "Received fresh is a wedge of lung, 6.{a} x 3.{b} x 1.5 cm, with a firm gray nodule "
        "1.{a} cm from the staple line. Representative sections in {n} cassettes.",
        "Received in formalin are {n} gray-tan cores, up to 1.{b} cm. Entirely submitted.",
    ),
    comments=(
        "TTF-1 and napsin A positive; p40 negative.",
        "Tissue is sufficient for molecular testing; requested.",
        "Immunostains support the diagnosis with appropriate controls.",
    ),
    synoptic=(
        ("Procedure", ("Lobectomy", "Wedge resection")),
        (
            "Histologic type",
            ("Invasive adenocarcinoma, acinar predominant", "Squamous cell carcinoma"),
        ),
        ("Tumor size", ("2.3 cm", "1.8 cm", "3.6 cm")),
        ("Visceral pleural invasion", ("Not identified", "Present (PL1)")),
        ("Lymphovascular invasion", ("Not identified", "Present")),
        ("Margins", ("Negative for carcinoma",)),
        ("Regional lymph nodes", ("0 / 9 involved", "1 of 11 positive")),
        ("Pathologic stage (AJCC 8th)", ("pT1c pN0", "pT2a pN1", "pT1b pN0")),
    ),
    resection="Invasive adenocarcinoma, acinar predominant; see synoptic summary.",
)

_BREAST = _Organ(
    sites=(
        "Left breast, 10 o'clock",
        "Right breast, upper outer quadrant",
        "Left breast, 2 o'clock, 4 cm from nipple",
        "Left axillary sentinel lymph node",
        "Right breast, retroareolar",
    ),
    procedures=("ultrasound-guided core biopsy", "stereotactic core biopsy", "excision"),
    diagnoses=(
        "Invasive ductal carcinoma, Nottingham grade 2 (tubules 3, nuclei 2, mitoses 1; score 6).",
        "Invasive lobular carcinoma, classic type.",
        "Ductal carcinoma in situ, intermediate nuclear grade, cribriform type.",
        "Fibroadenoma.",
        "Benign breast tissue with fibrocystic changes.",
        "Atypical ductal hyperplasia.",
        "Lobular carcinoma in situ, classic type.",
        "One lymph node, negative for metastatic carcinoma (0/1).",
        "Invasive carcinoma of no special type, grade 3. ER positive (90%), PR positive (30%), "
        "HER2 negative (IHC 1+).",
        "Benign breast tissue; no atypia or malignancy identified.",
    ),
    histories=(
        "BI-RADS 5 mass, left breast 10:00, 1.8 cm.",
        "Palpable lump. Mother had breast cancer at 52.",
        "Calcifications, BI-RADS 4B. Stereotactic biopsy.",
        "Known invasive carcinoma; wide local excision and sentinel node.",
    ),
    gross=(
        "Received in formalin labeled '{site}' are {n} white-tan cores, up to 1.{a} cm. Cold "
        "ischemia under 1 hour; fixation 8 hours. Entirely submitted.",
        "A lumpectomy, 6.{a} x 4.{b} x 3.0 cm, inked per protocol; a firm stellate mass "
        "1.{a} cm is 0.{b} cm from the superior margin. {n} cassettes.",
    ),
    comments=(
        "ER: positive (95%, strong). PR: positive (40%, moderate). HER2: negative (IHC 1+).",
        "ER negative (0%). PR negative (0%). HER2 IHC 2+ (equivocal); ISH to follow.",
        "HER2 positive (IHC 3+). ER positive (60%). PR negative (<1%).",
        "Calcifications are present in benign ducts and in the lesion.",
    ),
    synoptic=(
        ("Procedure", ("Lumpectomy", "Mastectomy")),
        ("Histologic type", ("Invasive ductal carcinoma", "Invasive lobular carcinoma")),
        ("Nottingham grade", ("2 (score 6)", "3 (score 8)", "1 (score 5)")),
        ("Tumor size", ("1.8 cm", "2.4 cm", "0.9 cm")),
        ("Margins", ("Negative for invasive carcinoma", "Involved at inferior margin")),
        ("Lymphovascular invasion", ("Not identified", "Present")),
        ("Regional lymph nodes", ("0 / 2 sentinel nodes involved", "1 of 3 positive")),
        ("ER / PR / HER2", ("Positive / Positive / Negative", "Negative / Negative / Positive")),
        ("Pathologic stage (AJCC 8th)", ("pT1c pN0(sn)", "pT2 pN1a", "pT1b pN0")),
    ),
    resection="Invasive ductal carcinoma, Nottingham grade 2; see synoptic summary.",
    sex="F",
)

_ORGAN_DATA = {
    "colorectal": _COLORECTAL,
    "prostate": _PROSTATE,
    "cervix": _CERVIX,
    "duodenum": _DUODENUM,
    "lung": _LUNG,
    "breast": _BREAST,
}

_ADDENDA = (
    "Additional levels were examined at the request of the clinician; the diagnosis is unchanged.",
    "Immunohistochemistry results are now available and support the original diagnosis.",
    "AMENDED DIAGNOSIS: Part {part}: {dx}",
    "Following review at the multidisciplinary meeting the diagnosis for part {part} is "
    "revised to: {dx}",
)
_OCR_SWAPS = {"l": "1", "O": "0", "o": "0", "I": "l", "S": "5", "e": "c", "m": "rn"}


# ---------------------------------------------------------------------------------------
# Assembling one report
# ---------------------------------------------------------------------------------------


class _Maker:
    """Draws one report at a time from a seeded random stream."""

    def __init__(self, seed: int, organ: str, styles: Sequence[str]) -> None:
        if organ != "mixed" and organ not in _ORGAN_DATA:
            raise ValueError(f"unknown organ {organ!r}; choose one of {', '.join(ORGANS)} or mixed")
        unknown = [s for s in styles if s not in STYLES]
        if unknown or not styles:
            raise ValueError(f"unknown style(s) {unknown}; choose from {', '.join(STYLES)}")
        self.rng = random.Random(seed)
        self.organ = organ
        self.styles = list(styles)
        self.weights = [_STYLE_WEIGHTS[STYLES.index(s)] for s in self.styles]
        self.builders: dict[str, Callable[[_Case], str]] = {
            "classic": self._classic,
            "synoptic": self._synoptic,
            "terse": self._terse,
            "narrative": self._narrative,
            "ocr": self._ocr,
            "addendum": self._addendum,
        }

    def make(self, number: int) -> Report:
        r = self.rng
        organ = self.organ if self.organ != "mixed" else r.choice(ORGANS)
        style = r.choices(self.styles, self.weights)[0]
        data = _ORGAN_DATA[organ]
        if style == "synoptic" and not data.synoptic:
            style = "classic"
        case = _Case(self, organ, data, style, number)
        return Report(case.accession, organ, style, self.builders[style](case))

    # ------------------------------------------------------------------ styles

    def _classic(self, c: _Case) -> str:
        lines = [
            LAB,
            "SURGICAL PATHOLOGY REPORT",
            "",
            f"ACCESSION #: {c.accession}      COLLECTED: {c.collected_us}      "
            f"RECEIVED: {c.received_us}",
            f"PATIENT: {c.patient_upper}      AGE/SEX: {c.age}/{c.sex}      MRN: {c.mrn}",
            f"SUBMITTING PHYSICIAN: {c.clinician.upper()}, MD",
            "",
            "CLINICAL HISTORY:",
            c.history,
            "",
            "GROSS DESCRIPTION:",
            *[f"{p.label}. {p.gross}" for p in c.parts],
            "",
            "FINAL DIAGNOSIS:",
            *[f"{p.label}. {p.site}, {p.procedure}:\n   {p.dx}" for p in c.parts],
        ]
        if c.comment:
            lines += ["", "COMMENT:", c.comment]
        lines += ["", f"Electronically signed by {c.pathologist}, MD on {c.signed_us}"]
        return "\n".join(lines) + "\n"

    def _synoptic(self, c: _Case) -> str:
        r = self.rng
        data = c.data
        items = "\n".join(f"{k}: {r.choice(v)}" for k, v in data.synoptic)
        return (
            f"{LAB} | SYNOPTIC SURGICAL PATHOLOGY REPORT\n"
            f"Accession No.: {c.accession}\n"
            f"Procedure date: {c.collected_iso}    Sign-out: {c.signed_iso}\n"
            f"Patient: {c.patient}, {c.age} {c.sex}    Clinician: {c.clinician}\n\n"
            f"Clinical history:\n{c.history}\n\n"
            f"Gross description:\n{c.parts[0].gross}\n\n"
            f"FINAL DIAGNOSIS:\n{c.parts[0].site}, resection: {data.resection}\n\n"
            f"SYNOPTIC SUMMARY\n{items}\n\n"
            f"Comment:\n{c.comment or 'None.'}\n\n"
            f"Pathologist: {c.pathologist}, MD (electronically signed {c.signed_iso})\n"
        )

    def _terse(self, c: _Case) -> str:
        dx = " ".join(
            f"{p.label}. {p.site.upper()}, {p.procedure.upper()}: {p.dx}" for p in c.parts
        )
        gross = " ".join(f"{p.label}. {p.gross}" for p in c.parts)
        initials = "".join(w[0] for w in c.pathologist.split())
        return (
            f"{c.accession}  HVRL  {c.patient_upper}  {c.age}{c.sex}  COLL {c.collected_iso}  "
            f"DR {c.clinician.upper()}\n"
            f"HX: {c.history}\n"
            f"GROSS: {gross}\n"
            f"DX: {dx}\n"
            + (f"NOTE: {c.comment}\n" if c.comment else "")
            + f"{initials} {c.signed_iso}\n"
        )

    def _narrative(self, c: _Case) -> str:
        parts = []
        for i, p in enumerate(c.parts, 1):
            parts.append(f"{i}. {p.site} ({p.procedure}): {p.dx}")
        micro = self.rng.choice(
            (
                "Sections show the features summarised below.",
                "Sections of all parts have been examined at several levels.",
                "The sections are well oriented and show the changes described in the conclusion.",
            )
        )
        return (
            f"Hollowmere Valley Regional Laboratory - Department of Cellular Pathology\n"
            f"Lab number {c.accession}   Received {c.received_iso}\n"
            f"Name {c.patient}   DOB {c.dob}   Sex {c.sex}\n\n"
            f"Clinical information\n{c.history}\n\n"
            f"Macroscopic\n"
            + " ".join(f"{i}. {p.gross}" for i, p in enumerate(c.parts, 1))
            + "\n\n"
            f"Microscopic\n{micro}\n\n"
            f"Conclusion\n"
            + "\n".join(parts)
            + "\n\n"
            + (f"Comment\n{c.comment}\n\n" if c.comment else "")
            + f"Reported by Dr {c.pathologist}, Consultant Histopathologist, {c.signed_iso}\n"
        )

    def _ocr(self, c: _Case) -> str:
        text = self._classic(c)
        r = self.rng
        out = []
        for ch in text:
            swap = _OCR_SWAPS.get(ch)
            if swap is not None and r.random() < 0.015:
                out.append(swap)
            elif ch == " " and r.random() < 0.02:
                out.append("  ")
            else:
                out.append(ch)
        return "".join(out).replace("\n\n", "\n \n")

    def _addendum(self, c: _Case) -> str:
        base = self._classic(c)
        r = self.rng
        p = r.choice(c.parts)
        note = r.choice(_ADDENDA).format(part=p.label, dx=r.choice(c.data.diagnoses))
        return base + f"\nADDENDUM ({c.signed_us}):\n{note}\nSigned: {c.pathologist}, MD\n"


@dataclass
class _Part:
    label: str
    site: str
    procedure: str
    dx: str
    gross: str


class _Case:
    """The random particulars of one case, drawn once and shared by the styles."""

    def __init__(self, maker: _Maker, organ: str, data: _Organ, style: str, number: int) -> None:
        r = maker.rng
        self.data = data
        year = 25 + (number // 400_000) % 2
        self.accession = f"HV{year}-S{number:06d}"
        self.sex = data.sex or r.choice("FM")
        given = r.choice(_GIVEN[self.sex])
        surname = r.choice(_SURNAMES)
        self.patient = f"{surname}, {given}"
        self.patient_upper = self.patient.upper()
        self.age = r.randint(24, 88)
        self.mrn = f"{r.randint(1_000_000, 9_999_999)}"
        month, day = r.randint(1, 12), r.randint(1, 26)
        y = 2000 + year
        self.collected_iso = f"{y}-{month:02d}-{day:02d}"
        self.received_iso = f"{y}-{month:02d}-{day + 1:02d}"
        self.signed_iso = f"{y}-{month:02d}-{day + 2:02d}"
        self.collected_us = f"{month:02d}/{day:02d}/{y}"
        self.received_us = f"{month:02d}/{day + 1:02d}/{y}"
        self.signed_us = f"{month:02d}/{day + 2:02d}/{y}"
        self.dob = f"{day:02d}/{month:02d}/{y - self.age}"
        self.pathologist = r.choice(_PATHOLOGISTS)
        self.clinician = r.choice(_CLINICIANS)
        n_hist = 2 if r.random() < 0.35 else 1
        self.history = " ".join(r.sample(data.histories, n_hist))
        n_parts = 1 if style == "synoptic" else r.choices((1, 2, 3, 4), (40, 30, 20, 10))[0]
        letters = "ABCDEF"
        sites = r.sample(data.sites, min(n_parts, len(data.sites)))
        self.parts = []
        for i, site in enumerate(sites):
            dx = r.choice(data.diagnoses)
            if r.random() < 0.06:
                dx = _typo(r, dx)
            gross = r.choice(data.gross).format(
                site=site.lower(), n=r.randint(2, 6), a=r.randint(2, 9), b=r.randint(1, 9)
            )
            self.parts.append(_Part(letters[i], site, r.choice(data.procedures), dx, gross))
        self.comment = ""
        if r.random() < 0.55:
            colleague = r.choice([p for p in _PATHOLOGISTS if p != self.pathologist])
            self.comment = r.choice(data.comments).format(colleague=colleague)


def _typo(r: random.Random, text: str) -> str:
    """One dropped or doubled letter in a long word (reports are typed in a hurry)."""
    words = text.split(" ")
    long = [i for i, w in enumerate(words) if len(w) >= 8 and w.isalpha()]
    if not long:
        return text
    i = r.choice(long)
    w = words[i]
    k = r.randint(2, len(w) - 3)
    words[i] = w[:k] + w[k + 1 :] if r.random() < 0.5 else w[:k] + w[k] + w[k:]
    return " ".join(words)


# ---------------------------------------------------------------------------------------
# Public API
# ---------------------------------------------------------------------------------------


def generate(
    n: int, *, seed: int = 0, organ: str = "colorectal", styles: Sequence[str] = STYLES
) -> Iterator[Report]:
    """Yield ``n`` invented reports (lazily: memory does not grow with ``n``)."""
    maker = _Maker(seed, organ, styles)
    for i in range(1, n + 1):
        yield maker.make(i)


def texts(n: int, *, seed: int = 0, organ: str = "colorectal") -> list[str]:
    """The texts of ``n`` reports, in memory."""
    return [r.text for r in generate(n, seed=seed, organ=organ)]


def frame(n: int, *, seed: int = 0, organ: str = "colorectal") -> Any:
    """A pandas DataFrame with ``case_id, organ, style, text`` columns."""
    import pandas as pd

    rows = list(generate(n, seed=seed, organ=organ))
    return pd.DataFrame(
        {
            "case_id": [r.case_id for r in rows],
            "organ": [r.organ for r in rows],
            "style": [r.style for r in rows],
            "text": [r.text for r in rows],
        }
    )


def write_corpus(
    path: str | Path,
    n: int,
    *,
    seed: int = 0,
    organ: str = "colorectal",
    chunk_rows: int = 10_000,
) -> Path:
    """Write ``n`` reports to .csv, .parquet or .jsonl in chunks (flat memory).

    Parquet files get one row group per ``chunk_rows`` so readers can stream them too.
    """
    import pandas as pd

    out = Path(path)
    suffix = out.suffix.lower()
    if suffix not in (".csv", ".parquet", ".jsonl"):
        raise ValueError(f"{out}: corpus files end in .csv, .parquet or .jsonl")
    stream = generate(n, seed=seed, organ=organ)
    writer: Any = None
    first = True
    with open(out, "w", encoding="utf-8", newline="") if suffix != ".parquet" else _null() as fh:
        while True:
            batch = [r for _, r in zip(range(chunk_rows), stream, strict=False)]
            if not batch and not first:
                break
            df = pd.DataFrame(
                {
                    "case_id": [r.case_id for r in batch],
                    "organ": [r.organ for r in batch],
                    "style": [r.style for r in batch],
                    "text": [r.text for r in batch],
                }
            )
            if suffix == ".parquet":
                import pyarrow as pa
                import pyarrow.parquet as pq

                table = pa.Table.from_pandas(df, preserve_index=False)
                if writer is None:
                    writer = pq.ParquetWriter(out, table.schema)
                writer.write_table(table)
            elif suffix == ".csv":
                df.to_csv(fh, index=False, header=first, lineterminator="\n")
            else:
                for rec in df.to_dict(orient="records"):
                    fh.write(json.dumps(rec, ensure_ascii=False) + "\n")
            first = False
            if len(batch) < chunk_rows:
                break
    if writer is not None:
        writer.close()
    return out


class _null:
    def __enter__(self) -> None:
        return None

    def __exit__(self, *_: object) -> None:
        return None


def main(argv: Sequence[str] | None = None) -> int:
    ap = argparse.ArgumentParser(
        description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter
    )
    ap.add_argument("-n", type=int, default=1000, help="number of reports (default 1000)")
    ap.add_argument("--seed", type=int, default=0)
    ap.add_argument("--organ", default="colorectal", help=f"{', '.join(ORGANS)} or mixed")
    ap.add_argument("-o", "--output", help="write .csv/.parquet/.jsonl; else print statistics")
    ap.add_argument("--show", type=int, default=0, help="print the first N reports")
    args = ap.parse_args(argv)
    t0 = time.perf_counter()
    if args.output:
        write_corpus(args.output, args.n, seed=args.seed, organ=args.organ)
        took = time.perf_counter() - t0
        print(f"{args.n} reports -> {args.output} in {took:.1f} s", file=sys.stderr)
        return 0
    lengths: list[int] = []
    styles: dict[str, int] = {}
    for i, rep in enumerate(generate(args.n, seed=args.seed, organ=args.organ)):
        lengths.append(len(rep.text))
        styles[rep.style] = styles.get(rep.style, 0) + 1
        if i < args.show:
            print(f"----- {rep.case_id} ({rep.organ}, {rep.style})\n{rep.text}")
    took = time.perf_counter() - t0
    lengths.sort()
    summary = {
        "n": args.n,
        "mean_chars": round(sum(lengths) / max(len(lengths), 1), 1),
        "median_chars": lengths[len(lengths) // 2] if lengths else 0,
        "min_chars": lengths[0] if lengths else 0,
        "max_chars": lengths[-1] if lengths else 0,
        "styles": styles,
        "reports_per_s": round(args.n / took) if took else None,
    }
    print(json.dumps(summary))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
