"""The report-wide shortcuts of the value readers give what a pass over each region would.

The stems of every anchor are found once per report and shared out to its regions;
T/N/M letters are found once per report; a reader whose gate words are absent from
a region is not run there.  Each test checks one shortcut against the slow way it
replaces, over every region (start, end) of short invented reports, region ends
cutting words included.
"""

from __future__ import annotations

import pytest

from pathsieve.values import readers
from pathsieve.values.common import _INDEX, Region, Report, present
from pathsieve.values.tnm import TNMReader

# Invented texts, each built around a case where a region's end changes what is found:
# a short stem cut out of a longer word ("no" in "node", "nodes"), abbreviations
# matched as written, overlapping as-written stems ("ER" in "HER2", "SBR" in "mSBR"),
# category letters whose look-ahead a region's end cuts ("pT2", "N0").
TEXTS = [
    "DIAGNOSIS: no tumor in two of fifteen lymph nodes (0/15); node free. LN 0/3.",
    "HER2 IHC 2+; ER positive (90%), PgR negative. mSBR grade 2 (tubules 3, nuclei 2).",
    "Gleason score 3+4=7, Grade Group 2. pT2 N0 MX. Margins: negative, closest 2 mm.",
    "Tumor size: 2.5 x 1.8 cm. No lymphovascular invasion (LVI). pTis NO nonodes.",
    "Marsh 3a; one of one node, no. of nodes: 1; TNM: T3N1bM0; ypT0 (0/12)",
]
# A capital sigma lower-cases by its context: such a report takes the slow path.
SIGMA = "ΣΙΓΜΑ tumor no nodes: ΟΔΟΣ 2 of 3 lymph nodes, pT2 N1; HER2 negative."


def _regions(text: str, step: int) -> list[tuple[int, int]]:
    n = len(text)
    return [(s, e) for s in range(0, n, step) for e in range(s + 1, n + 1, step)]


def _slow_positions(region: Region) -> dict[int, list[int]]:
    """A pass over the region alone, as every region was read before."""
    alone = Region.of(Report(region.body), 0, len(region.body), region.section, region.part)
    return _INDEX._region_positions(alone)


@pytest.fixture(scope="module", autouse=True)
def _built() -> None:
    readers()  # every anchor exists before the first region is read


@pytest.mark.parametrize("text", [*TEXTS, SIGMA])
def test_report_index_matches_a_pass_over_each_region(text: str) -> None:
    report = Report(text)
    for s, e in _regions(text, 1 if len(text) < 90 else 2):
        region = Region.of(report, s, e, "diagnosis", "")
        assert region.low == Region.of(Report(region.body), 0, e - s, "", "").low
        assert present(region) == _slow_positions(region), (s, e, region.body)


def test_sigma_report_reads_each_region_alone() -> None:
    assert not Report(SIGMA).whole
    assert all(Report(t).whole for t in TEXTS)


@pytest.mark.parametrize("text", TEXTS)
@pytest.mark.parametrize("letter", ["T", "N", "M"])
def test_tnm_letters_match_a_scan_of_each_region(text: str, letter: str) -> None:
    tnm = next(r for r in readers() if isinstance(r, TNMReader))
    scan = tnm._cands[letter]
    report = Report(text)
    for s, e in _regions(text, 1):
        region = Region.of(report, s, e, "diagnosis", "")
        expected = [m.start() for m in scan.finditer(region.body)]
        assert tnm._letters(region, letter) == expected, (s, e, region.body)


@pytest.mark.parametrize("text", [*TEXTS, SIGMA])
def test_a_gated_reader_reads_nothing_without_its_words(text: str) -> None:
    report = Report(text)
    gated = [r for r in readers() if getattr(r, "gate", None) is not None]
    assert len(gated) == 8  # every reader but TNM and lymph nodes has a gate
    for s, e in _regions(text, 3):
        region = Region.of(report, s, e, "diagnosis", "")
        found = present(region)
        for r in gated:
            if r.gate.isdisjoint(found):  # type: ignore[attr-defined]
                assert r.read(region) == [], (type(r).__name__, s, e)
