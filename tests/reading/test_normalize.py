"""Offset-keeping normalisation: folded text, and exact offsets back into the original."""

from __future__ import annotations

import re

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from pathsieve.normalize import fold_char, normalize

CASES: list[tuple[str, str]] = [
    ("High-Grade  DYSPLASIA", "high grade dysplasia"),
    ("tubular\nadenoma", "tubular adenoma"),
    ("tubular \r\n   adenoma", "tubular adenoma"),
    ("high - grade", "high grade"),
    ("HIGH_GRADE", "high grade"),
    ("adeno-\ncarcinoma", "adenocarcinoma"),  # broken at a line end, lower-case continuation
    ("adeno-  \n  carcinoma", "adenocarcinoma"),
    ("HER-\nNEU", "her neu"),  # upper-case continuation, no vocabulary: a real hyphen
    ("\ufb01brosis", "fibrosis"),  # ligature fi
    ("Stra\u00dfe", "strasse"),
    ("cafe\u0301", "caf\u00e9"),  # e + combining acute -> é
    ("no\u00a0break", "no break"),
    ("en\u2013dash and minus\u2212sign", "en dash and minus sign"),
    ("CIN 2\u20133", "cin 2 3"),
    ("\u00b5m", "\u03bcm"),  # micro sign folds to Greek mu
    ("ASCII only, nothing to map.", "ascii only, nothing to map."),
    ("___\nFINAL DIAGNOSIS\n___", " final diagnosis "),
]


@pytest.mark.parametrize(("text", "expected"), CASES, ids=[c[0] for c in CASES])
def test_normalised_text(text: str, expected: str) -> None:
    assert normalize(text).text == expected


# (text, known words, expected): a hyphen at a line end, decided with vocabulary.
WRAPS: list[tuple[str, set[str], str]] = [
    ("carci-\nnoma", {"carcinoma"}, "carcinoma"),
    ("CARCI-\nNOMA", {"carcinoma"}, "carcinoma"),  # joined word known: any case
    ("high-\ngrade", {"high", "grade"}, "high grade"),  # two known words: a real hyphen
    ("well-\ndifferentiated", {"well", "differentiated"}, "well differentiated"),
    ("tubulo-\nvillous", {"tubulovillous", "villous"}, "tubulovillous"),
    ("xylo-\nphage", {"high"}, "xylophage"),  # neither known, lower-case: joined
    ("Lymph-\nNode", {"lymph"}, "lymph node"),  # upper-case continuation, not known joined
]


@pytest.mark.parametrize(("text", "known", "expected"), WRAPS, ids=[w[0] for w in WRAPS])
def test_line_wrap_hyphens(text: str, known: set[str], expected: str) -> None:
    assert normalize(text, known_words=known).text == expected


# (original, normalised span text) -> the original text the span must map back to
SPANS: list[tuple[str, str, str]] = [
    ("High-Grade  DYSPLASIA", "dysplasia", "DYSPLASIA"),
    ("Tubular   \n  adenoma, colon", "tubular adenoma", "Tubular   \n  adenoma"),
    ("Adeno-\ncarcinoma, NOS", "adenocarcinoma", "Adeno-\ncarcinoma"),
    ("\ufb01brosis and \ufb01bres", "fibres", "\ufb01bres"),
    ("Stra\u00dfe 5  X", "x", "X"),
    ("cafe\u0301 au lait", "café", "cafe\u0301"),
    ("a  b  c  d", "c d", "c  d"),
]


@pytest.mark.parametrize(("original", "needle", "expected"), SPANS, ids=[s[1] for s in SPANS])
def test_span_maps_back(original: str, needle: str, expected: str) -> None:
    n = normalize(original, known_words={"adenocarcinoma"})
    i = n.text.index(needle)
    s, e = n.to_original(i, i + len(needle))
    assert original[s:e] == expected


def test_span_outside_text_is_an_error() -> None:
    with pytest.raises(IndexError):
        normalize("abc").to_original(2, 9)


def test_spans_to_original_agrees_with_to_original() -> None:
    n = normalize(
        "Tubular  adenoma,\n\n  high-\ngrade dysplasia \ufb01brosis", known_words={"high"}
    )
    spans = [(i, j) for i in range(len(n.text)) for j in range(i + 1, len(n.text) + 1)]
    assert n.spans_to_original(spans) == [n.to_original(i, j) for i, j in spans]


def test_fold_char() -> None:
    assert fold_char("\ufb01") == "fi"
    assert fold_char("\u00c4") == "\u00e4"
    assert fold_char("\u2014") == " "


# ----------------------------------------------------------------- properties

_ALPHABET = st.sampled_from(
    [*"abcXYZ -_\n\t\r.,()", "\ufb01", "\u00df", "\u00e9", "e\u0301", "\u00a0", "\u2013", "-\n"]
)
report_text = st.lists(_ALPHABET, max_size=40).map("".join)


@settings(max_examples=400, deadline=None)
@given(report_text)
def test_offsets_are_monotone_and_in_range(text: str) -> None:
    n = normalize(text, known_words={"ab", "abc"})
    last = (0, 0)
    for i in range(len(n.text) + 1):
        s, e = n.to_original(i, i)
        assert 0 <= s == e <= len(text)
        assert s >= last[0]
        last = (s, e)
    for i in range(len(n.text)):
        s, e = n.to_original(i, i + 1)
        assert 0 <= s < e <= len(text)


@settings(max_examples=400, deadline=None)
@given(report_text)
def test_words_map_back_to_what_they_were_found_in(text: str) -> None:
    """Every word of the normalised text maps to original text that normalises to it."""
    n = normalize(text)
    for m in re.finditer(r"[^\s]+(?: [^\s]+)?", n.text):
        s, e = n.to_original(m.start(), m.end())
        assert normalize(text[s:e]).text.strip() == m.group()


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=50))
def test_any_unicode_keeps_a_consistent_map(text: str) -> None:
    n = normalize(text)
    for i in range(len(n.text)):
        s, e = n.to_original(i, i + 1)
        assert 0 <= s < e <= len(text)
    if n.text:
        assert n.to_original(0, len(n.text))[1] <= len(text)
