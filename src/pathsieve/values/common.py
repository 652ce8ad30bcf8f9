"""What the value readers share: regions, phrase patterns, numbers and sizes.

Regex *structure* lives in the reader modules; the words come from the value
lexicon and are turned into patterns here.

Speed: one Aho–Corasick pass over the report finds where the leading words of
every pattern occur, shared out to its regions (:class:`Anchors`); a reader
whose words are absent from a region is not run there (:func:`gate`); and each
pattern is tried only where its words occur
(:meth:`Rx.match_at`); patterns that start with a number are tried only at
numbers shortly before the word they need (:meth:`Numbers.positions_near`).
Patterns run on the lower-cased region without ``re.IGNORECASE`` (which is
several times slower), each alternation branch starting with a plain character
and its word-boundary test placed just after it.  Abbreviations, which must
match as written ("ER", not "er"), are lower-cased for that scan and then
checked on the original text by a twin pattern (:class:`Rx`).  No pattern nests
unbounded repetition, so readers run in time linear in the region (see the
adversarial test).

>>> print(phrase_pattern("lymph-vascular invasion"))
lymph[-\\s]?vascular\\s+invasion
"""

from __future__ import annotations

import re
import weakref
from bisect import bisect_left, bisect_right
from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass, field
from decimal import Decimal, InvalidOperation
from typing import Any

import ahocorasick

from ..records import Value
from .lexicon import ValueLexicon

__all__ = [
    "END_DIGIT",
    "NUM",
    "Anchors",
    "Found",
    "Numbers",
    "Region",
    "Report",
    "Rx",
    "Sizes",
    "alternation",
    "gate",
    "keep_non_overlapping",
    "near",
    "near_before",
    "phrase_pattern",
    "present",
    "windows",
]

_WORDCHAR = re.compile(r"\w")

#: After a one-digit value: not the start of a longer number, a decimal, a percentage
#: or a sum ("7." ends a sentence; "7.5", "70%" and "4+" are something else).
END_DIGIT = r"(?!\d|[.,]\d|\s?%|\s?\+)"

# Abbreviations are wrapped in these private-use marks inside a pattern source;
# :class:`Rx` renders them lower-case for the scan and case-sensitive for the check.
_OPEN, _CLOSE = "\ue000", "\ue001"
_MARKED = re.compile(f"{_OPEN}(.*?){_CLOSE}", re.DOTALL)
#: The preceding character is not a letter or digit (placed after a branch's first
#: character, so that the branch still starts with a plain character).
_NOT_AFTER_WORD = r"(?<![^\W_].)"


def _pieces(phrase: str) -> list[str]:
    """One regex piece per character of a phrase (spaces collapsed to one piece)."""
    out: list[str] = []
    for i, token in enumerate(phrase.split()):
        if i:
            out.append(r"\s+")
        for ch in token:
            if ch == "-":
                out.append(r"[-\s]?")
            elif ch == "/":
                out.append(r"\s?/\s?")
            elif ch in "'’":
                out.append(r"['’]?")
            else:
                out.append(re.escape(ch))
    return out


def phrase_pattern(phrase: str) -> str:
    """A regex for one lexicon phrase: flexible spaces, hyphens and apostrophes."""
    return "".join(_pieces(phrase))


def _branch(phrase: str, *, abbreviation: bool, left: bool, right: bool) -> str:
    pieces = _pieces(phrase)
    if not pieces:
        return "(?!)"
    first, rest = pieces[0], "".join(pieces[1:])
    if abbreviation:
        first = f"{_OPEN}{first}{_CLOSE}"
        rest = f"{_OPEN}{rest}{_CLOSE}" if rest else ""
    pre = _NOT_AFTER_WORD if left and _WORDCHAR.match(phrase[0]) else ""
    post = r"(?![^\W_])" if right and _WORDCHAR.match(phrase[-1]) else ""
    return first + pre + rest + post


