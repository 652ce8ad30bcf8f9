"""Split a pathology report into sections (diagnosis, gross, synoptic...).

The sectioner reads the report once, line by line, and recognises the header
styles laboratories use: ALL CAPS lines ("GROSS DESCRIPTION"), Title Case with a
colon ("Clinical History:"), numbered ("II. GROSS"), inline
("DIAGNOSIS: Tubular adenoma", even "FINAL DIAGNOSIS:Tubular" or the run-on
"DIAGNOSISTubular"), decorated ("*** FINAL DIAGNOSIS ***", "--- Gross ---")
and OCR-damaged ones (extra spaces, missing colon, trailing period, one or two
wrong letters in a long header).  Every header maps to a canonical kind through
the data file ``ontology/lexicon/section_headers.yaml``.

Synoptic checklists ("Histologic type: ...", "Margins: ...") are found both
under a header and as a bare run of three or more known ``Key: value`` lines.

Frozen-section and intraoperative diagnoses are preliminary; their headers map
to kind ``"comment"``: like a comment they add support (they decide only a label
that no diagnosis, synoptic or addendum section mentions -- a permanent
diagnosis wrecked by OCR, or one that reads "same"), never overriding it.

The result partitions the whole text: sections are sorted, contiguous and
cover ``text[0:len(text)]``.  A stretch before the first header is ``"other"``
(``"diagnosis"`` when the report has no header at all: a bare diagnosis).  A
run of synoptic lines inside another section splits it; the text after the run
continues the enclosing kind as a headerless section.  So does an inline note
inside a diagnosis or addendum ("Comment: fragmented.", "Procedure: ..."): it
takes its paragraph, then the diagnosis resumes (headerless), so that part B
after a comment on part A is still read as diagnosis.

>>> [(s.kind, s.header) for s in find_sections("GROSS: Two fragments.\\nDIAGNOSIS: Tubular adenoma.")]
[('gross', 'GROSS'), ('diagnosis', 'DIAGNOSIS')]
"""

from __future__ import annotations

import os
import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from functools import lru_cache
from itertools import accumulate
from operator import add
from pathlib import Path
from typing import Any

import yaml
from rapidfuzz import process
from rapidfuzz.distance import Levenshtein

from .errors import VocabError
from .records import SECTION_KINDS, Section
from .vocab import lexicon_path

__all__ = [
    "HEADER_FILE",
    "HeaderLexicon",
    "check_headers",
    "default_lexicon",
    "find_sections",
    "for_matching",
    "is_generic_key_line",
    "is_part_label",
    "iter_lines",
    "normalise_phrase",
]

#: File name of the header lexicon under ``ontology/lexicon/``.
HEADER_FILE = "section_headers.yaml"

_TOP_KEYS = (
    "version",
    "headers",
    "synoptic_keys",
    "part_keywords",
    "cassette_headers",
    "type_keys",
    "type_heads",
)
_REQUIRED_KEYS = ("headers", "synoptic_keys", "part_keywords")
#: Synonyms this short need a colon ("Dx:") -- as bare words they occur in prose.
_SHORT = 3
#: Fuzzy (OCR) matching only for synonyms at least this long; distance cut-offs.
_FUZZY_MIN = 8
_FUZZY_LONG = 15
_FUZZY_MAX_LINE = 64
_FUZZY_CACHE = 4096
_LINE_CACHE = 16384
_plus_one = (1).__add__
_SPACE = re.compile(r"\s+")
_SYNONYM_OK = re.compile(r"[a-z][a-z0-9 ()'&/.\-]*\Z")

# -- regex structure (the words come from the lexicon) -----------------------
# Every repeat is bounded, so no line can make a pattern backtrack for long.
_DECOR = r"[ \t*=#~_>•·\-]{0,12}"
_ENUM = r"(?:(?:\d{1,2}|(?-i:[IVX]{1,4}))[.)][ \t]{0,8})?"
# A checklist item may be numbered, bulleted or lettered in lower case ("a. Primary
# pattern: 4"); a capital letter would be a specimen part ("A. Colon: ...").
_KEY_LEAD = r"[ \t]{0,12}(?:(?:\d{1,2}[.)]|(?-i:[a-z])[.)]|[\-*•·])[ \t]{0,8})?"
_PARENS = r"(?:\([^()\n]{0,30}\)[ \t]{0,8})?"
# After a header: an optional "(continued)", an optional number ("ADDENDUM 2"),
# then the separator.  A dash only separates when a space follows it, so that
# "--- Gross ---" stays decoration.
_TAIL = re.compile(
    r"[ \t]{0,8}(?:\([^()\n]{0,40}\)[ \t]{0,8})?"
    r"(?P<num>(?:#|(?i:no)\.?)?[ \t]?\d{1,2}(?!\d)[ \t]{0,8})?"
    r"(?P<sep>:|\.|[\-–—]{1,3}(?=[ \t])|)"
)
_TAIL_NO_NUM = re.compile(
    r"[ \t]{0,8}(?:\([^()\n]{0,40}\)[ \t]{0,8})?(?P<num>)(?P<sep>:|\.|[\-–—]{1,3}(?=[ \t])|)"
)
_DECOR_END = re.compile(r"[ \t*=#~_>•·:;.!'\-]{0,40}$")
# A compound header alone on its line: "MICROSCOPIC/COMMENT", "GROSS / MICROSCOPIC:",
# "MICROSCOPIC/ COXWW" (the second half lost to OCR).  The first half names it.
_COMPOUND = re.compile(
    r"[ \t]{0,3}/[ \t]{0,3}[A-Za-z][A-Za-z &'\-]{1,40}?[ \t]{0,8}:?[ \t*=#~_>•·.\-]{0,12}$"
)
_SPACES = re.compile(r"[ \t]*")
# possessive: a run of blanks that ends the line must not be retried from every start
_COLUMN_GAP = re.compile(r"(?=[ \t]{2}|\t)[ \t]++(?=\S)")
_GENERIC_KEY = re.compile(
    _KEY_LEAD + r"[A-Za-z][A-Za-z0-9 /&,'+%\-]{0,50}" + _PARENS + r"[ \t]{0,8}:[ \t]{0,8}\S"
)
_FUZZY_LINE = re.compile(
    _DECOR + _ENUM + r"(?P<w>[A-Za-z][A-Za-z0-9$!(|&/'\- ]{6,48}?)[ \t]{0,8}(?P<colon>:?)"
    r"[ \t*=#~_>•·.\-]{0,12}$"
)
# An OCR-damaged header written inline, up to its colon ("I1PRESSION:Sub", "INPRE S S ION :"):
# the head may hold digits, stray marks and spaces between letters.
_FUZZY_HEAD = re.compile(
    _DECOR + _ENUM + r"(?P<w>[A-Za-z][A-Za-z0-9 &/'+.!|$(\-]{5,40}?)[ \t]{0,4}:"
)
# Digits and marks OCR reads for letters in a header ("I1PRESSION", "DIAGN0SIS",
# "5PECIMEN", "DIAGNO$IS", "IMPRESS!ON", "MICROS(OPIC", "F|NAL").
_OCR_LETTERS = str.maketrans("105$!(|", "iossicl")
_NOT_LETTER = re.compile(r"[^a-z]+")
#: A squeezed header (letters only) at least this long may have two OCR errors.
_SQUEEZED_LONG = 10
# Characters inside a run of capitals that may be a header ("PRE-OPERATIVE DIAGNOSIS").
_CAPS_RUN = frozenset(" \t-'&/")
# A garbled decoration line: its marks, its runs of letters and digits, a real word.
_DECOR_MARKS = "*=#~_"
_DECORATED_RUN = re.compile(r"[A-Za-z0-9][A-Za-z0-9 ]{4,46}[A-Za-z0-9]")
_LONG_WORD = re.compile(r"[A-Za-z]{6}")
_BLANK = re.compile(r"[ \t]*$")
_INDENTED = re.compile(r"[ \t]+\S")


