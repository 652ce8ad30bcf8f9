"""Generated report-like text for the assertion engine's property tests (hypothesis)."""

from __future__ import annotations

from collections.abc import Sequence

from hypothesis import strategies as st

__all__ = ["report_texts"]

Drawn = tuple[str, list[tuple[int, int]], list[int]]


def report_texts(words: Sequence[str], separators: Sequence[str]) -> st.SearchStrategy[Drawn]:
    """(text, spans of some of its words, boundary cuts) built from ``words`` and ``separators``."""

    @st.composite
    def report(draw: st.DrawFn) -> Drawn:
        chosen_words = draw(st.lists(st.sampled_from(words), min_size=1, max_size=40))
        n = len(chosen_words)
        seps = draw(st.lists(st.sampled_from(separators), min_size=n, max_size=n))
        pieces: list[str] = []
        offsets: list[tuple[int, int]] = []
        pos = 0
        for word, sep in zip(chosen_words, seps, strict=True):
            offsets.append((pos, pos + len(word)))
            pieces.append(word + sep)
            pos += len(word) + len(sep)
        text = "".join(pieces)
        spans = draw(st.lists(st.sampled_from(offsets), max_size=8))
        cuts = sorted(set(draw(st.lists(st.integers(0, len(text)), max_size=3))))
        return text, spans, cuts

    return report()