def alternation(
    phrases: Iterable[str] = (),
    abbreviations: Iterable[str] = (),
    *,
    left: bool = True,
    right: bool = True,
) -> str:
    """One non-capturing group matching any phrase (any case) or abbreviation (as written).

    Longer entries come first, so "not involved" wins over "involved" at one position.
    Compile the result with :class:`Rx` (it holds abbreviation marks).
    """
    items: list[tuple[int, str]] = []
    for p in phrases:
        items.append((len(p), _branch(p, abbreviation=False, left=left, right=right)))
    for a in abbreviations:
        items.append((len(a), _branch(a, abbreviation=True, left=left, right=right)))
    if not items:
        return "(?!)"
    items.sort(key=lambda t: -t[0])
    return "(?:" + "|".join(body for _, body in items) + ")"


class Rx:
    """A reader pattern: scanned on the lower-cased region, abbreviations checked as written.

    The returned match objects come from the original text when the pattern holds
    abbreviations (group texts keep their case) and from the lower-cased text
    otherwise; offsets are the same either way.
    """

    __slots__ = ("pattern", "scan", "twin")

    def __init__(self, source: str) -> None:
        self.pattern = source
        self.scan = re.compile(_MARKED.sub(lambda m: m.group(1).lower(), source))
        if _OPEN in source:
            self.twin: re.Pattern[str] | None = re.compile(
                _MARKED.sub(lambda m: f"(?-i:{m.group(1)})", source), re.IGNORECASE
            )
        else:
            self.twin = None

    def _check(self, m: re.Match[str], region: Region) -> re.Match[str] | None:
        if self.twin is None:
            return m
        return self.twin.fullmatch(region.body, m.start(), m.end())

    def finditer(
        self, region: Region, pos: int = 0, endpos: int | None = None
    ) -> Iterator[re.Match[str]]:
        end = len(region.low) if endpos is None else endpos
        for m in self.scan.finditer(region.low, pos, end):
            c = self._check(m, region)
            if c is not None:
                yield c

    def search(
        self, region: Region, pos: int = 0, endpos: int | None = None
    ) -> re.Match[str] | None:
        end = len(region.low) if endpos is None else endpos
        while pos <= end:
            m = self.scan.search(region.low, pos, end)
            if m is None:
                return None
            c = self._check(m, region)
            if c is not None:
                return c
            pos = m.start() + 1
        return None

    def match(
        self, region: Region, pos: int = 0, endpos: int | None = None
    ) -> re.Match[str] | None:
        end = len(region.low) if endpos is None else endpos
        m = self.scan.match(region.low, pos, end)
        return None if m is None else self._check(m, region)

    def match_at(
        self, region: Region, positions: Iterable[int], endpos: int | None = None
    ) -> list[re.Match[str]]:
        """Matches starting exactly at the given sorted positions, never overlapping."""
        if not positions:
            return _NO_MATCHES  # the common case: the pattern's words are not here
        low = region.low
        end = len(low) if endpos is None else endpos
        last = -1
        scan = self.scan.match
        twin = self.twin
        out: list[re.Match[str]] = []
        for p in positions:
            if p < last or p >= end:
                continue
            m = scan(low, p, end)
            if m is None:
                continue
            if twin is not None:
                m = twin.fullmatch(region.body, m.start(), m.end())
                if m is None:
                    continue
            last = m.end()
            out.append(m)
        return out


_NO_MATCHES: list[re.Match[str]] = []


def _stems(phrases: Iterable[str]) -> tuple[str, ...]:
    """The first run of letters/digits of each phrase (its first character otherwise),
    minus any stem that starts with a shorter one: every phrase starts where a stem does."""
    keys: set[str] = set()
    for p in phrases:
        m = re.match(r"[^\W_]+", p)
        keys.add(m.group(0) if m else p[:1])
    kept: list[str] = []
    for k in sorted(keys, key=len):
        if not any(k.startswith(s) for s in kept):
            kept.append(k)
    return tuple(kept)