#: Unicode spaces read as a plain space (PDF and OCR exports are full of them).
_ODD_SPACE = re.compile("[\x0b\x0c\xa0\u1680\u2000-\u200a\u202f\u205f\u3000]")
_LONE_CR = re.compile(r"\r(?!\n)")


def for_matching(text: str) -> str:
    """The text as the patterns read it: same length, same offsets.

    Unicode spaces become plain spaces and a lone carriage return (old Mac or
    table exports) becomes a newline -- one character for one, so every
    offset found in the result is an offset into the original text.

    >>> for_matching("A.\\u00a0Colon\\rB. Rectum") == "A. Colon\\nB. Rectum"
    True
    """
    if "\x0b" in text or "\x0c" in text or not text.isascii():
        text = _ODD_SPACE.sub(" ", text)
    if "\r" in text:
        text = _LONE_CR.sub("\n", text)
    return text


def normalise_phrase(phrase: str) -> str:
    """Lower-case a header or key and collapse its white space.

    >>> normalise_phrase("  Clinical   HISTORY ")
    'clinical history'
    """
    return _SPACE.sub(" ", phrase).strip().lower()


def iter_lines(text: str, start: int = 0, end: int | None = None) -> Iterable[tuple[int, int, int]]:
    """Yield ``(line_start, content_end, next_line_start)`` for the lines of a span.

    ``content_end`` excludes the newline and a carriage return before it, so
    CRLF reports read like LF ones.

    >>> list(iter_lines("ab\\r\\ncd"))
    [(0, 2, 4), (4, 6, 6)]
    """
    stop = len(text) if end is None else end
    pos = start
    while pos < stop:
        nl = text.find("\n", pos, stop)
        nxt = stop if nl < 0 else nl + 1
        ce = stop if nl < 0 else nl
        if ce > pos and text[ce - 1] == "\r":
            ce -= 1
        yield pos, ce, nxt
        pos = nxt


def _line_table(text: str) -> list[tuple[int, int, int]]:
    """All lines of ``text`` as :func:`iter_lines` gives them, built in one split.

    Offsets come from running sums of the line lengths (C-level maps, no
    per-line Python arithmetic).
    """
    segs = text.split("\n")
    lens = list(map(len, segs))
    starts = list(accumulate(map(_plus_one, lens), initial=0))  # one past the last too
    ends = list(map(add, starts, lens))
    if "\r" in text:
        ends = [e - 1 if s.endswith("\r") else e for s, e in zip(segs, ends)]
    out = list(zip(starts, ends, starts[1:]))
    stop = len(text)
    ls, ce, _ = out[-1]
    if ls >= stop:  # the text ends with a line break (or is empty): no last line
        out.pop()
    else:  # the last line has no line break after it
        out[-1] = (ls, ce, stop)
    return out


def _trie_pattern(phrases: Iterable[str]) -> str:
    """One regex alternation for many phrases, longest match first.

    A character trie keeps the alternation fast (each line start costs one
    walk down the trie) and greedy optional groups prefer the longest phrase
    ("gross description" over "gross").  A space in a phrase matches one or
    more spaces or tabs (OCR and typed reports add spaces).
    """
    trie: dict[str, Any] = {}
    for phrase in phrases:
        node = trie
        for ch in phrase:
            node = node.setdefault(ch, {})
        node[""] = {}

    def build(node: dict[str, Any]) -> str:
        alts = []
        for ch in sorted(k for k in node if k):
            head = r"[ \t]{1,8}" if ch == " " else re.escape(ch)
            alts.append(head + build(node[ch]))
        if not alts:
            return ""
        if len(alts) == 1 and "" not in node:
            return alts[0]
        group = "(?:" + "|".join(alts) + ")"
        return group + "?" if "" in node else group

    return build(trie) if trie else "(?!)"


@dataclass(frozen=True, slots=True)
class _Hit:
    """A header found on one line; the header is ``text[header_start:header_end]``."""

    kind: str
    header_start: int
    header_end: int
    line_start: int
    body_start: int
    ambiguous: bool  # also a synoptic key, written "Key: value" -- context decides


# A line's reading, cached by its text: (kind, header start, header end, body
# start, ambiguous) relative to the line start (body -1: the next line), or None;
# and whether it is a known synoptic key line.
_LineClass = tuple[tuple[str, int, int, int, int, bool] | None, bool]


