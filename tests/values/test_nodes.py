"""Lymph-node counts: lymph_nodes_positive and lymph_nodes_examined.

Rule: positive nodes <= examined nodes (AJCC 8th edition counts regional nodes
examined and involved); a count that breaks it is flagged on both values, never
corrected.  All texts are invented.
"""

from __future__ import annotations

from collections.abc import Callable

import pytest

from pathsieve.records import Value

Read = Callable[..., list[Value]]


def counts(read: Read, text: str) -> list[tuple[int | None, int | None, str]]:
    """(positive, examined, evidence) per statement, in order."""
    by_span: dict[tuple[int, int], list[Value]] = {}
    for v in read(text):
        if v.key.startswith("lymph_nodes_"):
            by_span.setdefault((v.start, v.end), []).append(v)
    out = []
    for (_s, _e), vs in sorted(by_span.items()):
        pos = next((v.value for v in vs if v.key == "lymph_nodes_positive"), None)
        exam = next((v.value for v in vs if v.key == "lymph_nodes_examined"), None)
        out.append((pos, exam, vs[0].text))
    return out


FORMS = [
    ("Metastatic carcinoma in 2/15 lymph nodes.", [(2, 15, "2/15")]),
    (
        "Metastatic carcinoma in two of fifteen lymph nodes.",
        [(2, 15, "two of fifteen lymph nodes")],
    ),
    ("Regional lymph nodes negative (0/14).", [(0, 14, "(0/14)")]),
    ("Lymph nodes: 3 positive out of 21", [(3, 21, "3 positive out of 21")]),
    ("No lymph nodes identified.", [(None, 0, "No lymph nodes identified")]),
    (
        "Number of lymph nodes examined: 12; Number of lymph nodes involved: 0",
        [
            (None, 12, "Number of lymph nodes examined: 12"),
            (0, None, "Number of lymph nodes involved: 0"),
        ],
    ),
    (
        "-NO TUMOR SEEN IN TWENTY EIGHT LYMPH NODES.",
        [(0, 28, "NO TUMOR SEEN IN TWENTY EIGHT LYMPH NODES")],
    ),
    ("TWO LYMPH NODES (0/2), NO TUMOR SEEN.", [(0, 2, "TWO LYMPH NODES (0/2), NO TUMOR SEEN")]),
    ("Six benign lymph nodes (0/6).", [(0, 6, "Six benign lymph nodes (0/6)")]),
    (
        "Seventeen lymph nodes, no tumor present.",
        [(0, 17, "Seventeen lymph nodes, no tumor present")],
    ),
    (
        "Two lymph nodes, negative for carcinoma (0/2).",
        [(0, 2, "Two lymph nodes, negative for carcinoma (0/2)")],
    ),
    (
        "Metastatic adenocarcinoma in three of eighteen lymph nodes (3/18).",
        [(3, 18, "three of eighteen lymph nodes (3/18)")],
    ),
    (
        "ONE (1) OF ONE (1) LYMPH NODE WITH METASTATIC ADENOCARCINOMA.",
        [(1, 1, "ONE (1) OF ONE (1) LYMPH NODE")],
    ),
    (
        "NO EVIDENCE OF NEOPLASIA IN THREE (3) LYMPH NODES EXAMINED.",
        [(0, 3, "NO EVIDENCE OF NEOPLASIA IN THREE (3) LYMPH NODES")],
    ),
    (
        "No tumor is identified in a single lymph node.",
        [(0, 1, "No tumor is identified in a single lymph node")],
    ),
    ("Regional lymph nodes: 0 involved / 18 examined", [(0, 18, "0 involved / 18 examined")]),
    ("Regional lymph nodes: 2 involved / 10 examined", [(2, 10, "2 involved / 10 examined")]),
    ("Lymph nodes: 14 examined, 1 positive", [(1, 14, "14 examined, 1 positive")]),
    ("Regional lymph nodes: 0/16 involved", [(0, 16, "0/16")]),
    ("LNs 0/19 (pN0)", [(0, 19, "0/19")]),
    ("LN 2/16 with metastatic carcinoma", [(2, 16, "2/16")]),
    ("Lymph nodes: metastatic squamous carcinoma (3/15)", [(3, 15, "(3/15)")]),
    (
        "Metastatic adenocarcinoma in two of four lymph nodes (2/4).",
        [(2, 4, "two of four lymph nodes (2/4)")],
    ),
    (
        "One lymph node, negative for metastatic carcinoma (0/1).",
        [(0, 1, "One lymph node, negative for metastatic carcinoma (0/1)")],
    ),
    (
        "Twenty one lymph nodes, no tumor present (0/21).",
        [(0, 21, "Twenty one lymph nodes, no tumor present (0/21)")],
    ),
    ("Two benign lymph nodes (0/2).", [(0, 2, "Two benign lymph nodes (0/2)")]),
    (
        "- NO MALIGNANCY IDENTIFIED IN ONE LYMPH NODE (0/1).",
        [(0, 1, "NO MALIGNANCY IDENTIFIED IN ONE LYMPH NODE (0/1)")],
    ),
    ("Lymph nodes: 0/8 positive for metastasis", [(0, 8, "0/8")]),
    ("LYMPH NODES EXAMINED: 17", [(None, 17, "LYMPH NODES EXAMINED: 17")]),
    ("LYMPH NODES POSITIVE: 0", [(0, None, "LYMPH NODES POSITIVE: 0")]),
    (
        "Total number of lymph nodes examined: Fourteen.",
        [(None, 14, "Total number of lymph nodes examined: Fourteen")],
    ),
    (
        "Regional Lymph Nodes\n  Number examined: 15\n  Number involved: 0",
        [(None, 15, "Number examined: 15"), (0, None, "Number involved: 0")],
    ),
    (
        "The total number of regional nodes examined is 24.",
        [(None, 24, "total number of regional nodes examined is 24")],
    ),
    ("Number of nodes examined: 13", [(None, 13, "Number of nodes examined: 13")]),
    ("Number of positive lymph nodes: 2", [(2, None, "Number of positive lymph nodes: 2")]),
    ("Lymph nodes: 1 positive", [(1, None, "Lymph nodes: 1 positive")]),
    ("Sentinel lymph nodes: 0/3.", [(0, 3, "0/3")]),
    ("Metastatic carcinoma in 1 of 65 lymph nodes", [(1, 65, "1 of 65 lymph nodes")]),
    ("pN1 (1/29 total lymph nodes)", [(1, 29, "1/29")]),
    ("pN2 (4/19)", [(4, 19, "(4/19)")]),
    ("Carcinoma in 3 out of 12 lymph nodes.", [(3, 12, "3 out of 12 lymph nodes")]),
    (
        "Metastases in 5 of the 22 regional lymph nodes",
        [(5, 22, "5 of the 22 regional lymph nodes")],
    ),
    (
        "Nine lymph nodes, all free of metastatic carcinoma (0/9).",
        [(0, 9, "Nine lymph nodes, all free of metastatic carcinoma (0/9)")],
    ),
    (
        "Fifteen lymph nodes, negative for malignancy",
        [(0, 15, "Fifteen lymph nodes, negative for malignancy")],
    ),
    ("Eleven lymph nodes, tumor-free", [(0, 11, "Eleven lymph nodes, tumor-free")]),
    ("Four reactive lymph nodes", [(0, 4, "Four reactive lymph nodes")]),
    ("No lymph nodes are identified in the fat.", [(None, 0, "No lymph nodes are identified")]),
    ("No lymph nodes were found.", [(None, 0, "No lymph nodes were found")]),
    ("Three of 14 lymph nodes contain metastatic carcinoma.", [(3, 14, "Three of 14 lymph nodes")]),
    (
        "Metastatic carcinoma in twelve of thirty lymph nodes",
        [(12, 30, "twelve of thirty lymph nodes")],
    ),
    ("Lymph nodes, regional: 0/11", [(0, 11, "0/11")]),
    ("Axillary lymph nodes (2/9) with extranodal extension", [(2, 9, "(2/9)")]),
    (
        "Lymph nodes examined: 10; lymph nodes positive: 0",
        [(None, 10, "Lymph nodes examined: 10"), (0, None, "lymph nodes positive: 0")],
    ),
]


