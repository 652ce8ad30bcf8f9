"""Invented surgical pathology reports for the reading-stage tests and the speed script.

Every report, laboratory, person, accession number and date here is fictional
(the laboratory is "Fernhollow Valley Pathology").  The reports imitate common
layouts: free prose, upper-case teletype, numbered parts, synoptic checklists,
OCR noise, abbreviations.  ``make_corpus`` varies numbers and names so a speed
test does not only measure caches.
"""

from __future__ import annotations

import random

__all__ = ["REPORTS", "make_corpus"]

REPORTS: dict[str, str] = {
    "colorectal_polyps": (
        "FERNHOLLOW VALLEY PATHOLOGY          Accession: FV-24-018832\n"
        "Patient: QUILLANE, Brennart   DOB: 03/11/1958   Physician: Dr. O. Mistleford\n\n"
        "CLINICAL HISTORY:\nScreening colonoscopy. History of polyps.\n\n"
        "FINAL DIAGNOSIS:\n"
        "A. Colon, ascending, polypectomy:\n"
        "   - Tubular adenoma, low-grade dysplasia.\n"
        "   - Negative for high-grade dysplasia and malignancy.\n"
        "B. Colon, sigmoid, polypectomy:\n"
        "   - Hyperplastic polyp (HP).\n"
        "C. Rectum, biopsy:\n"
        "   - Sessile serrated lesion without dysplasia.\n\n"
        "GROSS DESCRIPTION:\n"
        "A. Received in formalin labeled with the patient's name and 'ascending colon polyp' "
        "is a tan polypoid fragment, 0.6 x 0.4 x 0.3 cm. Entirely submitted in cassette A1.\n"
        "B. Two tan fragments, 0.3 and 0.2 cm, entirely submitted in B1.\n"
        "C. Three fragments ranging from 0.2 to 0.4 cm, entirely submitted (C1-C2).\n"
    ),
    "colorectal_resection": (
        "SURGICAL PATHOLOGY REPORT\nFernhollow Valley Pathology, 12 Orrin Lane\n\n"
        "DIAGNOSIS\nSigmoid colon, anterior resection:\n"
        "Invasive adenocarcinoma, moderately differentiated, arising in a tubulovillous adenoma.\n"
        "Tumour invades through the muscularis propria into pericolorectal tissue (pT3).\n"
        "Lymphovascular invasion: present.  Perineural invasion: not identified.\n"
        "Margins: proximal, distal and radial margins negative; closest is radial at 4 mm.\n"
        "Lymph nodes: 2/15 positive for metastatic adenocarcinoma (pN1b).\n"
        "AJCC 8th edition: pT3 pN1b.\n\n"
        "MICROSCOPIC DESCRIPTION\nSections show a moderately differentiated adeno-\n"
        "carcinoma with dirty necrosis. Focal mucinous differentiation (<10%) is seen. "
        "No signet ring cells. The background mucosa shows a residual TVA with HGD.\n"
    ),
    "prostate_biopsy": (
        "PROSTATE, NEEDLE CORE BIOPSIES (12 CORES)\n\n"
        "DIAGNOSIS:\n"
        "1. PROSTATE, RIGHT BASE, NEEDLE BIOPSY: PROSTATIC ADENOCARCINOMA, GLEASON SCORE 3+4=7 "
        "(GRADE GROUP 2), INVOLVING 2 OF 2 CORES AND 40% OF TISSUE.\n"
        "2. PROSTATE, RIGHT MID: HIGH-GRADE PROSTATIC INTRAEPITHELIAL NEOPLASIA (HGPIN).\n"
        "3. PROSTATE, RIGHT APEX: BENIGN PROSTATIC TISSUE.\n"
        "4. PROSTATE, LEFT BASE: ATYPICAL SMALL ACINAR PROLIFERATION (ASAP), SEE COMMENT.\n"
        "5. PROSTATE, LEFT MID: ADENOCARCINOMA, GLEASON 4+3=7, PERINEURAL INVASION PRESENT.\n"
        "6. PROSTATE, LEFT APEX: NEGATIVE FOR CARCINOMA.\n\n"
        "COMMENT: Immunostains for p63 and HMWCK show loss of basal cells in the focus in part 4; "
        "AMACR is weakly positive. The findings are suspicious for but not diagnostic of carcinoma. "
        "Repeat biopsy is recommended. Reviewed with Dr. Halvard Peneloux, who agrees.\n"
    ),
    "cervix_leep": (
        "Specimen: Cervix, LEEP, 12 o'clock marked with suture.\n"
        "Clinical: HSIL on Pap; colposcopy showed acetowhite change. r/o invasion.\n\n"
        "Final diagnosis:\n"
        "Cervix, loop electrosurgical excision:\n"
        "- High-grade squamous intraepithelial lesion (HSIL; CIN 2-3), extending to the "
        "endocervical margin.\n"
        "- Ectocervical margin free of dysplasia.\n"
        "- No invasive carcinoma identified.\n"
        "- p16 immunostain: block-positive in the lesion.\n"
        "Note: koilocytosis consistent with HPV cytopathic effect is present at the periphery "
        "(LSIL/CIN1 component).\n\n"
        "Gross: Received fresh is a cone of cervix measuring 2.2 x 2.0 x 0.9 cm. The specimen is "
        "serially sectioned clockwise and entirely submitted in cassettes A1-A12.\n"
    ),
    "duodenum_biopsy": (
        "Duodenal biopsies x4 (D2).\n"
        "History: iron deficiency anaemia, anti-tTG raised. ? coeliac disease.\n\n"
        "Microscopy: Four well-orientated fragments of small bowel mucosa. There is subtotal "
        "villous atrophy with crypt hyperplasia and increased intraepithelial lymphocytes "
        "(IELs >40/100 enterocytes). Lamina propria shows a mild increase in plasma cells. "
        "Brunner's glands are unremarkable. No Giardia seen. No granulomas.\n\n"
        "Conclusion: Duodenal mucosa with subtotal villous atrophy, crypt hyperplasia and "
        "intraepithelial lymphocytosis, Marsh 3b. In the appropriate serological context the "
        "appearances are consistent with coeliac disease.\n"
    ),
    "lung_lobectomy": (
        "DIAGNOSIS:\nA. Lung, right upper lobe, lobectomy:\n"
        "   Invasive adenocarcinoma, acinar predominant (60%), with papillary (30%) and "
        "lepidic (10%) patterns.\n"
        "   Tumour size: 2.8 cm.  Visceral pleural invasion: not identified.\n"
        "   Bronchial and vascular margins negative.  pT1c pN0.\n"
        "B. Lymph node, station 4R, excision: one lymph node negative for metastatic "
        "carcinoma (0/1).\n"
        "C. Lymph node, station 7: Non-small cell carcinoma, favour squamous cell carcinoma "
        "is NOT seen; three lymph nodes negative (0/3).\n\n"
        "COMMENT: TTF-1 positive, p40 negative in tumour cells. EGFR and ALK testing sent "
        "to the molecular laboratory. A separate 0.3 cm carcinoid tumorlet is noted.\n"
    ),
    "breast_core": (
        "Left breast, 2 o'clock, 4 cm FN, ultrasound-guided core biopsy:\n"
        "  INVASIVE DUCTAL CARCINOMA (NST), Nottingham grade 2 (tubules 3, nuclei 2, mitoses 1 = 6/9).\n"
        "  Ductal carcinoma in situ (DCIS), intermediate nuclear grade, cribriform type, present.\n"
        "  Lymphovascular invasion: not identified.\n"
        "  Microcalcifications: present in DCIS.\n\n"
        "Biomarkers (block A2):\n  ER: positive (95%, strong).\n  PR: positive (20%, moderate).\n"
        "  HER2 (IHC): 2+ (equivocal); ISH to follow.\n  Ki-67: 18%.\n\n"
        "Comment: No lobular carcinoma in situ (LCIS) or atypical ductal hyperplasia (ADH) "
        "is seen. A separate fibroadenoma noted on imaging was not sampled.\n"
    ),
    "ocr_noise": (
        "Page 1 of 2   FERNHOLLOW VALLEY PATH0LOGY   IIIlIIIlIII 1I1IlI\n"
        "F1NAL DIAGNOSIS:\nA. RECTUM, LOW ANTERIOR RESECTION:\n"
        "  - ADENOCARCNOMA, MODERATELY DIFFERENTIATED, INVADING INTO SUBSEROSA.\n"
        "  - TUBULOVILOUS ADENOMA WITH HIGH GRADE DYSPLSIA AT THE PERIPHERY.\n"
        "  - TWELVE LYMPH NODES NEGATIVE FOR CARCINORNA (0/12).\n"
        "  - MARGINS FREE OF TUM0R.\n"
        "COrnMENT: Sections reviewed at the consensus conference. The adeno carcinoma shows "
        "no mucinous component.\nSize: 4.1 em.  Signed: Dr. Taveril Omsby 04/02/2021\n"
    ),
    "negated_history": (
        "CLINICAL INFORMATION: 63F, prior right hemicolectomy 2016 for adenocarcinoma. "
        "Family history of colorectal carcinoma (mother). Rule out recurrence.\n\n"
        "DIAGNOSIS: Anastomosis, biopsy: Colonic mucosa with mild chronic inflammation. "
        "No dysplasia or malignancy identified. Negative for recurrent adenocarcinoma.\n\n"
        "Addendum (05/06/2022): Levels examined; the diagnosis is unchanged.\n"
    ),
    "synoptic_colon": (
        "SYNOPTIC REPORT - COLON AND RECTUM RESECTION\n"
        "Procedure: Right hemicolectomy\n"
        "Tumor Site: Cecum\n"
        "Histologic Type: Mucinous adenocarcinoma\n"
        "Histologic Grade: G2, moderately differentiated\n"
        "Tumor Size: Greatest dimension: 5.5 cm\n"
        "Tumor Extent: Invades through the visceral peritoneum (pT4a)\n"
        "Lymphovascular Invasion: Not identified\n"
        "Perineural Invasion: Present\n"
        "Tumor Deposits: Not identified\n"
        "Margins: All margins negative for invasive carcinoma\n"
        "Regional Lymph Nodes: Number involved: 0; Number examined: 22 (pN0)\n"
        "Mismatch repair: MLH1, PMS2, MSH2 and MSH6 retained.\n"
    ),
    "stomach_hp": (
        "Gastric antrum and body biopsies:\n"
        "Chronic active gastritis with Helicobacter-like organisms. HP immunostain positive.\n"
        "No intestinal metaplasia, dysplasia or malignancy.\n"
        "Duodenum, D1 biopsy: normal villous architecture; no increase in IELs.\n"
    ),
    "defined_abbreviation": (
        "Colon, transverse, polypectomy: traditional serrated adenoma (TSA) with low-grade "
        "dysplasia. The TSA is completely excised. Background mucosa unremarkable.\n"
        "Comment: intramucosal carcinoma (IMC) is not identified in the TSA.\n"
    ),
}

_NAMES = ("Pellworth", "Anstrade", "Quillane", "Morrowick", "Tessaly", "Bramhurst", "Oddvane")


def make_corpus(n: int, *, seed: int = 7) -> list[str]:
    """``n`` invented reports: the fixed ones with numbers and names varied."""
    rng = random.Random(seed)
    base = list(REPORTS.values())
    out = []
    for i in range(n):
        text = base[i % len(base)]
        text = text.replace(
            "FV-24-018832", f"FV-{rng.randint(10, 25)}-{rng.randint(0, 999999):06d}"
        )
        text = text.replace("QUILLANE", rng.choice(_NAMES).upper())
        text = text.replace("0.6 x 0.4", f"{rng.randint(1, 9) / 10} x {rng.randint(1, 9) / 10}")
        text = text.replace("2/15", f"{rng.randint(0, 5)}/{rng.randint(6, 30)}")
        text = text.replace("5.5 cm", f"{rng.randint(10, 90) / 10} cm")
        out.append(text)
    return out