@dataclass(frozen=True, eq=False)
class HeaderLexicon:
    """Section-header vocabulary: synonyms per kind, synoptic keys, part keywords.

    ``headers`` maps a normalised synonym to its kind.  Build one with
    :meth:`load` (checked data file) or directly from mappings in tests.

    >>> lex = HeaderLexicon({"diagnosis": "diagnosis", "gross": "gross"}, ["margins"], ["part"])
    >>> lex.kind_of("  DIAGNOSIS ")
    'diagnosis'
    """

    headers: Mapping[str, str]
    synoptic_keys: Iterable[str]
    part_keywords: Iterable[str]
    cassette_headers: Iterable[str] = ()
    #: Checklist keys whose value names a tumour type, and the head nouns such a
    #: value may leave out ("Histologic type: Squamous cell"); see
    #: :mod:`pathsieve.type_fields`.
    type_keys: tuple[str, ...] = ()
    type_heads: tuple[str, ...] = ()
    source: str = "<memory>"
    _keys: frozenset[str] = field(init=False, repr=False)
    _parts: tuple[str, ...] = field(init=False, repr=False)
    _cassettes: frozenset[str] = field(init=False, repr=False)
    _header_re: re.Pattern[str] = field(init=False, repr=False)
    _key_re: re.Pattern[str] = field(init=False, repr=False)
    _part_re: re.Pattern[str] = field(init=False, repr=False)
    _part_line_re: re.Pattern[str] = field(init=False, repr=False)
    _fuzzy: tuple[tuple[str, ...], tuple[str, ...]] = field(init=False, repr=False)
    _squeezed: tuple[tuple[str, ...], tuple[str, ...]] = field(init=False, repr=False)
    _fuzzy_cache: dict[object, str | None] = field(init=False, repr=False)
    _line_cache: dict[str, _LineClass] = field(init=False, repr=False)

    def __post_init__(self) -> None:
        headers = {normalise_phrase(k): v for k, v in self.headers.items()}
        for phrase, kind in headers.items():
            if kind not in SECTION_KINDS:
                raise VocabError(
                    f"unknown section kind {kind!r} for header {phrase!r}; "
                    f"use one of: {', '.join(SECTION_KINDS)}",
                    path=self.source,
                )
        keys = frozenset(normalise_phrase(k) for k in self.synoptic_keys)
        parts = tuple(normalise_phrase(k) for k in self.part_keywords)
        put = object.__setattr__  # frozen: derived fields are set once, here
        put(self, "headers", headers)
        put(self, "_keys", keys)
        put(self, "_parts", parts)
        put(self, "_cassettes", frozenset(normalise_phrase(k) for k in self.cassette_headers))
        put(
            self,
            "_header_re",
            re.compile(
                r"(?P<lead>" + _DECOR + _ENUM + r")(?P<h>" + _trie_pattern(headers) + ")",
                re.IGNORECASE,
            ),
        )
        put(
            self,
            "_key_re",
            re.compile(
                _KEY_LEAD + r"(?P<k>" + _trie_pattern(keys) + r")[ \t]{0,8}" + _PARENS + ":",
                re.IGNORECASE,
            ),
        )
        kw = _trie_pattern(parts)
        part_body = (
            r"[ \t]{0,12}(?:"
            r"(?P<kw>(?i:" + kw + r"))[ \t]{0,4}(?:#|(?i:no)\.)?[ \t]{0,4}"
            r"(?P<kl>[A-Za-z]|\d{1,2})(?![A-Za-z0-9])[ \t]{0,4}(?P<ksep>[:;.)]|[\-–—]{1,2}|)"
            r"|\((?P<pl>[A-Z]|\d{1,2})\)(?P<psep>[:.]?)"
            r"|(?P<bl>[A-Za-z]|\d{1,2})(?P<bsep>[.):])"
            r")"
        )
        put(self, "_part_re", re.compile(part_body))
        put(self, "_part_line_re", re.compile(r"^" + part_body, re.MULTILINE))
        long_syn = sorted(p for p in headers if len(p) >= _FUZZY_MIN)
        put(self, "_fuzzy", (tuple(long_syn), tuple(headers[p] for p in long_syn)))
        squeezed = sorted(
            {(_squeeze(p), headers[p]) for p in headers if len(_squeeze(p)) >= _FUZZY_MIN}
        )
        put(self, "_squeezed", (tuple(q for q, _ in squeezed), tuple(k for _, k in squeezed)))
        put(self, "_fuzzy_cache", {})
        put(self, "_line_cache", {})

    # -- construction ---------------------------------------------------------
    @classmethod
    def load(cls, path: str | Path) -> HeaderLexicon:
        """Read and check a header lexicon; raise :class:`VocabError` on the first problem."""
        data, problems = _read_checked(Path(path))
        if problems:
            where, line, msg = problems[0]
            more = f" (and {len(problems) - 1} more problem(s))" if len(problems) > 1 else ""
            raise VocabError(msg + more, path=where, line=line)
        assert data is not None
        headers = {syn: kind for kind, syns in data["headers"].items() for syn in syns or ()}
        return cls(
            headers,
            data["synoptic_keys"],
            data["part_keywords"],
            data.get("cassette_headers") or (),
            tuple(data.get("type_keys") or ()),
            tuple(data.get("type_heads") or ()),
            source=str(path),
        )

    # -- queries --------------------------------------------------------------
    def kind_of(self, phrase: str) -> str | None:
        """Kind of a header phrase (exact synonym after normalising), or None."""
        return self.headers.get(normalise_phrase(phrase))

    def is_synoptic_key(self, phrase: str) -> bool:
        return normalise_phrase(phrase) in self._keys

    def is_cassette_header(self, phrase: str) -> bool:
        return normalise_phrase(phrase) in self._cassettes

    @property
    def part_pattern(self) -> re.Pattern[str]:
        """Compiled part-label pattern, matched at a line start (used by ``parts``)."""
        return self._part_re

    @property
    def part_line_pattern(self) -> re.Pattern[str]:
        """The part-label pattern anchored at every line start (for ``finditer``)."""
        return self._part_line_re

    # -- line classification -------------------------------------------------
    def classify(
        self, text: str, lines: list[tuple[int, int, int]]
    ) -> tuple[list[_Hit | None], list[bool]]:
        """Header hit and known-synoptic-key flag of every line (one pass)."""
        header_match = self._header_re.match
        key_match = self._key_re.match
        exact = self._exact
        fuzzy = self._fuzzy_at
        find = text.find
        cache = self._line_cache
        hits: list[_Hit | None] = []
        keys: list[bool] = []
        for ls, le, nxt in lines:
            if le == ls:
                hits.append(None)
                keys.append(False)
                continue
            # A line's reading is a pure function of its text (the patterns see
            # nothing outside it), and report templates repeat lines: keep it,
            # with offsets relative to the line start (-1: the next line).  The
            # last line without a line break is left out: there a body at the
            # line end and one on the next line coincide.
            line = text[ls:le]
            known = cache.get(line)
            if known is not None:
                rel, is_key = known
                if rel is None:
                    hits.append(None)
                else:
                    kind, hs, he, start, body, ambiguous = rel
                    body = nxt if body < 0 else ls + body
                    hits.append(_Hit(kind, ls + hs, ls + he, ls + start, body, ambiguous))
                keys.append(is_key)
                continue
            hit = None
            m = header_match(text, ls, le)
            if m is not None:
                hit = exact(text, m, ls, le, nxt)
            if hit is None and _FUZZY_MIN <= le - ls <= _FUZZY_MAX_LINE:
                hit = fuzzy(text, ls, le, nxt)
            inline = False
            if hit is None and le - ls >= _FUZZY_MIN and find(":", ls, min(le, ls + 64)) >= 0:
                hit = self._fuzzy_inline(text, ls, le)
                inline = hit is not None
            if hit is None and _FUZZY_MIN <= le - ls <= _FUZZY_MAX_LINE:
                hit = self._fuzzy_decorated(text, ls, le, nxt)
            if hit is None and text[le - 1] in ": \t":
                hit = self._trailing(text, ls, le, nxt)
            hits.append(hit)
            if hit is not None:
                is_key = hit.ambiguous and not inline
            else:  # a key line needs a colon: skip the regex on the rest
                is_key = find(":", ls, le) >= 0 and key_match(text, ls, le) is not None
            keys.append(is_key)
            if nxt > le:
                if len(cache) >= _LINE_CACHE:
                    cache.clear()  # bounded memory on long runs over unique lines
                cache[line] = (
                    None
                    if hit is None
                    else (
                        hit.kind,
                        hit.header_start - ls,
                        hit.header_end - ls,
                        hit.line_start - ls,
                        -1 if hit.body_start == nxt else hit.body_start - ls,
                        hit.ambiguous,
                    ),
                    is_key,
                )
        return hits, keys

    def _exact(self, text: str, m: re.Match[str], ls: int, le: int, nxt: int) -> _Hit | None:
        header = m.group("h")
        phrase = normalise_phrase(header)
        kind = self.headers.get(phrase)
        if kind is None:  # the trie matched a prefix that is not itself a synonym
            return None
        hs = m.start("h")
        h_end = m.end("h")
        decorated = bool(m.group("lead").strip())
        tail_re = _TAIL_NO_NUM if phrase in self._parts else _TAIL
        t = tail_re.match(text, h_end, le)
        assert t is not None  # every part of the tail is optional
        sep = t.group("sep")
        after = t.end()
        first_upper = header[:1].isupper()
        all_caps = header.upper() == header
        short = len(phrase.replace(" ", "")) <= _SHORT
        if _DECOR_END.match(text, after, le):
            # Alone on its line (perhaps with a colon, period or decoration).
            if sep == ":" or (not short and (first_upper or decorated)):
                return _Hit(kind, hs, h_end, ls, nxt, False)
            return None
        if not sep and not short and (all_caps or first_upper):
            compound = _COMPOUND.match(text, after, le)
            if compound is not None:
                return _Hit(kind, hs, h_end, ls, nxt, False)
        if short and sep != ":":
            return None
        if sep == ":":
            body = _SPACES.match(text, after, le)
            assert body is not None
            # "Procedure: Sigmoidectomy" may be a checklist line: context decides.
            return _Hit(kind, hs, h_end, ls, body.end(), phrase in self._keys)
        if sep and sep[0] in "-–—" and first_upper and not t.group("num"):
            body = _SPACES.match(text, after, le)
            assert body is not None
            return _Hit(kind, hs, h_end, ls, body.end(), False)
        if all_caps and not t.group("num"):
            # "DIAGNOSISTubular adenoma": OCR dropped the colon and the space.
            if (
                h_end + 1 < le
                and text[h_end].isupper()
                and text[h_end + 1].islower()
                and len(phrase) >= 4
            ):
                return _Hit(kind, hs, h_end, ls, h_end, False)
            # "GROSS      Received in formalin": column layout.
            gap = _COLUMN_GAP.match(text, h_end, le)
            if gap is not None:
                return _Hit(kind, hs, h_end, ls, gap.end(), False)
        return None

    def _fuzzy_at(self, text: str, ls: int, le: int, nxt: int) -> _Hit | None:
        """A header line with one or two OCR errors ("GROSS DESCRIPTOIN").

        Only header-shaped lines are tried: mostly capitals, Title Case, or a
        trailing colon; sentence-case prose ("Tubular adenoma.") is not.
        """
        syns, _ = self._fuzzy
        if not syns:
            return None
        m = _FUZZY_LINE.match(text, ls, le)
        if m is None:
            return None
        raw = m.group("w").rstrip(" -")
        if not (m.group("colon") or _header_shaped(raw)):
            return None
        query = normalise_phrase(raw)
        if len(query) < _FUZZY_MIN or query.count(" ") > 4:
            return None
        kind = self._cached_kind(query, _mostly_capitals(raw))
        if kind is None:
            return None
        hs = m.start("w")
        return _Hit(kind, hs, hs + len(raw), ls, nxt, False)

    def _fuzzy_inline(self, text: str, ls: int, le: int) -> _Hit | None:
        """An OCR-damaged header in capitals before a colon, alone or with text after it.

        "I1PRESSION:Submitted ...", "INPRE S S ION :", "II+WRESSION:", "FINAI.i DIAGNOSIS:":
        the head is compared letters-only with the synonyms (see :meth:`_squeezed_kind`).
        A known checklist key ("Tumor size: 2 cm") is never read this way, nor a head in
        lower or Title Case, which is the shape of an ordinary ``Key: value`` line.
        """
        m = _FUZZY_HEAD.match(text, ls, le)
        if m is None or self._key_re.match(text, ls, le) is not None:
            return None
        raw = m.group("w").rstrip(" -")
        if not _mostly_capitals(raw):
            return None
        kind = self._cached_kind(normalise_phrase(raw), True)
        if kind is None:
            return None
        body = _SPACES.match(text, m.end(), le)
        assert body is not None
        hs = m.start("w")
        # Written "Key:" it may be a damaged checklist key: inside a synoptic
        # section it is read as one (ambiguous), elsewhere as a header.
        return _Hit(kind, hs, hs + len(raw), ls, body.end(), True)

    def _trailing(self, text: str, ls: int, le: int, nxt: int) -> _Hit | None:
        """A header in capitals with a colon that ends a line of other text.

        Page exports join a header to the line before it ("...left vas DIAGNOSIS:",
        "...at the vascular margin. ADDENDUM:"); the section starts at the header.  The
        whole run of capitals before the colon must be a synonym of seven
        letters or more that is not also a checklist key, and what precedes it
        must not be a comma (a list of sites, "E. RIGHT LUNG, SPECIMEN:").
        """
        j = le
        while j > ls and text[j - 1] in " \t":
            j -= 1
        if j - ls < 10 or text[j - 1] != ":":
            return None
        he = j - 1
        while he > ls and text[he - 1] in " \t":
            he -= 1
        hs = he
        while hs > ls and he - hs <= 60 and (text[hs - 1].isupper() or text[hs - 1] in _CAPS_RUN):
            hs -= 1
        while hs < he and text[hs] in _CAPS_RUN:
            hs += 1
        if hs <= ls or he - hs < 7 or text[ls:hs].rstrip()[-1:] in (",", ""):
            return None
        phrase = normalise_phrase(text[hs:he])
        kind = self.headers.get(phrase)
        if kind is None or phrase in self._keys or len(phrase.replace(" ", "")) < 7:
            return None
        return _Hit(kind, hs, he, hs, nxt, False)

    def _fuzzy_decorated(self, text: str, ls: int, le: int, nxt: int) -> _Hit | None:
        """A header in capitals inside a line of decoration that OCR has garbled.

        "********'II.*'IIDIAGNOSI5******U***", "at**aat***DIAGNOSIS*t* aaaat***": a
        line with six or more decoration marks whose one long run of capitals
        is a damaged header (compared letters-only) and whose other text is no
        more than stray letters.
        """
        line = text[ls:le]
        if sum(map(line.count, _DECOR_MARKS)) < 6:
            return None
        runs = list(_DECORATED_RUN.finditer(line))
        if not runs:
            return None
        run = max(runs, key=lambda r: len(r.group()))
        raw = run.group()
        rest = line[: run.start()] + " " + line[run.end() :]
        if _LONG_WORD.search(rest) or not _mostly_capitals(raw):
            return None
        kind = self._cached_kind(normalise_phrase(raw), True)
        if kind is None:
            return None
        return _Hit(kind, ls + run.start(), ls + run.end(), ls, nxt, False)

    def _cached_kind(self, query: str, capitals: bool) -> str | None:
        cache = self._fuzzy_cache
        key = (query, capitals)
        if key in cache:
            return cache[key]
        if len(cache) >= _FUZZY_CACHE:
            cache.clear()  # bounded memory on long runs over unique OCR lines
        kind = cache[key] = self._nearest_kind(query) or self._squeezed_kind(query, capitals)
        return kind

    def _squeezed_kind(self, query: str, capitals: bool) -> str | None:
        """Kind of a header whose OCR damage goes beyond one or two letters.

        Both sides are compared as letters only, digits read as the letters OCR
        mistakes them for ("I1PRESSION" -> "iipression", "INPRE S S ION" ->
        "inpression"); a squeezed head of ten letters or more may be two edits
        from a synonym ("II+WRESSION" -> "iiwression").  A single word that is
        an ordinary English word ("EXPRESSION") is not a damaged header, nor a
        head with a word that starts with a digit ("CASSETTE 4D-4E").  Spaced-out
        letters ("S S ION") are OCR damage in a head in capitals; in a Title Case
        head a short word after the first is a code ("Clinical M MX").
        """
        syns, kinds = self._squeezed
        q = _squeeze(query)
        if len(q) < _FUZZY_MIN or len(q) > 48 or not syns:
            return None
        words = [w for w in query.split() if any(c.isalnum() for c in w)]
        if len(words) == 1 and query in _common_words():
            return None
        if any(w[0].isdigit() for w in words):
            return None
        if not capitals and any(len(w) <= 2 for w in words[1:]):
            return None
        # two edits in a head of ten letters or more; in capitals, of nine ("DIDGHOSIS")
        long_from = _SQUEEZED_LONG - 1 if capitals else _SQUEEZED_LONG
        cutoff = 2 if len(q) >= long_from else 1
        found = process.extract(q, syns, scorer=Levenshtein.distance, score_cutoff=cutoff, limit=4)
        if not found:
            return None
        best = min(score for _, score, _ in found)
        best_kinds = {kinds[i] for _, score, i in found if score == best}
        return best_kinds.pop() if len(best_kinds) == 1 else None

    def _nearest_kind(self, query: str) -> str | None:
        syns, kinds = self._fuzzy
        cutoff = 2 if len(query) >= _FUZZY_LONG else 1
        found = process.extract(
            query, syns, scorer=Levenshtein.distance, score_cutoff=cutoff, limit=4
        )
        if not found:
            return None
        best = min(score for _, score, _ in found)
        best_kinds = {kinds[i] for _, score, i in found if score == best}
        if len(best_kinds) != 1:
            return None  # as close to two kinds: do not guess
        return best_kinds.pop()

    def is_key_line(self, text: str, ls: int, le: int) -> bool:
        return self._key_re.match(text, ls, le) is not None