#: Stems shorter than this must be whole words where they occur ("no" but not "node").
_SHORT_STEM = 3


class _StemIndex:
    """The stems of all live anchors: one Aho–Corasick automaton over the lower-cased
    text, and ``str.find`` for the few abbreviations matched as written.

    One pass over the whole report finds every stem (:meth:`report_hits`); a
    region then takes, for each anchor it asks about, the hits that lie inside
    it (:meth:`positions`), with the whole-word test of a short stem made
    against the region's own ends -- exactly what a pass over the region alone
    would find, for a fraction of the cost (a report has some eight regions and
    most anchors occur in none of them).
    """

    def __init__(self) -> None:
        # (side, stem) -> ids of the anchors that use it; side 0 = lower-cased, 1 = as written
        self._owners: dict[tuple[int, str], list[int]] = {}
        self._automata: _Automata | None = None
        #: bumped whenever the anchors change, so that a report's hits are not reused
        self.version = 0

    def add(self, anchor_id: int, low_keys: Iterable[str], body_keys: Iterable[str]) -> None:
        for side, keys in ((0, low_keys), (1, body_keys)):
            for k in keys:
                self._owners.setdefault((side, k), []).append(anchor_id)
        self._automata = None
        self.version += 1

    def remove(self, anchor_id: int) -> None:
        """Forget a collected anchor (its id may be reused by a new object)."""
        for key in list(self._owners):
            owners = [a for a in self._owners[key] if a != anchor_id]
            if owners:
                self._owners[key] = owners
            else:
                del self._owners[key]
        self._automata = None
        self.version += 1

    def _build(self) -> _Automata:
        auto = ahocorasick.Automaton()
        # Abbreviations are few and rare as written: a regex of them all finds where
        # one may start (it skips on their first letters), and each is checked there.
        as_written: dict[str, list[tuple[str, tuple[int, bool, tuple[int, ...]]]]] = {}
        for (side, key), owners in self._owners.items():
            short = side == 0 and len(key) < _SHORT_STEM and key.isalnum()
            if side == 0:
                auto.add_word(key, (len(key), short, tuple(owners)))
            elif key:
                as_written.setdefault(key[0], []).append((key, (len(key), False, tuple(owners))))
        if len(auto):
            auto.make_automaton()
        starts = (
            re.compile("|".join(re.escape(k) for keys in as_written.values() for k, _ in keys))
            if as_written
            else None
        )
        return (auto if len(auto) else None), starts, as_written

    def _hits(self, low: str, body: str) -> list[tuple[int, tuple[int, bool, tuple[int, ...]]]]:
        """(last index, (size, short, owners)) of every stem occurrence."""
        if self._automata is None:
            self._automata = self._build()
        auto, starts, as_written = self._automata
        hits: list[tuple[int, tuple[int, bool, tuple[int, ...]]]] = []
        if auto is not None:
            hits.extend(auto.iter(low))
        if starts is not None:
            # every start of every abbreviation, overlapping ones included ("ER" in "HER")
            search = starts.search
            m = search(body)
            while m is not None:
                i = m.start()
                for key, info in as_written[body[i]]:
                    if body.startswith(key, i):
                        hits.append((i + info[0] - 1, info))
                m = search(body, i + 1)
        return hits

    def report_hits(self, report: Report) -> _ReportHits:
        """Every stem hit in the whole report, as (start, last index, owners) sorted
        lists with their starts: the hits that count in any region holding them, and
        the short stems inside a longer word ("no" in "node"), which count only
        where a region's end cuts the word."""
        memo = report.hits
        if memo is not None and memo[0] == self.version:
            return memo[1]  # type: ignore[no-any-return]
        low = report.low
        n = len(low)
        items: list[tuple[int, int, tuple[int, ...]]] = []
        inner: list[tuple[int, int, tuple[int, ...]]] = []
        for end, (size, short, owners) in self._hits(low, report.text):
            start = end - size + 1
            if short and (
                (start > 0 and low[start - 1].isalnum()) or (end + 1 < n and low[end + 1].isalnum())
            ):
                inner.append((start, end, owners))
            else:
                items.append((start, end, owners))
        items.sort()
        inner.sort()
        out: _ReportHits = ([it[0] for it in items], items, [it[0] for it in inner], inner)
        report.hits = (self.version, out)
        return out

    def positions(self, region: Region) -> dict[int, list[int]]:
        """Anchor id -> sorted start positions, for every anchor with a stem in the region."""
        if region.anchors is not None:
            return region.anchors
        if not region.report.whole:
            region.anchors = self._region_positions(region)
            return region.anchors
        starts, items, inner_starts, inner = self.report_hits(region.report)
        rs, re_ = region.start, region.end
        lo = bisect_left(starts, rs)
        hi = bisect_left(starts, re_, lo)
        res: dict[int, list[int]] = {}
        for s, e, owners in items[lo:hi]:
            if e >= re_:
                continue
            p = s - rs
            for a in owners:
                lst = res.get(a)
                if lst is None:
                    res[a] = [p]
                elif lst[-1] != p:
                    lst.append(p)
        lo = bisect_left(inner_starts, rs)
        hi = bisect_left(inner_starts, re_, lo)
        if lo < hi:
            # a short stem counts as a whole word only ("no" but not "node"), judged
            # within the region as a pass over the region alone would: only where the
            # region's start or end cuts the word
            low = region.report.low
            extra = False
            for s, e, owners in inner[lo:hi]:
                if e >= re_ or (s > rs and low[s - 1].isalnum()):
                    continue
                if e + 1 < re_ and low[e + 1].isalnum():
                    continue
                extra = True
                for a in owners:
                    res.setdefault(a, []).append(s - rs)
            if extra:
                for a, lst in res.items():
                    res[a] = sorted(set(lst))
        region.anchors = res
        return res

    def _region_positions(self, region: Region) -> dict[int, list[int]]:
        """Anchor id -> sorted start positions, from a pass over the region alone (for a
        report whose lower-cased regions are not slices of its lower-cased text)."""
        res: dict[int, list[int]] = {}
        low = region.low
        n = len(low)
        for end, (size, short, owners) in self._hits(low, region.body):
            start = end - size + 1
            # a short stem counts as a whole word only ("no" but not "node")
            if short and (
                (start > 0 and low[start - 1].isalnum()) or (end + 1 < n and low[end + 1].isalnum())
            ):
                continue
            for a in owners:
                lst = res.get(a)
                if lst is None:
                    res[a] = [start]
                elif lst[-1] != start:
                    lst.append(start)
        for a, lst in res.items():
            res[a] = sorted(set(lst))
        return res


