"""Words broken across lines or by spaces, as OCR and typesetting leave them.

"adeno carcinoma", "carci-\\nnoma", "carci- noma" and a name wrapped over two
lines must still be read as the concept, with evidence spanning the pieces as
written.  Every fragment here is invented.
"""

from __future__ import annotations

from functools import cache

import pytest

from pathsieve import Labeler


@cache
def _labeler(scheme: str) -> Labeler:
    return Labeler(scheme)


@pytest.mark.parametrize(
    ("scheme", "text", "key", "written"),
    [
        ("colorectal", "DIAGNOSIS:\nRectum, biopsy: invasive adeno carcinoma.\n", "adenocarcinoma",
         "adeno carcinoma"),
        ("colorectal", "DIAGNOSIS:\nRectum, biopsy: invasive adeno-\ncarcinoma.\n", "adenocarcinoma",
         "adeno-\ncarcinoma"),
        ("colorectal", "DIAGNOSIS:\nCecum, resection: adenocarci- noma, mucinous type.\n",
         "adenocarcinoma", "adenocarci- noma"),
        ("lung", "DIAGNOSIS:\nLung, lobectomy: moderately differentiated squamous\ncell carcinoma.\n",
         "squamous_cell_carcinoma", "squamous\ncell carcinoma"),
        ("prostate", "DIAGNOSIS:\nProstate, biopsy: ADENOCARCI-\nNOMA, Gleason score 3+3=6.\n",
         "adenocarcinoma", "ADENOCARCI-\nNOMA"),
        ("cervix", "DIAGNOSIS:\nCervix, biopsy: invasive squamous cell carci noma.\n",
         "squamous_cell_carcinoma", "squamous cell carci noma"),
        # two words of a name run together (a lost space)
        ("lung", "DIAGNOSIS:\nLung, lobectomy: SQUAMOUS CELLCARCINOMA, keratinizing.\n",
         "squamous_cell_carcinoma", "SQUAMOUS CELLCARCINOMA"),
        ("colorectal", "DIAGNOSIS:\nSigmoid colon, resection: MUCINOUSADENOCARCINOMA.\n",
         "adenocarcinoma", "MUCINOUSADENOCARCINOMA"),
    ],
)  # fmt: skip
def test_broken_word_is_read_whole(scheme: str, text: str, key: str, written: str) -> None:
    res = _labeler(scheme).label_report(text)
    assert res.case.states[key].state == "present"
    deciding = [r.mention for r in res.evidence if r.decides and r.mention and key in r.labels]
    assert deciding, "no deciding mention"
    m = deciding[0]
    assert text[m.start : m.end] == m.text
    assert written in m.text


@pytest.mark.parametrize(
    "text",
    [
        # two real words side by side are not a broken word
        "DIAGNOSIS:\nColon, biopsy: adenomatous polyp; no carcinoma.\n",
        "DIAGNOSIS:\nColon, biopsy: car noted in the history; benign mucosa.\n",
    ],
)
def test_real_neighbouring_words_are_not_joined(text: str) -> None:
    res = _labeler("colorectal").label_report(text)
    assert res.case.states.get("adenocarcinoma") is None or (
        res.case.states["adenocarcinoma"].state == "absent"
    )
