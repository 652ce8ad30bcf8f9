"""Report wordings roll up through the ontology to the right scheme labels.

Each case looks a wording up in the shipped ontology (names and synonyms, normalised) and collects
the labels the scheme gives every concept it names, via scheme classes and is_a ancestors.
"""

from __future__ import annotations

import pytest

from pathsieve.ontology import Ontology, load_ontology
from pathsieve.schemes import load_scheme

# (scheme, wording as written in a report, expected label keys)
CASES = [
    # colorectal (source: WHO Digestive System Tumours 5th ed., 2019)
    ("colorectal", "mucinous adenocarcinoma", {"adenocarcinoma"}),
    ("colorectal", "Adenocarcinoma, mucinous type", {"adenocarcinoma"}),
    ("colorectal", "signet-ring cell carcinoma", {"adenocarcinoma"}),
    ("colorectal", "medullary carcinoma", {"adenocarcinoma"}),
    ("colorectal", "serrated adenocarcinoma", {"adenocarcinoma"}),
    ("colorectal", "invasive adenocarcinoma", {"adenocarcinoma"}),
    ("colorectal", "invasive carcinoma", {"adenocarcinoma"}),  # (practice)
    ("colorectal", "adenocarcinoma of the colon", {"adenocarcinoma"}),
    ("colorectal", "intramucosal adenocarcinoma", {"high_grade_dysplasia"}),  # pTis
    ("colorectal", "carcinoma in situ", {"high_grade_dysplasia"}),
    ("colorectal", "adenocarcinoma in situ", {"high_grade_dysplasia"}),
    ("colorectal", "high-grade dysplasia", {"high_grade_dysplasia"}),
    ("colorectal", "HGD", {"high_grade_dysplasia"}),
    ("colorectal", "high grade intraepithelial neoplasia", {"high_grade_dysplasia"}),
    ("colorectal", "severe dysplasia", {"high_grade_dysplasia"}),
    ("colorectal", "low-grade dysplasia", {"low_grade_dysplasia"}),
    ("colorectal", "mild dysplasia", {"low_grade_dysplasia"}),
    ("colorectal", "tubular adenoma", set()),  # grade comes from the implication, not the class
    ("colorectal", "TVA", set()),
    ("colorectal", "hyperplastic polyp, microvesicular type", {"hyperplastic_polyp"}),
    ("colorectal", "goblet cell-rich hyperplastic polyp", {"hyperplastic_polyp"}),
    ("colorectal", "sessile serrated adenoma/polyp", {"sessile_serrated_lesion"}),
    ("colorectal", "SSA/P", {"sessile_serrated_lesion"}),
    ("colorectal", "SSL", {"sessile_serrated_lesion"}),
    ("colorectal", "sessile serrated lesion with dysplasia", {"sessile_serrated_lesion"}),
    ("colorectal", "sessile serrated polyp without dysplasia", {"sessile_serrated_lesion"}),
    ("colorectal", "traditional serrated adenoma", set()),
    ("colorectal", "colonic mucosa with no significant abnormality", {"normal"}),
    ("colorectal", "unremarkable colonic mucosa", {"normal"}),
    ("colorectal", "benign colonic mucosa", {"normal"}),
    ("colorectal", "no significant histopathologic abnormality", {"normal"}),
    ("colorectal", "squamous cell carcinoma in situ", set()),
    # prostate (source: ISUP 2014; WHO 2016)
    ("prostate", "adenocarcinoma", {"adenocarcinoma"}),
    ("prostate", "acinar adenocarcinoma", {"adenocarcinoma"}),  # shared with the lung pattern
    ("prostate", "prostatic adenocarcinoma, ductal type", {"adenocarcinoma"}),
    ("prostate", "foamy gland adenocarcinoma", {"adenocarcinoma"}),
    ("prostate", "atypical small acinar proliferation", {"atypical_glands"}),
    ("prostate", "atypical glands suspicious for carcinoma", {"atypical_glands"}),
    ("prostate", "HGPIN", {"hgpin"}),
    ("prostate", "high-grade prostatic intraepithelial neoplasia", {"hgpin"}),
    ("prostate", "low-grade PIN", set()),
    ("prostate", "high-grade PIN with adjacent atypical glands", {"hgpin", "atypical_glands"}),
    ("prostate", "intraductal carcinoma of prostate", set()),
    ("prostate", "benign prostatic tissue", {"benign"}),
    ("prostate", "BPH", {"benign"}),
    ("prostate", "nodular hyperplasia of prostate", {"benign"}),
    ("prostate", "partial atrophy", {"benign"}),
    ("prostate", "chronic prostatitis", {"benign"}),
    # cervix (source: LAST 2012; WHO Female Genital Tumours 5th ed., 2020)
    ("cervix", "CIN 3", {"hsil"}),
    ("cervix", "CIN III", {"hsil"}),
    ("cervix", "CIN 2", {"hsil"}),
    ("cervix", "CIN 2-3", {"hsil"}),
    ("cervix", "CIN II/III", {"hsil"}),
    ("cervix", "HSIL", {"hsil"}),
    ("cervix", "high-grade squamous intraepithelial lesion", {"hsil"}),
    ("cervix", "squamous cell carcinoma in situ", {"hsil"}),
    ("cervix", "severe dysplasia", {"hsil"}),
    ("cervix", "CIN 1", {"lsil"}),
    ("cervix", "LSIL", {"lsil"}),
    ("cervix", "mild dysplasia", {"lsil"}),
    ("cervix", "condyloma acuminatum", {"lsil"}),
    ("cervix", "koilocytosis", {"lsil"}),
    ("cervix", "HPV cytopathic effect", {"lsil"}),
    ("cervix", "keratinizing squamous cell carcinoma", {"squamous_cell_carcinoma"}),
    ("cervix", "microinvasive squamous cell carcinoma", {"squamous_cell_carcinoma"}),
    ("cervix", "squamous cell carcinoma, HPV-associated", {"squamous_cell_carcinoma"}),
    ("cervix", "endocervical adenocarcinoma, usual type", {"adenocarcinoma"}),
    ("cervix", "HPV-associated adenocarcinoma", {"adenocarcinoma"}),
    ("cervix", "adenocarcinoma in situ", {"adenocarcinoma_in_situ"}),
    ("cervix", "AIS", {"adenocarcinoma_in_situ"}),
    ("cervix", "endocervical adenocarcinoma in situ", {"adenocarcinoma_in_situ"}),
    ("cervix", "high-grade CGIN", {"adenocarcinoma_in_situ"}),
    ("cervix", "negative for intraepithelial lesion or malignancy", {"benign"}),
    ("cervix", "NILM", {"benign"}),
    ("cervix", "chronic cervicitis", {"benign"}),
    ("cervix", "squamous metaplasia", {"benign"}),
    ("cervix", "benign ectocervical mucosa", {"benign"}),
    # duodenum (source: Marsh 1992; Oberhuber 1999)
    ("duodenum", "gluten-sensitive enteropathy", {"celiac_disease"}),
    ("duodenum", "coeliac disease", {"celiac_disease"}),
    ("duodenum", "celiac sprue", {"celiac_disease"}),
    ("duodenum", "GSE", {"celiac_disease"}),
    ("duodenum", "partial villous atrophy", {"villous_atrophy"}),
    ("duodenum", "subtotal villous atrophy", {"villous_atrophy"}),
    ("duodenum", "total villous atrophy", {"villous_atrophy"}),
    ("duodenum", "villous blunting", {"villous_atrophy"}),
    ("duodenum", "flat mucosa", {"villous_atrophy"}),
    ("duodenum", "intraepithelial lymphocytosis", {"intraepithelial_lymphocytosis"}),
    ("duodenum", "increased intraepithelial lymphocytes", {"intraepithelial_lymphocytosis"}),
    ("duodenum", "increased IELs", {"intraepithelial_lymphocytosis"}),
    ("duodenum", "intraepithelial lymphocytes", set()),  # the cells, not an increase
    ("duodenum", "crypt hyperplasia", {"crypt_hyperplasia"}),
    ("duodenum", "crypt hyperplastic villous atrophy", {"villous_atrophy", "crypt_hyperplasia"}),
    ("duodenum", "normal duodenal mucosa", {"normal"}),
    ("duodenum", "duodenal mucosa with no significant abnormality", {"normal"}),
    ("duodenum", "peptic duodenitis", set()),
    ("duodenum", "normal villous architecture", set()),
    ("duodenum", "Brunner gland hyperplasia", set()),
    # lung (source: WHO Thoracic Tumours 5th ed., 2021)
    ("lung", "lepidic predominant adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "acinar adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "papillary predominant adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "micropapillary predominant adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "solid adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "invasive mucinous adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "minimally invasive adenocarcinoma", {"adenocarcinoma"}),
    ("lung", "MIA", {"adenocarcinoma"}),
    ("lung", "adenocarcinoma of the lung", {"adenocarcinoma"}),
    ("lung", "adenocarcinoma in situ of lung", set()),
    ("lung", "lung adenocarcinoma in situ", set()),
    ("lung", "adenocarcinoma in situ", set()),
    ("lung", "non-mucinous adenocarcinoma in situ", set()),
    ("lung", "squamous cell carcinoma", {"squamous_cell_carcinoma"}),
    ("lung", "keratinizing squamous cell carcinoma", {"squamous_cell_carcinoma"}),
    ("lung", "non-keratinising squamous cell carcinoma", {"squamous_cell_carcinoma"}),
    ("lung", "basaloid squamous cell carcinoma", {"squamous_cell_carcinoma"}),
    ("lung", "small cell carcinoma", {"small_cell_carcinoma"}),
    ("lung", "SCLC", {"small_cell_carcinoma"}),
    ("lung", "combined small cell carcinoma", {"small_cell_carcinoma"}),
    ("lung", "large cell carcinoma", {"large_cell_carcinoma"}),
    ("lung", "LCNEC", {"large_cell_carcinoma"}),
    ("lung", "non-small cell carcinoma, NOS", {"nsclc_nos"}),
    ("lung", "NSCLC", {"nsclc_nos"}),
    ("lung", "typical carcinoid", {"carcinoid"}),
    ("lung", "atypical carcinoid tumour", {"carcinoid"}),
    ("lung", "carcinoid tumor", {"carcinoid"}),
    ("lung", "metastatic adenocarcinoma", {"metastatic_carcinoma"}),
    ("lung", "metastatic colorectal adenocarcinoma", {"metastatic_carcinoma"}),
    ("lung", "metastatic squamous cell carcinoma", {"metastatic_carcinoma"}),
    ("lung", "metastatic carcinoma", {"metastatic_carcinoma"}),
    ("lung", "negative for malignancy", {"benign"}),
    ("lung", "benign lung parenchyma", {"benign"}),
    ("lung", "benign lymphoid tissue", {"benign"}),
    ("lung", "granuloma", set()),
    ("lung", "organizing pneumonia", set()),
    # breast (source: WHO Breast Tumours 5th ed., 2019)
    ("breast", "invasive ductal carcinoma", {"invasive_ductal_carcinoma"}),
    ("breast", "IDC", {"invasive_ductal_carcinoma"}),
    ("breast", "infiltrating duct carcinoma", {"invasive_ductal_carcinoma"}),
    ("breast", "invasive carcinoma of no special type", {"invasive_ductal_carcinoma"}),
    ("breast", "invasive lobular carcinoma", {"invasive_lobular_carcinoma"}),
    ("breast", "pleomorphic invasive lobular carcinoma", {"invasive_lobular_carcinoma"}),
    ("breast", "ILC", {"invasive_lobular_carcinoma"}),
    (
        "breast",
        "invasive carcinoma with ductal and lobular features",
        {"invasive_ductal_carcinoma", "invasive_lobular_carcinoma"},
    ),
    ("breast", "DCIS", {"dcis"}),
    ("breast", "ductal carcinoma in situ, high nuclear grade", {"dcis"}),
    ("breast", "intraductal carcinoma", {"dcis"}),  # shared with intraductal carcinoma of prostate
    ("breast", "LCIS", {"lcis"}),
    ("breast", "pleomorphic lobular carcinoma in situ", {"lcis"}),
    ("breast", "atypical ductal hyperplasia", {"atypical_ductal_hyperplasia"}),
    ("breast", "ADH", {"atypical_ductal_hyperplasia"}),
    ("breast", "atypical lobular hyperplasia", set()),
    ("breast", "fibroadenoma", {"fibroadenoma"}),
    ("breast", "complex fibroadenoma", {"fibroadenoma"}),
    ("breast", "fibrocystic changes", {"benign"}),
    ("breast", "usual ductal hyperplasia", {"benign"}),
    ("breast", "benign breast tissue", {"benign"}),
    ("breast", "flat epithelial atypia", set()),
    ("breast", "phyllodes tumour", set()),
    ("breast", "intraductal papilloma", set()),
]


