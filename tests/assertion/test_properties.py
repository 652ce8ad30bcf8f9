"""Invariants of the assertion engine on generated report-like text (hypothesis)."""

from __future__ import annotations

from assertion_texts import report_texts
from hypothesis import given, settings
from hypothesis import strategies as st

from pathsieve.assertion import AssertionEngine
from pathsieve.records import CERTAINTY_SCORE, EXPERIENCERS, TEMPORALITIES

ENGINE = AssertionEngine.load()
WORDS = [
    "no", "not", "negative", "for", "carcinoma", "dysplasia", "adenoma", "suspicious",
    "cannot", "be", "excluded", "history", "of", "rule", "out", "mother", "if", "but",
    "identified", "possible", "favor", "(", ")", "?", ";", ".", ":", "-", "s/p", "İ", "margins",
]  # fmt: skip
SEPARATORS = [" ", "  ", "\n", "\n\n", "\n- ", "\n2) ", " \t"]


def report() -> st.SearchStrategy[tuple[str, list[tuple[int, int]], list[int]]]:
    return report_texts(WORDS, SEPARATORS)


@settings(max_examples=80, deadline=None)
@given(report())
def test_assertions_are_well_formed(case: tuple[str, list[tuple[int, int]], list[int]]) -> None:
    text, spans, cuts = case
    results = ENGINE.assess(text, spans, boundaries=cuts)
    assert len(results) == len(spans)
    for (s, e), a in zip(spans, results):
        assert a.certainty in CERTAINTY_SCORE
        assert a.temporality in TEMPORALITIES
        assert a.experiencer in EXPERIENCERS
        assert len(a.triggers) == len({h.category for h in a.triggers}) <= 3
        for h in a.triggers:
            assert text[h.start : h.end] == h.text
            # a trigger acts from outside the mention, or opens it (temporal/experiencer)
            assert (
                h.end <= s or h.start >= e or (h.start == s and h.category not in CERTAINTY_SCORE)
            )
            # no scope crosses a boundary (a boundary at c splits text[:c] from text[c:])
            if h.end <= s:
                assert not any(h.end <= c <= s for c in cuts)
            elif h.start >= e:
                assert not any(e <= c <= h.start for c in cuts)


@settings(max_examples=40, deadline=None)
@given(report())
def test_each_span_is_assessed_alone(case: tuple[str, list[tuple[int, int]], list[int]]) -> None:
    # assessing spans together or one by one gives the same answers
    text, spans, cuts = case
    together = ENGINE.assess(text, spans, boundaries=cuts)
    alone = [ENGINE.assess(text, [span], boundaries=cuts)[0] for span in spans]
    assert together == alone