#: the lower-case automaton, a regex finding where an abbreviation may start, and the
#: abbreviations by first character with (size, short, owners)
_Automata = tuple[
    Any,
    "re.Pattern[str] | None",
    dict[str, list[tuple[str, tuple[int, bool, tuple[int, ...]]]]],
]

#: a report's stem hits, (start, last index, owners) sorted with their starts: those
#: that count wherever they are, then short stems inside a longer word
_ReportHits = tuple[
    list[int],
    list[tuple[int, int, tuple[int, ...]]],
    list[int],
    list[tuple[int, int, tuple[int, ...]]],
]

_INDEX = _StemIndex()
_NONE: list[int] = []


class Anchors:
    """Where a pattern may start: each occurrence of its leading words.

    The stems of all anchors are found in one Aho–Corasick pass per report, and a
    pattern is tried only where one of its stems occurs: much faster than scanning
    the region with the pattern itself.
    """

    __slots__ = ("__weakref__", "_key")

    def __init__(self, phrases: Iterable[str] = (), abbreviations: Iterable[str] = ()) -> None:
        self._key = id(self)
        _INDEX.add(self._key, _stems(p.lower() for p in phrases), _stems(abbreviations))
        weakref.finalize(self, _INDEX.remove, self._key)

    @property
    def key(self) -> int:
        """This anchor's key in :func:`present`."""
        return self._key

    def positions(self, region: Region) -> list[int]:
        # called some twenty times per region: read the region's memo directly
        found = region.anchors
        if found is None:
            found = _INDEX.positions(region)
        return found.get(self._key, _NONE)