# -- the data file ------------------------------------------------------------
def _line(node: yaml.Node) -> int:
    return int(node.start_mark.line) + 1


def _read_checked(path: Path) -> tuple[dict[str, Any] | None, list[tuple[str, int | None, str]]]:
    """Parse the lexicon keeping line numbers; return (data, problems)."""
    where = str(path)
    try:
        raw = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        return None, [(where, None, f"cannot read header lexicon: {exc}; check the path")]
    try:
        root = yaml.compose(raw, Loader=yaml.SafeLoader)
    except yaml.YAMLError as exc:
        mark = getattr(exc, "problem_mark", None)
        line = int(mark.line) + 1 if mark is not None else None
        problem = getattr(exc, "problem", None) or str(exc)
        return None, [(where, line, f"not valid YAML: {problem}; fix the syntax")]
    problems: list[tuple[str, int | None, str]] = []

    def add(node: yaml.Node | None, msg: str) -> None:
        problems.append((where, _line(node) if node is not None else None, msg))

    if not isinstance(root, yaml.MappingNode):
        add(root, "the header lexicon must be a mapping with keys " + ", ".join(_REQUIRED_KEYS))
        return None, problems
    top: dict[str, yaml.Node] = {}
    for knode, vnode in root.value:
        key = str(knode.value)
        if key not in _TOP_KEYS:
            add(knode, f"unknown top-level key {key!r}; expected one of {', '.join(_TOP_KEYS)}")
        top[key] = vnode
    for key in _REQUIRED_KEYS:
        if key not in top:
            add(root, f"missing top-level key {key!r}; add it (a list or mapping)")
    vnode = top.get("version")
    if vnode is not None and str(vnode.value) != "1":
        add(vnode, f"unsupported lexicon version {vnode.value!r}; this pathsieve reads version 1")

    headers: dict[str, list[str]] = {}
    seen: dict[str, tuple[str, int]] = {}
    hnode = top.get("headers")
    if hnode is not None and not isinstance(hnode, yaml.MappingNode):
        add(hnode, "'headers' must map each section kind to a list of synonyms")
    elif hnode is not None:
        for knode, vnode in hnode.value:
            kind = str(knode.value)
            if kind not in SECTION_KINDS:
                add(knode, f"unknown section kind {kind!r}; use one of: {', '.join(SECTION_KINDS)}")
            syns = headers.setdefault(kind, [])
            for item in _list_items(vnode, f"headers.{kind}", add):
                phrase = normalise_phrase(str(item.value))
                bad = _bad_phrase(phrase)
                if bad:
                    add(item, f"header synonym {item.value!r} {bad}")
                    continue
                if phrase in seen:
                    other_kind, other_line = seen[phrase]
                    if other_kind == kind:
                        add(
                            item,
                            f"header synonym {phrase!r} listed twice under {kind} (first at line {other_line}); delete one",
                        )
                    else:
                        add(
                            item,
                            f"header synonym {phrase!r} listed under both {other_kind} (line {other_line}) and {kind}; keep it under one kind",
                        )
                    continue
                seen[phrase] = (kind, _line(item))
                syns.append(phrase)

    lists: dict[str, list[str]] = {}
    for key in ("synoptic_keys", "part_keywords", "cassette_headers", "type_keys", "type_heads"):
        node = top.get(key)
        values: list[str] = []
        first: dict[str, int] = {}
        if node is not None:
            for item in _list_items(node, key, add):
                phrase = normalise_phrase(str(item.value))
                bad = _bad_phrase(phrase)
                if bad:
                    add(item, f"{key} entry {item.value!r} {bad}")
                    continue
                if key == "part_keywords" and not phrase.isalpha():
                    add(item, f"part keyword {item.value!r} must be one word of letters")
                    continue
                if phrase in first:
                    add(
                        item,
                        f"{key} entry {phrase!r} listed twice (first at line {first[phrase]}); delete one",
                    )
                    continue
                if key == "type_keys" and phrase not in lists.get("synoptic_keys", ()):
                    add(
                        item,
                        f"type key {phrase!r} is not a synoptic key; add it under synoptic_keys",
                    )
                    continue
                if key == "type_heads" and not phrase.isalpha():
                    add(item, f"type head {item.value!r} must be one word of letters")
                    continue
                if key == "cassette_headers" and seen.get(phrase, ("", 0))[0] != "gross":
                    add(
                        item,
                        f"cassette header {phrase!r} is not a gross header synonym; add it under headers.gross",
                    )
                    continue
                first[phrase] = _line(item)
                values.append(phrase)
        lists[key] = values
    if problems:
        problems.sort(key=lambda p: p[1] or 0)  # in file order
        return None, problems
    data: dict[str, Any] = {"headers": headers, **lists}
    return data, problems


