"""Offset-keeping normalisation of report text for matching.

:func:`normalize` folds a report into the string the concept matcher searches
(``NormText.text``) and keeps a map back to the original, so every span found
in the normalised text becomes exact offsets into the original text
(``NormText.to_original``).

What changes, in this order of precedence:

* **line-wrap hyphens** - ``carci-\\nnoma`` becomes ``carcinoma`` when the
  word was broken for the line: the joined word is a known word (any case:
  ``CARCI-\\nNOMA``), or, failing that, the second half starts in lower case
  and the two halves are not both known words.  When both halves are known
  words and the joined form is not (``high-\\ngrade``,
  ``well-\\ndifferentiated``) the hyphen is a real one and becomes a space.
  Without a known-word set, every lower-case continuation is joined (a
  report seldom breaks a compound exactly at its hyphen and the line end);
* **Unicode** - every non-ASCII character (with its combining marks) is
  NFKC-folded and case-folded on its own, so "ﬁ" -> "fi", "ß" -> "ss",
  "e\\u0301" -> "é", no-break space -> space;
* **case** - ASCII letters are lower-cased (the same as case folding for ASCII);
* **separators** - hyphens, dashes, underscores and round or square
  brackets become a space, so ``high-grade`` == ``high grade`` and a
  bracketed word inside a name reads as part of it (``squamous cell
  (epidermoid) carcinoma``);
* **whitespace** - every run of whitespace and separators (new lines
  included: ``"high - grade"``, ``"\\r\\n\\r\\n"``) becomes one space;
* **run-together words** - a space goes in where a word of three or more
  lower-case letters runs into a capitalised one (``AdenocarcinomaHistologic
  grade``, ``CARCINOMAGender``: the join a form export or OCR makes of a
  value and the next field's name), so that each word can match.  Shorter
  heads ("McDonald", "pTis", "ypT2") and plural short forms ("NSCLCs") are
  left alone.

Split words (``adeno carcinoma``) and OCR confusions (``carcinorna``) are not
repaired here: the matcher handles them, because only it knows the vocabulary.

The offset map is piecewise: stretches that were copied one character for one
character (the usual case: lower-casing and single separators keep lengths)
are not stored at all; only the places where lengths changed are.  ASCII text
without a wrapped word (nearly every report) takes one pass done at C speed:
a translation table and one regular expression for runs of spaces.  Other
text first gets a pass that joins wrapped words and folds non-ASCII
characters; the two offset maps are chained.

>>> n = normalize("High-Grade  DYSPLASIA")
>>> n.text
'high grade dysplasia'
>>> n.to_original(11, 20)
(12, 21)
"""

from __future__ import annotations

import re
import unicodedata
from bisect import bisect_right
from collections.abc import Collection
from dataclasses import dataclass
from itertools import accumulate
from operator import add, sub

__all__ = ["NormText", "fold_char", "normalize"]

_COMBINING = "\u0300-\u036f\u1ab0-\u1aff\u1dc0-\u1dff\u20d0-\u20ff\ufe20-\ufe2f"
_DASHES = "\u2010\u2011\u2012\u2013\u2014\u2015\u2212\ufe58\ufe63\uff0d"
_SEPARATORS = r"\s_\-()\[\]" + _DASHES

# First pass (only for non-ASCII text or text with a hyphen at a line end): a
# hyphen at a line end with the break around it, or a non-ASCII character with
# the combining marks that follow it.
# Two expressions, not one alternation: each starts with something the regular
# expression engine can skip to quickly, which an alternation cannot.
_WRAP_RE = re.compile(r"-[ \t]*\r?\n[ \t]*")
# A word run into a capitalised one: the capital starts a new word (the capital
# is the event; it becomes a space and itself).  After lower case
# ("colonHistologic"), or after a run of capitals when two or more lower-case
# letters follow ("CARCINOMAGender"; "NSCLCs" stays whole).  The pattern opens
# on the capital, not on a look-behind, so the scan skips to capitals at C speed.
_CAMEL_RE = re.compile(r"[A-Z](?=[a-z])(?:(?<=[a-z]{3}[A-Z])|(?<=[A-Z]{4})(?=[a-z]{2}))")
_NON_ASCII_RE = re.compile(rf"[^\x00-\x7f][{_COMBINING}]*")
_SEP_RUN_RE = re.compile(rf"[{_SEPARATORS}]*")
_LEFT_WORD_RE = re.compile(r"[A-Za-z]+$")
_RIGHT_WORD_RE = re.compile(r"[A-Za-z]+")
# Second pass: after the one-for-one translation every separator is a space.
_SPACE_RUN_RE = re.compile(r"  +")
_match_start = re.Match.start
_match_end = re.Match.end
_plus_one = (1).__add__
# fold_char of the characters met so far (a pure function; bounded)
_FOLDED: dict[str, str] = {}
_FOLDED_MAX = 8192