def present(region: Region) -> dict[int, list[int]]:
    """The anchors found in a region: key -> sorted starts (never empty)."""
    found = region.anchors
    if found is None:
        found = _INDEX.positions(region)
    return found


def gate(*anchors: Anchors) -> frozenset[int]:
    """A reader's gate: it reads nothing in a region holding none of these anchors."""
    return frozenset(a.key for a in anchors)


def near_before(positions: Sequence[int], anchors: Sequence[int], reach: int) -> list[int]:
    """Positions that have an anchor at most ``reach`` characters after them.

    For patterns that start with a number and end at a word ("two of fifteen lymph
    nodes"): only numbers shortly before a lymph-node word are worth trying.
    """
    return near(positions, anchors, reach, 0)


def near(positions: Sequence[int], anchors: Sequence[int], before: int, after: int) -> list[int]:
    """Positions with an anchor at most ``before`` characters after or ``after`` before them."""
    if not positions or not anchors:
        return []
    keep: set[int] = set()
    for a in anchors:
        lo = bisect_left(positions, a - before)
        hi = bisect_right(positions, a + after)
        keep.update(positions[lo:hi])
    return sorted(keep)


def windows(
    spans: Iterable[tuple[int, int]], before: int, after: int, limit: int
) -> list[tuple[int, int]]:
    """Merged windows ``[start - before, end + after)`` around anchor spans, within ``limit``.

    Patterns that start with a number (and so cannot use the fast first-character
    scan) are run only inside windows around the words they need.
    """
    out: list[tuple[int, int]] = []
    for s, e in sorted(spans):
        lo, hi = max(0, s - before), min(limit, e + after)
        if out and lo <= out[-1][1]:
            out[-1] = (out[-1][0], max(out[-1][1], hi))
        else:
            out.append((lo, hi))
    return out


def keep_non_overlapping(spans: Sequence[Found]) -> list[Found]:
    """Keep found items in priority order, dropping any that overlaps one already kept."""
    kept: list[Found] = []
    for f in spans:
        if all(f.end <= k.start or f.start >= k.end for k in kept):
            kept.append(f)
    return kept


@dataclass(slots=True)
class Found:
    """A reader's intermediate hit: offsets relative to the region body."""

    start: int
    end: int
    value: Any
    flags: tuple[str, ...] = ()
    detail: dict[str, Any] = field(default_factory=dict)


def _lower_same_length(text: str) -> str:
    """``text.lower()`` with every offset kept (a few characters grow when lower-cased)."""
    low = text.lower()
    if len(low) == len(text):
        return low
    return "".join(c2 if len(c2 := c.lower()) == 1 else c for c in text)


class Report:
    """The whole report text with a lazily lower-cased copy (for context checks) and
    the anchors' stem hits over it (found once, shared by every region)."""

    __slots__ = ("_low", "cache", "hits", "text", "whole")

    def __init__(self, text: str) -> None:
        self.text = text
        self._low: str | None = None
        #: (index version, hits) once the stems have been looked for
        self.hits: tuple[int, Any] | None = None
        #: per-report memo of readers' whole-text scans
        self.cache: dict[Any, Any] = {}
        #: Whether each region's lower-cased copy is the slice of :attr:`low`: true
        #: unless a capital sigma is lower-cased by its context (final or not).
        self.whole = "\u03a3" not in text

    @property
    def low(self) -> str:
        if self._low is None:
            self._low = _lower_same_length(self.text)
        return self._low

    def mentions_any(self, words: Iterable[str]) -> bool:
        """Whether the lower-cased report holds any of ``words`` (memoised per report:
        readers ask once per region, and a scan of a long report per region was
        quadratic)."""
        key = ("mentions_any", tuple(words))
        hit = self.cache.get(key)
        if hit is None:
            low = self.low
            hit = self.cache[key] = any(w in low for w in key[1])
        return bool(hit)