def _list_items(node: yaml.Node, name: str, add: Any) -> list[yaml.ScalarNode]:
    if isinstance(node, yaml.ScalarNode) and node.value in ("", "~", "null"):
        return []
    if not isinstance(node, yaml.SequenceNode):
        add(node, f"{name!r} must be a list of strings")
        return []
    out = []
    for item in node.value:
        if not isinstance(item, yaml.ScalarNode):
            add(item, f"entries of {name!r} must be plain strings, not lists or mappings")
            continue
        out.append(item)
    return out


def _bad_phrase(phrase: str) -> str:
    if not phrase:
        return "is empty; delete it"
    if len(phrase) > 60:
        return "is longer than 60 characters; shorten it"
    if ":" in phrase:
        return "contains a colon; write the header without it"
    if not _SYNONYM_OK.match(phrase):
        return "must start with a letter and use letters, digits, spaces and ()'&/.- only"
    return ""


def check_headers(path: str | Path) -> list[str]:
    """Problems in a header lexicon, as ``"file:line: message"`` strings ([] when fine).

    >>> check_headers(lexicon_path(HEADER_FILE))
    []
    """
    _, problems = _read_checked(Path(path))
    out = []
    for where, line, msg in problems:
        out.append(f"{where}:{line}: {msg}" if line is not None else f"{where}: {msg}")
    return out