# ASCII fold table: upper -> lower; separators and whitespace -> space.
_ASCII_TABLE: dict[int, int | str] = {c: c + 32 for c in range(ord("A"), ord("Z") + 1)}
_ASCII_TABLE.update({ord(c): " " for c in "-_()[]\t\n\r\f\v\x1c\x1d\x1e\x1f"})
_RARE_SPACES = "\f\v\x1c\x1d\x1e\x1f"
# After NFKC and case folding, Unicode hyphens and dashes become a space too.
_UNI_TABLE = {ord(c): " " for c in _DASHES}


def fold_char(cluster: str) -> str:
    """NFKC + case folding of one character (with its combining marks).

    Whitespace becomes one space and dashes a space, like in :func:`normalize`.

    >>> fold_char("ﬁ"), fold_char("Ä"), fold_char("\\u00a0")
    ('fi', 'ä', ' ')
    """
    out = unicodedata.normalize("NFKC", unicodedata.normalize("NFKC", cluster).casefold())
    if out.isspace():
        return " "
    return out.translate(_UNI_TABLE).translate(_ASCII_TABLE)


@dataclass(frozen=True, slots=True)
class _Map:
    """Where lengths changed: target ``[nstart, nend)`` came from source ``[ostart, oend)``.

    Everything between the listed stretches was copied one character for one.
    """

    nstart: tuple[int, ...]
    nend: tuple[int, ...]
    ostart: tuple[int, ...]
    oend: tuple[int, ...]

    def start(self, i: int) -> int:
        k = bisect_right(self.nstart, i) - 1
        if k < 0:
            return i
        if i < self.nend[k]:
            return self.ostart[k]
        return i + self.oend[k] - self.nend[k]

    def end(self, j: int) -> int:
        # the stretch that holds the last character, j - 1
        k = bisect_right(self.nstart, j - 1) - 1
        if k < 0:
            return j
        if j - 1 < self.nend[k]:
            return self.oend[k]
        return j + self.oend[k] - self.nend[k]


@dataclass(frozen=True, slots=True)
class NormText:
    """A normalised text with the map back to its original.

    ``_maps`` are applied last to first: the last maps ``text`` to the output of
    the pass before it, the first maps to ``original``.
    """

    text: str
    original: str
    _maps: tuple[_Map, ...] = ()

    def to_original(self, i: int, j: int) -> tuple[int, int]:
        """Original ``(start, end)`` of the normalised span ``[i, j)``.

        A span touching a stretch whose length changed (a folded ligature, a
        collapsed run of spaces) takes the whole stretch.
        """
        if not 0 <= i <= j <= len(self.text):
            raise IndexError(f"span [{i}, {j}) outside normalised text of {len(self.text)}")
        for m in reversed(self._maps):
            if i == j:
                i = j = m.start(i)
            else:
                i, j = m.start(i), m.end(j)
        return i, j

    def spans_to_original(self, spans: list[tuple[int, int]]) -> list[tuple[int, int]]:
        """:meth:`to_original` of many non-empty spans at once (no bounds check; faster)."""
        for m in reversed(self._maps):
            ns, ne, os_, oe = m.nstart, m.nend, m.ostart, m.oend
            out = []
            for i, j in spans:
                k = bisect_right(ns, i) - 1
                a = i if k < 0 else (os_[k] if i < ne[k] else i + oe[k] - ne[k])
                k = bisect_right(ns, j - 1) - 1
                b = j if k < 0 else (oe[k] if j - 1 < ne[k] else j + oe[k] - ne[k])
                out.append((a, b))
            spans = out
        return spans

    def to_original_pos(self, i: int) -> int:
        """Original offset of normalised position ``i`` (as a span start)."""
        return self.to_original(i, i)[0]