@dataclass(slots=True)
class Region:
    """One region of the report being read: ``body == report.text[start:end]``."""

    report: Report
    start: int
    end: int
    section: str
    part: str
    body: str
    low: str
    #: per-region memo of counts and other shared work (shared by the readers)
    cache: dict[Any, Any] = field(default_factory=dict)
    #: anchor id -> sorted starts, for the anchors found in the region (once asked)
    anchors: dict[int, list[int]] | None = None

    @classmethod
    def of(cls, report: Report, start: int, end: int, section: str, part: str) -> Region:
        body = report.text[start:end]
        # one lower-casing per report: a region's is the slice of the report's
        low = report.low[start:end] if report.whole else _lower_same_length(body)
        return cls(report, start, end, section, part, body, low)

    def value(
        self,
        key: str,
        value: Any,
        s: int,
        e: int,
        flags: Iterable[str] = (),
        detail: dict[str, Any] | None = None,
    ) -> Value:
        """A Value from body-relative offsets, trimmed of surrounding spaces and stray punctuation."""
        body = self.body
        while s < e and body[s] in " \t\r\n,;:":
            s += 1
        while e > s and body[e - 1] in " \t\r\n,;:":
            e -= 1
        # Close a bracket the evidence opened: "ER positive (95%, strong)".
        if body.count("(", s, e) > body.count(")", s, e):
            j = e
            while j < len(body) and j - e < 3 and body[j] in " \t":
                j += 1
            if j < len(body) and body[j] == ")":
                e = j + 1
        a, b = self.start + s, self.start + e
        return Value(
            key=key,
            value=value,
            text=self.report.text[a:b],
            start=a,
            end=b,
            section=self.section,
            part=self.part,
            flags=tuple(dict.fromkeys(flags)),
            detail=dict(detail or {}),
        )

    def found(self, key: str, f: Found) -> Value:
        return self.value(key, f.value, f.start, f.end, f.flags, f.detail)


# -- numbers ---------------------------------------------------------------------------
class Numbers:
    """Counts written in digits or words ("28", "twenty-eight", "a single")."""

    def __init__(self, lex: ValueLexicon) -> None:
        self.units = lex.int_map("numbers", "units")
        self.teens = lex.int_map("numbers", "teens")
        self.tens = lex.int_map("numbers", "tens")
        self.single = lex.int_map("numbers", "single")
        self.roman = lex.int_map("numbers", "roman")
        units = alternation(self.units)
        tens = alternation(self.tens)
        words = (
            f"(?:{tens}(?:[-\\s]{{1,2}}{units})?|{alternation(self.teens)}|{units}"
            f"|(?:a\\s{{1,3}})?{alternation(self.single)})"
        )
        #: A count: digits (at most 3) or number words.
        self.count = rf"(?:\d(?<![\d.,/]\d)\d{{0,2}}(?!\d|[.,/]\d)|{words})"
        # where a count starts: a digit after a non-digit, or a number word
        self._digits = re.compile(r"\d(?<!\d\d)")
        self._words = Anchors((*self.units, *self.teens, *self.tens, *self.single))
        self.roman_pattern = alternation(self.roman)
        self._split = re.compile(r"[-\s]+")

    def positions_near(
        self, region: Region, anchors: Sequence[int], before: int, after: int = 0
    ) -> list[int]:
        """Where a count may start (digits or number words) within reach of an anchor:
        only ``before`` characters before an anchor up to ``after`` characters after it."""
        if not anchors:
            return _NONE
        key = ("counts", id(self), tuple(anchors), before, after)
        cached = region.cache.get(key)
        if cached is not None:
            return cached
        out: list[int] = []
        low = region.low
        wins = windows(((a, a) for a in anchors), before, after + 1, len(low))
        for lo, hi in wins:
            out.extend(m.start() for m in self._digits.finditer(low, lo, hi))
        words = self._words.positions(region)
        for lo, hi in wins:
            out.extend(words[bisect_left(words, lo) : bisect_left(words, hi)])
        out.sort()
        region.cache[key] = out
        return out

    def parse(self, text: str) -> int | None:
        """The value of a count matched by :attr:`count`."""
        t = text.strip().lower()
        if t.startswith("a ") and t[2:].strip() in self.single:
            t = t[2:].strip()
        if t.isdigit():
            return int(t)
        norm = " ".join(self._split.split(t))
        if norm in self.single:
            return self.single[norm]
        if norm in self.units:
            return self.units[norm]
        if norm in self.teens:
            return self.teens[norm]
        parts = norm.split(" ")
        if parts[0] in self.tens:
            if len(parts) == 1:
                return self.tens[parts[0]]
            if len(parts) == 2 and parts[1] in self.units:
                return self.tens[parts[0]] + self.units[parts[1]]
        return None

    def parse_grade(self, text: str) -> int | None:
        """A small grade written in digits or Roman numerals ("2", "II")."""
        t = text.strip().lower()
        if t.isdigit():
            return int(t)
        return self.roman.get(t)