@lru_cache(maxsize=8)
def _cached(vocab_env: str | None) -> HeaderLexicon:
    path = lexicon_path(HEADER_FILE)
    if not path.exists():
        raise VocabError(
            "header lexicon not found; set PATHSIEVE_VOCAB to the ontology folder",
            path=path,
        )
    return HeaderLexicon.load(path)


def default_lexicon() -> HeaderLexicon:
    """The shipped lexicon (or the one under ``PATHSIEVE_VOCAB``), loaded once per folder.

    Call ``default_lexicon.cache_clear()`` after editing the file in a running process.
    """
    return _cached(os.environ.get("PATHSIEVE_VOCAB"))


default_lexicon.cache_clear = _cached.cache_clear  # type: ignore[attr-defined]


# -- the sectioner --------------------------------------------------------------
#: Sections that an inline note ("Comment: ...") may interrupt without ending them,
#: and the kinds of such notes.
_PARENTS = frozenset({"diagnosis", "addendum"})
_EMBEDDED = frozenset({"comment", "other", "microscopic", "clinical_history"})
#: A bare run needs this many known synoptic keys; gaps it tolerates between keys.
_MIN_KEYS = 3
_MAX_BLANK = 1
_MAX_PROSE = 2


def find_sections(text: str, *, lexicon: HeaderLexicon | None = None) -> list[Section]:
    """Sections of a report, sorted, contiguous and covering the whole text.

    >>> t = "Clinical History: polyp\\nFINAL DIAGNOSIS\\nTubular adenoma.\\n"
    >>> [(s.kind, t[s.start:s.body_start]) for s in find_sections(t)]
    [('clinical_history', 'Clinical History: '), ('diagnosis', 'FINAL DIAGNOSIS\\n')]
    """
    if not text:
        return []
    lex = lexicon if lexicon is not None else default_lexicon()
    scan = for_matching(text)
    lines = _line_table(scan)
    hits, keys = lex.classify(scan, lines)
    runs = _synoptic_runs(scan, lines, hits, keys, lex) if sum(keys) >= _MIN_KEYS else []
    bare = _bare_key_runs(text, lines, hits, lex)
    if bare:
        taken = {i for first, last in runs for i in range(first, last + 1)}
        runs = sorted(
            runs + [(f, la) for f, la in bare if not taken.intersection(range(f, la + 1))]
        )

    # Sweep lines in order: headers open sections; a bare synoptic run opens a
    # synoptic section (unless already in one) and hands back to the
    # enclosing kind after it.
    opened: list[tuple[str, str, int, int]] = []  # kind, header, start, body_start
    real_headers = 0
    cur = ""
    run_at = {first: last for first, last in runs}
    i = 0
    n = len(lines)
    while i < n:
        hit = hits[i]
        last = run_at.get(i)
        if last is not None:
            if cur != "synoptic":
                ls = lines[i][0]
                opened.append(("synoptic", "", ls, ls))
                after = lines[last][2]
                if after < len(text):
                    opened.append((cur or "", "", after, after))
            i = last + 1
            continue
        if hit is not None and not (hit.ambiguous and cur == "synoptic"):
            header = text[hit.header_start : hit.header_end]  # as in the original
            opened.append((hit.kind, header, hit.line_start, hit.body_start))
            real_headers += 1
            if cur in _PARENTS and hit.kind in _EMBEDDED and hit.body_start < lines[i][1]:
                # "Comment: fragmented." inside a diagnosis: a note, not the end
                # of the diagnosis -- the diagnosis resumes after its paragraph.
                # A field such as "Specimen: sigmoid colon" takes its line only.
                last = (
                    i if hit.kind == "other" else _paragraph_end(scan, lines, hits, run_at, i, lex)
                )
                opened.append((cur, "", lines[last][2], lines[last][2]))
                i = last + 1
                continue
            cur = hit.kind
        i += 1

    lead_kind = "other" if real_headers else "diagnosis"
    fixed = [(k or lead_kind, h, s, b) for k, h, s, b in opened]
    if not fixed or fixed[0][2] > 0:
        fixed.insert(0, (lead_kind, "", 0, 0))
    sections: list[Section] = []
    for j, (kind, header, start, body) in enumerate(fixed):
        end = fixed[j + 1][2] if j + 1 < len(fixed) else len(text)
        if end <= start:
            continue
        if not header and sections and start > 0 and not text[start:end].strip():
            # White space left after a synoptic run or a note: give it to that.
            prev = sections[-1]
            sections[-1] = Section(prev.kind, prev.header, prev.start, end, prev.body_start)
            continue
        sections.append(Section(kind, header, start, end, min(body, end)))
    return sections


