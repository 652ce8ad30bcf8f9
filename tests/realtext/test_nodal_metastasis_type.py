"""A cervix or lung report whose primary's type is lost: the nodal metastasis names it.

Real exports lose the primary tumour's type word to OCR ("SCEL4.3 CM IN
GREATEST DIMENSION") while the lymph-node parts still read "metastatic
squamous carcinoma".  The cervix scheme declares, as data, that metastatic
squamous cell carcinoma makes squamous cell carcinoma *likely* in a part that
names no type of its own (practice: squamous carcinoma in a cervix
specimen's pelvic nodes is the cervical primary's spread; WHO Female Genital
Tumours 2020 for squamous carcinoma as the common cervical type, from
memory).  Metastatic adenocarcinoma implies nothing: it may come from the
endometrium or the adnexa.  Every fragment is invented (fictional Northgate
Lane laboratory).
"""

from __future__ import annotations

from functools import cache

from pathsieve import Labeler


@cache
def _labeler() -> Labeler:
    return Labeler("cervix")


LOST_TYPE = (
    "DIAGNOSIS:\n"
    "UTERUS, CERVIX, RADICAL HYSTERECTOMY\n"
    "- POORLY DIFFERENTIATED\n"
    "SCEL3.8 CM IN GREATEST DIMENSION.\n"
    "- MARGINS OF RESECTION ARE FREE OF TUMOR\n"
    "LYMPH NODES, LEFT PELVIC, DISSECTION\n"
    "- {finding} IN 2 OF 13 LYMPH NODES (2/13)\n"
    "LYMPH NODES, RIGHT PELVIC, DISSECTION\n"
    "- NO EVIDENCE OF MALIGNANCY IN 11 LYMPH NODES (0/11)\n"
)


def _states(text: str) -> dict[str, tuple[str, bool]]:
    res = _labeler().label_report(text)
    return {k: (s.state, s.implied) for k, s in res.case.states.items()}


def test_metastatic_squamous_carcinoma_makes_squamous_likely() -> None:
    states = _states(LOST_TYPE.format(finding="METASTATIC SQUAMOUS CARCINOMA"))
    assert states["squamous_cell_carcinoma"] == ("likely", True)


def test_metastatic_adenocarcinoma_implies_nothing() -> None:
    states = _states(LOST_TYPE.format(finding="METASTATIC ADENOCARCINOMA"))
    assert "squamous_cell_carcinoma" not in states
    assert states.get("adenocarcinoma", ("absent", False))[0] != "present"


def test_a_named_primary_keeps_its_own_state() -> None:
    text = LOST_TYPE.format(finding="METASTATIC SQUAMOUS CARCINOMA").replace(
        "SCEL3.8 CM", "INVASIVE SQUAMOUS CELL CARCINOMA, 3.8 CM"
    )
    states = _states(text)
    assert states["squamous_cell_carcinoma"] == ("present", False)


def test_a_negated_metastasis_implies_nothing() -> None:
    states = _states(LOST_TYPE.format(finding="NEGATIVE FOR METASTATIC SQUAMOUS CARCINOMA"))
    assert "squamous_cell_carcinoma" not in states


# Lung: the same reading, only in a part that names a lymph node (regional nodes of a
# lung specimen drain the lung; practice).  Metastatic squamous carcinoma in the lung
# itself may come from the head and neck, so a part without a node implies nothing.
LUNG_PART = (
    "FINAL DIAGNOSIS:\n"
    "PART 1: LUNG, LEFT UPPER LOBE, LOBECTOMY-\n"
    "A. INVASIVE MODERATELY DIFFERENTIATED SQUAMOIJS GEbb CARCINOMA, 4.1 CM.\n"
    "B. {finding}\n"
)


def _lung_states(text: str) -> dict[str, tuple[str, bool]]:
    res = Labeler("lung").label_report(text)
    return {k: (s.state, s.implied) for k, s in res.case.states.items()}


def test_lung_nodal_squamous_metastasis_makes_squamous_likely() -> None:
    text = LUNG_PART.format(
        finding="ONE OF NINE HILAR LYMPH NODES POSITIVE FOR METASTATIC SQUAMOUS CELL CARCINOMA."
    )
    assert _lung_states(text)["squamous_cell_carcinoma"] == ("likely", True)


def test_lung_squamous_metastasis_without_a_node_implies_nothing() -> None:
    text = LUNG_PART.format(finding="METASTATIC SQUAMOUS CELL CARCINOMA, SEE COMMENT.")
    states = _lung_states(text)
    assert "squamous_cell_carcinoma" not in states
    assert states["metastatic_carcinoma"][0] == "present"


def test_lung_named_adenocarcinoma_blocks_the_reading() -> None:
    text = LUNG_PART.format(
        finding="ONE OF NINE HILAR LYMPH NODES POSITIVE FOR METASTATIC SQUAMOUS CELL CARCINOMA."
    ).replace("SQUAMOIJS GEbb CARCINOMA", "ADENOCARCINOMA, ACINAR")
    states = _lung_states(text)
    assert states["adenocarcinoma"] == ("present", False)
    assert "squamous_cell_carcinoma" not in states
