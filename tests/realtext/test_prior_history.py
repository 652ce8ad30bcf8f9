"""Prior biopsies and history mentioned beside the current diagnosis.

A carcinoma in the clinical history ("prior biopsy showed adenocarcinoma")
never decides; the current specimen does, even when it says the tumour was
"previously diagnosed".  A distance phrase ("extending no closer than 4 cm")
negates nothing.  Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


@pytest.mark.parametrize(
    ("scheme", "text", "key", "state"),
    [
        ("prostate",
         "CLINICAL HISTORY: Prior biopsy showed adenocarcinoma, Gleason score 3+4=7.\n"
         "DIAGNOSIS: Prostate, radical prostatectomy: no residual carcinoma identified.\n",
         "adenocarcinoma", "absent"),
        ("lung",
         "DIAGNOSIS:\nB. Lung, left lower lobe, resection:\n"
         "Adenocarcinoma, poorly differentiated (2.9 cm), previously\ndiagnosed.\n",
         "adenocarcinoma", "present"),
        ("colorectal",
         "DIAGNOSIS: Segment of sigmoid colon with a tubulovillous adenoma, extending no closer "
         "than 4.5 cm to a resection margin, with high-grade dysplasia and transition into a "
         "moderately differentiated adenocarcinoma.\n",
         "adenocarcinoma", "present"),
        ("colorectal",
         "Clinical History: history of colon carcinoma, status post resection.\n"
         "DIAGNOSIS: Colon, anastomosis, biopsy: benign colonic mucosa, no dysplasia.\n",
         "adenocarcinoma", None),
    ],
)  # fmt: skip
def test_history_and_current_specimen(scheme: str, text: str, key: str, state: str | None) -> None:
    res = _labeler(scheme).label_report(text)
    got = res.case.states.get(key)
    assert (got.state if got else None) == state
    for row in res.evidence:
        m = row.mention
        if m is not None and m.section == "clinical_history":
            assert not row.decides  # history is evidence, never a decision


def test_gleason_of_a_prior_biopsy_is_not_the_case_value() -> None:
    text = (
        "CLINICAL HISTORY: Prior biopsy showed adenocarcinoma, Gleason score 3+3=6.\n"
        "DIAGNOSIS: Prostate, radical prostatectomy: adenocarcinoma, Gleason score 4+3=7.\n"
    )
    res = _labeler("prostate").label_report(text)
    assert res.case.values["gleason_score"].value == "4+3=7"
    assert res.case.values["grade_group"].value == 3