def _paragraph_end(
    text: str,
    lines: list[tuple[int, int, int]],
    hits: list[_Hit | None],
    run_at: dict[int, int],
    i: int,
    lex: HeaderLexicon,
) -> int:
    """Last line of the paragraph that starts at line ``i``.

    A paragraph ends before a blank line, a header, a synoptic run or a
    specimen-part label.
    """
    part_match = lex.part_pattern.match
    j = i + 1
    n = len(lines)
    while j < n:
        ls, le, _ = lines[j]
        if hits[j] is not None or j in run_at or _BLANK.match(text, ls, le):
            break
        pm = part_match(text, ls, le)
        if pm is not None and is_part_label(text, pm, le):
            break
        j += 1
    return j - 1


def _synoptic_runs(
    text: str,
    lines: list[tuple[int, int, int]],
    hits: list[_Hit | None],
    keys: list[bool],
    lex: HeaderLexicon,
) -> list[tuple[int, int]]:
    """Runs of synoptic ``Key: value`` lines, as (first, last) line indexes.

    A run starts at a known key and goes on over known keys, other
    ``Key: value`` lines, one blank line or up to two wrapped-value lines at a
    time; a real header or a specimen-part line ends it.  It ends at its last
    key line (plus indented continuation lines) and counts when it holds at
    least three known keys.  Linear: a failed run resumes after its end.
    """
    part_re = lex.part_pattern
    n = len(lines)

    known = keys.__getitem__
    runs: list[tuple[int, int]] = []
    i = 0
    while i < n:
        if not known(i):
            i += 1
            continue
        first = last = i
        count = 1
        blanks = prose = 0
        j = i + 1
        while j < n:
            ls, le, _ = lines[j]
            h = hits[j]
            if h is not None and not h.ambiguous:
                break
            if known(j):
                count += 1
                last = j
                blanks = prose = 0
            elif _BLANK.match(text, ls, le):
                blanks += 1
                if blanks > _MAX_BLANK:
                    break
            elif _GENERIC_KEY.match(text, ls, le):
                last = j
                blanks = prose = 0
            else:
                pm = part_re.match(text, ls, le)
                if pm is not None and is_part_label(text, pm, le):
                    break
                prose += 1
                if prose > _MAX_PROSE:
                    break
            j += 1
        if count >= _MIN_KEYS:
            # Keep indented continuation lines of the last value.
            k = last + 1
            while k < n and hits[k] is None and _INDENTED.match(text, lines[k][0], lines[k][1]):
                k += 1
            runs.append((first, k - 1))
            i = k
        else:
            i = max(j, i + 1)
    return runs


