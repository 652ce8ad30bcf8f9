"""Headers run into text, and form fields that are not sentences.

Form exports glue a value to the next field's name ("Tumor site: Sigmoid
colonHistologic type: AdenocarcinomaHistologic grade: ..."); OCR drops the
colon and space after a header; "IMPRESSION:" heads the diagnosis in some
laboratories; a negation in one form field ("Ethnicity: Not Hispanic") must
not reach the next field.  Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler
from pathsieve.normalize import normalize


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


@pytest.mark.parametrize(
    ("scheme", "text", "key", "written"),
    [
        ("colorectal",
         "LARGE INTESTINE CHECKLIST\nSpecimen type:  Colectomy\nSpecimen size:  Not specifiedTumor "
         "site:  Sigmoid colonHistologic type:  AdenocarcinomaHistologic grade:  Moderately "
         "differentiatedTumor extent:  Subserosa\n",
         "adenocarcinoma", "Adenocarcinoma"),
        ("lung", "DIAGNOSISInvasive squamous cell carcinoma of the right upper lobe.\n",
         "squamous_cell_carcinoma", "squamous cell carcinoma"),
        ("cervix",
         "CLINICAL HISTORY:\nICD 9: 000.0\nSPECIMEN:\n1. CERVIX - BIOPSY\nIMPRESSION:\n"
         "CERVICAL BIOPSY:\nInvasive squamous cell carcinoma, nonkeratinizing.\n",
         "squamous_cell_carcinoma", "squamous cell carcinoma"),
        ("colorectal",
         "Race: Other Ethnicity: Not Hispanic or Latino Specific Ethnicity:\n"
         "Histologic Subtype: Colon adenocarcinoma Date of Diagnosis:\n",
         "adenocarcinoma", "Colon adenocarcinoma"),
    ],
)  # fmt: skip
def test_diagnosis_read_through_form_layout(scheme: str, text: str, key: str, written: str) -> None:
    res = _labeler(scheme).label_report(text)
    assert res.case.states[key].state == "present"
    texts = [r.mention.text for r in res.evidence if r.mention and r.decides and key in r.labels]
    assert any(written in t for t in texts), texts


@pytest.mark.parametrize(
    ("text", "normalised"),
    [
        ("Sigmoid colonHistologic type", "sigmoid colon histologic type"),
        ("AdenocarcinomaHistologic grade", "adenocarcinoma histologic grade"),
        # short lower-case heads are names or categories, not run-together words
        ("McDonald criteria", "mcdonald criteria"),
        ("ypTis pN0", "yptis pn0"),
        ("HER2/neu", "her2/neu"),
    ],
)
def test_run_together_words_are_split_with_exact_offsets(text: str, normalised: str) -> None:
    n = normalize(text)
    assert n.text == normalised
    for word in normalised.split():
        at = n.text.find(word)
        s, e = n.to_original(at, at + len(word))
        assert text[s:e].lower().replace(" ", "") == word.replace(" ", "")
