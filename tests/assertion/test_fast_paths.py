"""The assertion engine's fast paths against slow reference implementations.

The engine keeps per-sentence analyses across calls, reuses the last text's
sentence breaks, scans with patterns reordered for speed and derives token
offsets from piece lengths.  Each of these must give exactly what the plain
way gives: checked here on generated report-like text (hypothesis) and on
hand-written cases.
"""

from __future__ import annotations

import re

import pytest
from assertion_texts import report_texts
from hypothesis import given, settings
from hypothesis import strategies as st

from pathsieve.assertion import _FLAT_RE, _GLUED_HEAD_RE, _TOKEN_RE, AssertionEngine, _Sentence

ENGINE = AssertionEngine.load()

# The patterns as first written (one look-behind tried at every position; a run
# of spaces retried from each of its spaces): slow, plainly right.
GLUED_REFERENCE = re.compile(
    r"(?:(?<=[a-z]{3})|(?<=[A-Z]{3}))(?=[A-Z][a-z]{2,}(?: [A-Za-z]+){0,3} ?:)"
)
FLAT_REFERENCE = re.compile(
    r"  +(?:"
    r"(?=\(?\d{1,2}\)[ \t])"
    r"|(?P<head>(?=[A-Z][A-Za-z/&()-]*(?: [A-Za-z/&()-]+){0,4}:(?:\s|$)))"
    r")"
)

WORDS = [
    "No", "no", "not", "negative", "for", "carcinoma", "dysplasia", "Adenoma", "suspicious",
    "cannot", "be", "excluded", "history", "of", "rule", "out", "mother", "but", "PLAN:",
    "identified", "possible", "(", ")", "?", ";", ".", ":", "s/p", "Tumor site:", "specified",
    "NOS", "CARCINOMA", "Gender:", "2)", "İ", "a_b", "x\u0301",
]  # fmt: skip
SEPARATORS = [" ", "  ", "   ", "\n", "\n\n", "\n- ", "\n2) ", " \t", "", "\u00a0", "\u2003"]


def report() -> st.SearchStrategy[tuple[str, list[tuple[int, int]], list[int]]]:
    return report_texts(WORDS, SEPARATORS)


def _cold_engine() -> AssertionEngine:
    """An engine with nothing kept from earlier calls."""
    return AssertionEngine(ENGINE.triggers, path=ENGINE.path)


@settings(max_examples=80, deadline=None)
@given(report(), report())
def test_kept_analyses_change_nothing(
    case: tuple[str, list[tuple[int, int]], list[int]],
    other: tuple[str, list[tuple[int, int]], list[int]],
) -> None:
    text, spans, cuts = case
    # the warm engine has seen other texts (and this one, with other boundaries)
    ENGINE.assess(other[0], other[1], boundaries=other[2])
    ENGINE.assess(text, spans, boundaries=[])
    warm = ENGINE.assess(text, spans, boundaries=cuts)
    assert warm == _cold_engine().assess(text, spans, boundaries=cuts)
    # the same text again (the pipeline's second call) reuses the breaks
    assert ENGINE.assess(text, spans, boundaries=cuts) == warm


@settings(max_examples=150, deadline=None)
@given(st.text(alphabet="abcXYZ :;\t\n()-/&12", max_size=80))
def test_reordered_break_patterns_match_the_reference(text: str) -> None:
    assert [m.start() for m in _GLUED_HEAD_RE.finditer(text)] == [
        m.start() for m in GLUED_REFERENCE.finditer(text)
    ]
    fast = [(m.span(), m.group("head") is not None) for m in _FLAT_RE.finditer(text)]
    slow = [(m.span(), m.group("head") is not None) for m in FLAT_REFERENCE.finditer(text)]
    assert fast == slow


@settings(max_examples=150, deadline=None)
@given(st.text(alphabet="ab_1 .;(\t\n\u00a0\u2003\u0301é²", max_size=60))
def test_token_offsets_from_piece_lengths(text: str) -> None:
    sent = _Sentence(ENGINE._index, ENGINE._firsts, text)
    sent.toks = _TOKEN_RE.findall(text)  # offsets are wanted for every sentence here
    found = list(_TOKEN_RE.finditer(text))
    for k, m in enumerate(found):
        # the token range of a token's own span is that token alone
        assert sent.token_range(m.start(), m.end()) == (k, k + 1)
        assert sent.char_span(k, k + 1) == m.span()


# The same sentence at two places: the kept analysis must point at each place.
@pytest.mark.parametrize(
    ("text", "word", "expected"),
    [
        (
            "No carcinoma seen. Tubular adenoma.\nNo carcinoma seen.",
            "carcinoma",
            [("absent", "No", 0), ("absent", "No", 36)],
        ),
        (
            "A. Colon: possible adenoma.\nB. Colon: possible adenoma.",
            "adenoma",
            [("uncertain", "possible", 10), ("uncertain", "possible", 38)],
        ),
    ],
)
def test_repeated_sentence_points_at_each_copy(
    text: str, word: str, expected: list[tuple[str, str, int]]
) -> None:
    spans = [(m.start(), m.end()) for m in re.finditer(word, text)]
    got = ENGINE.assess(text, spans)
    assert [(a.certainty, a.triggers[0].text, a.triggers[0].start) for a in got] == expected


def test_boundaries_are_part_of_the_reused_breaks() -> None:
    text = "No atypia or carcinoma"
    span = [(13, 22)]
    assert ENGINE.assess(text, span)[0].certainty == "absent"
    # a boundary between trigger and mention (a new part) cuts the scope
    assert ENGINE.assess(text, span, boundaries=[10])[0].certainty == "present"
    assert ENGINE.assess(text, span)[0].certainty == "absent"