# -- sizes -----------------------------------------------------------------------------
#: A number of up to three digits and three decimals, not part of a longer number.
NUM = r"(?:\d(?<![\d.]\d)\d{0,2}(?:\.\d{1,3})?|\.(?<![\d.]\.)\d{1,3})(?!\d)"
_NUM = NUM


class Sizes:
    """Dimensions with units: "2.5 cm", "25 mm", "2.5 x 1.8 x 1.0 cm" -> millimetres."""

    def __init__(self, lex: ValueLexicon) -> None:
        self._cm = set(lex.phrases("units", "cm"))
        self._mm = set(lex.phrases("units", "mm"))
        unit = alternation(self._cm | self._mm, left=False)
        seps = []
        for s in lex.phrases("units", "dimension_separators"):
            if s.isalpha() and len(s) > 1:
                seps.append(rf"(?<![^\W_]){re.escape(s)}(?![^\W_])")
            else:
                seps.append(re.escape(s))
        sep = "(?:" + "|".join(seps) + ")"
        dim = rf"{_NUM}(?:(?:\s{{0,2}}|-){unit})?"  # "2.1 cm", "2.1cm", "2.1-cm"
        #: One to three dimensions; parsed (and the unit checked) by :meth:`parse`.
        self.dims = rf"(?:{dim}(?:\s{{0,3}}{sep}\s{{0,3}}{dim}){{0,2}})"
        self._one = re.compile(rf"({_NUM})(?:(?:\s{{0,2}}|-)({unit}))?", re.IGNORECASE)

    def parse(self, text: str) -> tuple[float, tuple[float, ...]] | None:
        """(greatest dimension in mm, all dimensions in mm), or None without a final unit."""
        found = [(m.group(1), (m.group(2) or "").lower()) for m in self._one.finditer(text)]
        if not found or not found[-1][1]:
            return None
        unit = found[-1][1]
        out: list[float] = []
        for num, u in found:
            mm = self.to_mm(num, u or unit)
            if mm is None:
                return None
            out.append(mm)
        return max(out), tuple(out)

    def to_mm(self, number: str, unit: str) -> float | None:
        """Convert with decimal arithmetic, so 0.3 cm is exactly 3.0 mm."""
        u = " ".join(unit.lower().split())
        try:
            d = Decimal(number)
        except InvalidOperation:
            return None
        if u in self._cm:
            return float(d * 10)
        if u in self._mm:
            return float(d)
        return None