#: A printed checklist of bare keys: how many keys make one, how many lines a value
#: (or a key OCR has made unknown) may take, and the longest key line.
_BARE_MIN_KEYS = 4
_BARE_MAX_VALUE_LINES = 4
_BARE_KEY_MAX = 40


def _bare_key_runs(
    text: str,
    lines: list[tuple[int, int, int]],
    hits: list[_Hit | None],
    lex: HeaderLexicon,
) -> list[tuple[int, int]]:
    """Printed checklists: known keys in capitals alone on their lines, values below.

    "HISTOLOGIC TYPE" / "Squamous cell carcinoma" / "HISTOLOGIC GRADE" / "G2": no
    colons, so :func:`_synoptic_runs` sees no ``Key: value`` line.  A run starts
    at such a key line, goes on over further key lines, up to
    ``_BARE_MAX_VALUE_LINES`` other lines between two keys (values, keys OCR has
    damaged) and a group heading in capitals ("MICROSCOPIC", a header elsewhere)
    followed by such lines; a blank line, a longer stretch without a key, or a
    header in lower case ends it.  It ends with the value of its last key and
    counts with ``_BARE_MIN_KEYS`` keys or more.  Linear in the lines.
    """
    n = len(lines)
    is_key = lex.is_synoptic_key
    bare: list[bool] = []
    for ls, le, _ in lines:
        line = text[ls:le].strip()
        bare.append(
            0 < len(line) <= _BARE_KEY_MAX
            and line.isupper()
            and ":" not in line
            and is_key(line.strip(" .-*"))
        )
    if sum(bare) < _BARE_MIN_KEYS:
        return []
    runs: list[tuple[int, int]] = []
    i = 0
    while i < n:
        if not bare[i]:
            i += 1
            continue
        first = last = i
        count = 1
        since = 0
        j = i + 1
        while j < n:
            ls, le, _ = lines[j]
            line = text[ls:le].strip()
            if bare[j]:
                count += 1
                last = j
                since = 0
            elif not line:
                break
            elif hits[j] is not None and not line.isupper():
                break  # a header written as prose ends the checklist
            else:
                since += 1
                if since > _BARE_MAX_VALUE_LINES:
                    break
            j += 1
        if count >= _BARE_MIN_KEYS:
            # the last key's value: the lines after it that are no header
            k = last + 1
            while (
                k < n
                and k - last <= _BARE_MAX_VALUE_LINES
                and hits[k] is None
                and text[lines[k][0] : lines[k][1]].strip()
            ):
                k += 1
            runs.append((first, k - 1))
            i = k
        else:
            i = j
    return runs


def _squeeze(phrase: str) -> str:
    """A header as letters only, OCR digits read as letters.

    >>> _squeeze("I1PRESSION"), _squeeze("final diagnosis"), _squeeze("Specimen(s)")
    ('iipression', 'finaldiagnosis', 'specimens')
    """
    return _NOT_LETTER.sub("", phrase.lower().translate(_OCR_LETTERS))


@lru_cache(maxsize=8)
def _common_words_in(path: str) -> frozenset[str]:
    from .matcher import load_common_words  # the matcher owns the file's format

    try:
        return load_common_words(path)
    except VocabError:
        return frozenset()  # reported by the vocabulary checker, not here


def _common_words() -> frozenset[str]:
    """Ordinary words (``common_words.txt``): never read as a damaged header."""
    return _common_words_in(str(lexicon_path("common_words.txt")))


def _mostly_capitals(raw: str) -> bool:
    """At most one lower-case letter for five capitals ("FINAI.i DIAGNOSIS")."""
    return sum(map(str.islower, raw)) * 5 <= sum(map(str.isupper, raw))


def _header_shaped(raw: str) -> bool:
    """Mostly capitals ("FINAL DIAGNOSlS") or every long word capitalised."""
    if raw.isupper():
        return True
    if sum(map(str.islower, raw)) * 5 <= sum(map(str.isupper, raw)):
        return True
    return all(w[:1].isupper() for w in raw.split() if len(w) > 3)


def is_generic_key_line(text: str, ls: int, le: int) -> bool:
    """Whether ``text[ls:le]`` looks like a ``Key: value`` line (any key)."""
    return _GENERIC_KEY.match(text, ls, le) is not None


def is_part_label(text: str, m: re.Match[str], le: int) -> bool:
    """Whether a :attr:`HeaderLexicon.part_pattern` match is a real label.

    A bare label ("A.", "(B)", "1)") must be followed by a space or the line
    end ("1.5 cm" and "A.M." are not labels) -- or, after a dot, by a word
    ("1.LUNG", "A.Right ovary"); a keyword label needs a separator or a space
    after it ("Specimen A is received", "Part 2:", OCR "PART 1;").
    """
    if m.group("kw") is not None:
        if m.group("ksep"):
            return True
        end = m.end("kl")
    else:
        end = m.end()
    if end >= le or text[end] in " \t":
        return True
    # "1.LUNG, RIGHT LOWER LOBE", "A.Right ovary": OCR dropped the space after
    # the label.  Two letters must follow, so "A.M." stays an abbreviation.
    nxt = text[end : end + 2]
    return (
        m.group("bl") is not None
        and m.group("bsep") == "."
        and len(nxt) == 2
        and nxt[0].isupper()
        and nxt[1].isalpha()
    )