@pytest.fixture(scope="module")
def onto() -> Ontology:
    return load_ontology()


@pytest.mark.parametrize(("scheme_name", "text", "expected"), CASES)
def test_wording_rolls_up(onto: Ontology, scheme_name: str, text: str, expected: set[str]) -> None:
    ids = onto.lookup(text)
    assert ids, f"{text!r} is not a name or synonym in the ontology"
    scheme = load_scheme(scheme_name)
    got = {key for cid in ids for key in scheme.labels_for(cid)}
    assert got == expected


@pytest.mark.parametrize(
    ("child", "ancestor", "expected"),
    [
        # source: WHO Classification of Tumours (hierarchy of types)
        ("mucinous adenocarcinoma", "adenocarcinoma", True),
        ("mucinous adenocarcinoma", "carcinoma", True),
        ("mucinous adenocarcinoma", "malignant neoplasm", True),
        ("mucinous adenocarcinoma", "neoplasm", True),
        ("mucinous adenocarcinoma", "disease or finding", True),
        # source: LAST 2012 (CIN 3 is HSIL, a squamous intraepithelial lesion)
        ("CIN 3", "high-grade squamous intraepithelial lesion", True),
        ("CIN 3", "squamous intraepithelial lesion", True),
        ("CIN 1", "low-grade squamous intraepithelial lesion", True),
        ("CIN 1", "high-grade squamous intraepithelial lesion", False),
        # source: WHO Thoracic Tumours 2021 (AIS is a preinvasive lesion, MIA is invasive)
        ("adenocarcinoma in situ of lung", "lung adenocarcinoma", False),
        ("adenocarcinoma in situ of lung", "adenocarcinoma", False),
        ("minimally invasive adenocarcinoma", "lung adenocarcinoma", True),
        ("large cell neuroendocrine carcinoma", "neuroendocrine carcinoma", True),
        ("typical carcinoid", "neuroendocrine tumor", True),
        # source: WHO Digestive System Tumours 2019
        ("tubular adenoma", "conventional adenoma", True),
        ("sessile serrated lesion", "conventional adenoma", False),
        ("hyperplastic polyp", "serrated polyp", True),
        ("intramucosal carcinoma", "adenocarcinoma", False),
        # source: ISUP 2014 (prostatic acinar adenocarcinoma is not acinar cell carcinoma)
        ("prostatic acinar adenocarcinoma", "acinar cell carcinoma", False),
        ("high-grade prostatic intraepithelial neoplasia", "adenocarcinoma", False),
        # site and procedure roll-ups
        ("sigmoid colon", "colon", True),
        ("cecum", "right colon", True),
        ("right upper lobe", "lung", True),
        ("lingula", "left upper lobe", True),
        ("left apex of prostate", "prostate", True),
        ("transformation zone of cervix", "uterine cervix", True),
        ("second part of duodenum", "duodenum", True),
        ("station 7", "mediastinal lymph node", True),
        ("LLETZ", "cervical excisional procedure", True),
        ("cold snare", "polypectomy", True),
        ("EBUS-FNA", "fine needle aspiration", True),
        ("low anterior resection", "colectomy", True),
        ("robot-assisted radical prostatectomy", "radical prostatectomy", True),
    ],
)
def test_is_a(onto: Ontology, child: str, ancestor: str, expected: bool) -> None:
    (c,) = onto.lookup(child)
    (a,) = onto.lookup(ancestor)
    assert onto.is_a(c, a) is expected