def normalize(text: str, *, known_words: Collection[str] | None = None) -> NormText:
    """Normalise ``text`` for matching, keeping a map back to original offsets.

    ``known_words`` (lower-case words) guides the joining of words broken by a
    hyphen at a line end; see the module docstring for the rule.

    >>> n = normalize("Adeno-\\ncarcinoma,  NOS", known_words={"adenocarcinoma"})
    >>> n.text, n.original[slice(*n.to_original(0, 14))]
    ('adenocarcinoma, nos', 'Adeno-\\ncarcinoma')
    """
    maps: list[_Map] = []
    work = text
    if (
        not text.isascii()
        or _WRAP_RE.search(text) is not None
        or _CAMEL_RE.search(text) is not None
    ):
        work, first = _first_pass(text, known_words)
        if first is not None:
            maps.append(first)
    low = _fold_ascii(work)
    runs = list(_SPACE_RUN_RE.finditer(low))
    if runs:
        # the offset map of the collapsed runs, built with C-level maps: run k
        # starts in the output at its source start less what the runs before
        # it removed (their lengths less one each)
        os_ = tuple(map(_match_start, runs))
        oe = tuple(map(_match_end, runs))
        before = accumulate(map(sub, oe, os_), initial=0)
        ns = tuple(map(add, map(sub, os_, before), range(len(os_))))
        maps.append(_Map(ns, tuple(map(_plus_one, ns)), os_, oe))
        low = _SPACE_RUN_RE.sub(" ", low)
    return NormText(low, text, tuple(maps))


def _fold_ascii(s: str) -> str:
    """Lower-case and turn separators into spaces, one character for one.

    Chained ``str`` methods: several times faster than ``str.translate``, which
    has no fast path for text with non-ASCII characters.  The non-ASCII
    characters here were already case-folded by the first pass; ``lower`` keeps
    their length (checked, with ``translate`` as the fallback).
    """
    low = s.lower()
    if len(low) != len(s):
        low = s.translate(_ASCII_TABLE)
    low = (
        low.replace("-", " ")
        .replace("_", " ")
        .replace("(", " ")
        .replace(")", " ")
        .replace("\n", " ")
        .replace("\t", " ")
        .replace("\r", " ")
    )
    for c in _RARE_SPACES:
        if c in low:
            low = low.replace(c, " ")
    if "[" in low or "]" in low:
        low = low.replace("[", " ").replace("]", " ")
    return low


def _first_pass(text: str, known_words: Collection[str] | None) -> tuple[str, _Map | None]:
    """Join wrapped words and fold non-ASCII characters; keep the map."""
    pieces: list[str] = []
    nstart: list[int] = []
    nend: list[int] = []
    ostart: list[int] = []
    oend: list[int] = []
    npos = 0  # length of the output so far
    opos = 0  # source offset already consumed
    events = [m.span() for m in _WRAP_RE.finditer(text)]
    events += [m.span() for m in _CAMEL_RE.finditer(text)]
    if not text.isascii():
        events += [m.span() for m in _NON_ASCII_RE.finditer(text)]
    events.sort()
    for s, e in events:
        if s < opos:
            continue  # inside a separator run swallowed by the previous event
        if "A" <= text[s] <= "Z":
            out = " " + text[s]  # run-together words: a space where none was written
        elif text[s] == "-":
            right = _RIGHT_WORD_RE.match(text, e)
            left = _LEFT_WORD_RE.search(text, max(opos, s - 64), s)
            if right and left and _join(left.group(), right.group(), known_words):
                out = ""
            else:
                # a real hyphen, or "-\n" next to no word (a bullet, a rule): one
                # separator, swallowing the separators that follow
                out = " "
                run = _SEP_RUN_RE.match(text, e)  # "*": always matches, maybe empty
                e = run.end() if run else e
        else:
            if unicodedata.combining(text[s]) and s > opos and s - 1 >= 0:
                s -= 1  # combining marks after an ASCII letter: fold them together
            cluster = text[s:e]
            folded = _FOLDED.get(cluster)  # reports repeat the same few characters
            if folded is None:
                folded = fold_char(cluster)
                if len(_FOLDED) < _FOLDED_MAX:
                    _FOLDED[cluster] = folded
            out = folded
            if len(out) == e - s:
                pieces.append(text[opos:s])
                pieces.append(out)
                npos += s - opos + len(out)
                opos = e
                continue
        pieces.append(text[opos:s])
        npos += s - opos
        nstart.append(npos)
        ostart.append(s)
        pieces.append(out)
        npos += len(out)
        nend.append(npos)
        oend.append(e)
        opos = e
    pieces.append(text[opos:])
    if not nstart:
        return "".join(pieces), None
    return "".join(pieces), _Map(tuple(nstart), tuple(nend), tuple(ostart), tuple(oend))


def _join(left: str, right: str, known: Collection[str] | None) -> bool:
    """Whether ``left-\\nright`` is one word broken at a line end."""
    if known is not None:
        lower_left, lower_right = left.lower(), right.lower()
        if lower_left + lower_right in known:
            return True
        if lower_left in known and lower_right in known:
            return False
    # Typesetting breaks a word before a lower-case continuation; an upper-case
    # continuation ("HER-\nNEU", "A-\nB") is more often a real hyphen.
    return right[0].islower()