@pytest.mark.parametrize(("text", "expected"), FORMS)
def test_node_forms(
    read: Read, text: str, expected: list[tuple[int | None, int | None, str]]
) -> None:
    assert counts(read, text) == expected


def test_table_has_fifty_forms() -> None:
    assert len(FORMS) >= 50


def test_both_counts_of_a_statement_share_its_span(read: Read) -> None:
    vals = [v for v in read("Carcinoma in 2/15 lymph nodes.") if v.key.startswith("lymph_nodes_")]
    assert {(v.start, v.end) for v in vals} == {(13, 17)}
    assert sorted(v.key for v in vals) == ["lymph_nodes_examined", "lymph_nodes_positive"]


@pytest.mark.parametrize(
    "text",
    [
        "Metastatic carcinoma in 16/15 lymph nodes.",
        "Lymph nodes: 5 involved / 3 examined",
    ],
)
def test_more_positive_than_examined_is_flagged_on_both(read: Read, text: str) -> None:
    # AJCC 8th: involved nodes are a subset of the nodes examined; report, never correct
    vals = [v for v in read(text) if v.key.startswith("lymph_nodes_")]
    assert len(vals) == 2
    assert all("nodes_positive_exceed_examined" in v.flags for v in vals)
    pos = next(v for v in vals if v.key == "lymph_nodes_positive")
    exam = next(v for v in vals if v.key == "lymph_nodes_examined")
    assert pos.value > exam.value