@pytest.mark.parametrize(
    ("a", "b"),
    [  # spelling and hyphenation variants reach the same concept
        ("malignant tumour", "malignant tumor"),
        ("carcinoid tumour", "carcinoid tumor"),
        ("coeliac disease", "celiac disease"),
        ("non-keratinising squamous cell carcinoma", "nonkeratinizing squamous cell carcinoma"),
        ("organising pneumonia", "organizing pneumonia"),
        ("haemorrhage", "hemorrhage"),
        ("oesophagus", "esophagus"),
        ("caecum", "cecum"),
        ("oestrogen receptor", "estrogen receptor"),
        ("signet ring cell carcinoma", "signet-ring cell carcinoma"),
        ("tubular adenomas", "tubular adenoma"),
        ("carcinoma, squamous cell", "squamous cell carcinoma"),
        ("Adenocarcinoma, Mucinous Type", "mucinous adenocarcinoma"),
    ],
)
def test_variants_share_a_concept(onto: Ontology, a: str, b: str) -> None:
    assert onto.lookup(a) and onto.lookup(a) == onto.lookup(b)


def test_size_of_vocabulary(onto: Ontology) -> None:
    # several hundred concepts and a few thousand surface forms (brief)
    forms = list(onto.surface_forms())
    assert len(onto) >= 500
    assert len(forms) >= 3000
    roots = [t.label for t in onto.terms.values() if not t.parents]
    assert sorted(roots) == sorted(
        ["disease or finding", "anatomical site", "procedure", "qualifier", "biomarker"]
    )