def test_separate_synoptic_counts_are_compared_too(read: Read) -> None:
    text = "Number of lymph nodes examined: 3\nNumber of lymph nodes involved: 5"
    vals = [v for v in read(text) if v.key.startswith("lymph_nodes_")]
    assert all("nodes_positive_exceed_examined" in v.flags for v in vals)


def test_consistent_counts_carry_no_flag(read: Read) -> None:
    assert all(
        v.flags == () for v in read("Carcinoma in 2/15 lymph nodes.") if v.key.startswith("lymph")
    )


@pytest.mark.parametrize(
    "text",
    [
        "Number of N2 lymph nodes examined: 7",  # one station only: partial
        "Nottingham score 6/9",
        "Dated 3/12/2019; lymph nodes submitted.",
        "Gleason score 3+4=7 in 2/12 cores.",
        "Received are 2 of 3 containers.",
        "Metastatic carcinoma in three lymph nodes.",  # no total: not read
        "Lymph nodes: see part C.",
        "Lymph node, left neck, excision: reactive follicular hyperplasia.",
        "No lymph node metastasis identified.",
        "The lymph node measures 1.2 cm.",
        "Two of three cores show carcinoma.",
    ],
)
def test_no_counts_where_none_are_stated(read: Read, text: str) -> None:
    assert [v for v in read(text) if v.key.startswith("lymph_nodes_")] == []


def test_negative_remainder_after_a_positive_count_is_not_a_total(read: Read) -> None:
    text = "Metastatic carcinoma in 2 of 15 lymph nodes; 13 lymph nodes negative."
    assert counts(read, text) == [(2, 15, "2 of 15 lymph nodes")]


def test_statement_and_its_fraction_that_disagree_are_flagged(read: Read) -> None:
    vals = [
        v
        for v in read("Two lymph nodes, negative for carcinoma (0/3).")
        if v.key.startswith("lymph")
    ]
    assert all("node_count_mismatch" in v.flags for v in vals)
