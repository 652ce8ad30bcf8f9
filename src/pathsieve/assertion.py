"""Graded assertion of concept mentions: certainty, temporality, experiencer.

A ConText-style engine (Harkema et al., J Biomed Inform 2009, itself built on
NegEx, Chapman et al. 2001).  Trigger phrases come from a data file
(``ontology/lexicon/triggers.tsv``); each trigger has a category, a direction
(forward, backward, both) and a maximum scope in words.  For each mention the
engine looks, inside the mention's sentence, for triggers whose scope reaches
the mention without crossing a terminator, and keeps the *nearest* one on each
of three axes:

* certainty: ``absent``, ``unlikely``, ``uncertain``, ``likely`` (default
  ``present``);
* temporality: ``historical``, ``hypothetical`` (default ``current``);
* experiencer: ``other`` (default ``patient``).

Nearest-wins is what lets one sentence carry several findings with different
certainties ("no carcinoma; possible dysplasia"), and what lets a compound
trigger decide the grade: the longer phrase "no definite" (unlikely) hides the
"no" (absent) inside it, "cannot rule out" (uncertain) hides "rule out".

Control categories in the lexicon:

* ``pseudo``: phrases that look like triggers but are not ("no change",
  "gram negative"); a trigger inside one is dropped;
* ``terminate``: phrases that end a scope ("but", "however", "except") for
  the categories or axes named in the fifth column (``*`` = all);
* ``break``: phrases that end a sentence (";");
* ``abbreviation``: words whose final period does not end a sentence;
* ``continue``: words that, ending a line, carry its sentence onto the next
  ("with", "of", "and"): the line was wrapped mid-phrase.

Lines matter in forms and OCR text, where one field takes one line: a trigger
before its mention does not reach a line that starts a new field (a
capitalised word in mixed case, a glued part or list marker, a heading line),
and a trigger whose scope is ``line`` stays on its own line.  Both give way
where the line was plainly wrapped: after a ``continue`` word, or (``line``)
right after the trigger itself.

Everything runs on the original text with compiled regular expressions and a
first-word index of the triggers, and only on the sentences that hold mentions.

>>> engine = AssertionEngine.load()
>>> text = "Tubular adenoma; negative for high-grade dysplasia."
>>> [a.certainty for a in engine.assess(text, [(0, 15), (30, 50)])]
['present', 'absent']
"""

from __future__ import annotations

import re
import threading
from bisect import bisect_left, bisect_right
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from itertools import accumulate
from operator import add
from pathlib import Path

from pathsieve.errors import InputError, VocabError
from pathsieve.records import Assertion, TriggerHit
from pathsieve.vocab import lexicon_path

__all__ = [
    "AXIS_OF",
    "CONTROL_CATEGORIES",
    "DIRECTIONS",
    "NUMBER",
    "AssertionEngine",
    "Trigger",
    "check_triggers",
    "default_triggers_path",
    "parse_triggers",
]

#: Which assertion axis each acting category sets (the value is the category).
AXIS_OF: dict[str, str] = {
    "absent": "certainty",
    "unlikely": "certainty",
    "uncertain": "certainty",
    "likely": "certainty",
    "historical": "temporality",
    "hypothetical": "temporality",
    "other": "experiencer",
}
AXES: tuple[str, ...] = ("certainty", "temporality", "experiencer")
CONTROL_CATEGORIES: tuple[str, ...] = ("pseudo", "terminate", "break", "abbreviation", "continue")
DIRECTIONS: tuple[str, ...] = ("forward", "backward", "both")
# When two triggers of one axis are equally near, the more guarded reading wins:
# a hedge next to a negation ("no ... cannot be excluded") is not a plain negation.
_TIE_RANK = {
    "uncertain": 0,
    "unlikely": 1,
    "likely": 2,
    "absent": 3,
    "hypothetical": 0,
    "historical": 1,
    "other": 0,
}
_NO_VALUE = ("", "-")
_match_start = re.Match.start
_match_end = re.Match.end
_OPEN = frozenset("([{")
_CLOSE = frozenset(")]}")
_BRACKET_RE = re.compile(r"[()\[\]{}]")

_TOKEN_RE = re.compile(r"\w+|[^\w\s]")
#: A lexicon token standing for any number ("no ( <num>" is "NO (0/12)", a
#: nodal category read by OCR, not a negation).
NUMBER = "<num>"
_PHRASE_TOKEN_RE = re.compile(re.escape(NUMBER) + r"|\w+|[^\w\s]")
_PIECE_RE = re.compile(r"(?:\w+|[^\w\s])\s*")
# Candidate sentence ends and list/heading starts, as three simple patterns
# (one alternation of all of them scans several times slower).  Periods are
# checked in Python (abbreviations, a following lowercase word).
# A sentence stop: "." or "!" followed by a space and not by a lowercase word
# ("p.o. intake", "vs. an": the sentence goes on); "?" only at a line end ("?
# carcinoma" is a hedge, not a question).  The engine adds one look-behind per
# lexicon abbreviation ("Dr.", "e.g."), after the stop so the fast scan for
# [.!?] is kept.
_STOP_HEAD = r"[.!?](?=\s|$)(?:(?<=\?)(?=[ \t]*(?:\r?\n|$))|(?<!\?)(?![ \t]*[a-z])"
_LINE_RE = re.compile(
    r"\n(?:"
    r"[ \t\r\f\v]*\n"  # a blank line
    # a list marker at the start of a line: "- ", "* ", "1. ", "2) ", "(a) ", "B. "
    r"|[ \t]*(?=(?:[-*\u2022\u00b7]|\(?\d{1,3}[.)]|\(?[A-Za-z][.)])[ \t])"
    # a heading at the start of a line: "MICROSCOPIC DESCRIPTION:"
    r"|(?P<head>[ \t]*(?=[A-Z][A-Za-z /&()-]{0,40}:))"
    r")"
)
# A field name glued to the value before it by a form export ("Not
# specifiedTumor site:"): a new field, so a new sentence.
# The pattern opens on the capital (not on the look-behinds) so that the scan
# skips to capitals at C speed, and rejects a capital without two lower-case
# letters after it before any look-behind; the break is the match start.
_GLUED_HEAD_RE = re.compile(
    r"[A-Z](?=[a-z]{2})(?:(?<=[a-z]{3}[A-Z])|(?<=[A-Z]{4}))(?=[a-z]{2,}(?: [A-Za-z]+){0,3} ?:)"
)
# A heading with nothing else on its line ("SOCIAL HISTORY:"), or after a wide
# gap in flattened text ("...   SOCIAL HISTORY:").
_BARE_HEAD_RE = re.compile(r"(?:^|(?<=  )|(?<=\t))[ \t]*[A-Z][A-Za-z /&()-]{0,40}:\Z")
# In text whose line breaks were flattened to runs of spaces: a numbered item
# ("Normal esophagus   2) Hiatal hernia") or a heading ("...   PLAN:  ").
# Only the start of a run of spaces is tried, possessively: what follows the run
# decides, and retrying from every space in a long run is quadratic.
_FLAT_RE = re.compile(
    r" (?<!  ) ++(?:"
    r"(?=\(?\d{1,2}\)[ \t])"
    r"|(?P<head>(?=[A-Z][A-Za-z/&()-]*(?: [A-Za-z/&()-]+){0,4}:(?:\s|$)))"
    r")"
)


@dataclass(frozen=True, slots=True)
class Trigger:
    """One row of the trigger lexicon.

    ``scope`` is the largest number of words allowed between the trigger and
    the mention (``None``: up to the end of the sentence).  ``within_line``
    keeps the scope on the trigger's own line (see :data:`NUMBER`, the module
    notes and the lexicon header).  ``applies`` names the categories a
    ``terminate`` row cuts (empty for other rows).
    """

    phrase: str
    tokens: tuple[str, ...]
    category: str
    direction: str = ""
    scope: int | None = None
    applies: frozenset[str] = frozenset()
    line: int = 0
    within_line: bool = False

    @property
    def axis(self) -> str | None:
        return AXIS_OF.get(self.category)


def default_triggers_path() -> Path:
    """The shipped trigger lexicon (``ontology/lexicon/triggers.tsv``)."""
    return lexicon_path("triggers.tsv")


def _tokens(phrase: str) -> tuple[str, ...]:
    return tuple(t.lower() for t in _PHRASE_TOKEN_RE.findall(phrase))


def _fits(pattern: Sequence[str], toks: Sequence[str]) -> bool:
    """Whether tokens match a phrase that holds :data:`NUMBER` placeholders."""
    return all(p == t or (p == NUMBER and t.isdigit()) for p, t in zip(pattern, toks))


def _parse_scope(text: str) -> tuple[int | None, bool] | None:
    """``-``, ``N``, ``line`` or ``N line`` as (word limit, within the line); None if bad."""
    words = text.split()
    within = bool(words) and words[-1] == "line"
    if within:
        words.pop()
    if not words or words == ["-"]:
        return None, within
    if len(words) == 1 and words[0].isdigit():
        return int(words[0]), within
    return None


def _expand_applies(value: str) -> frozenset[str] | None:
    names: set[str] = set()
    for item in (v.strip() for v in value.split(",")):
        if item == "*":
            names.update(AXIS_OF)
        elif item in AXES:
            names.update(c for c, a in AXIS_OF.items() if a == item)
        elif item in AXIS_OF:
            names.add(item)
        else:
            return None
    return frozenset(names)


def parse_triggers(path: str | Path) -> tuple[list[Trigger], list[str]]:
    """Read a trigger lexicon; return the valid rows and the problems found.

    Each problem reads ``"file:line: message"``.  Columns, tab-separated:
    phrase, category, direction, scope (words, ``-`` for the whole sentence,
    ``line`` or ``N line`` to stay on the trigger's line), applies
    (``terminate`` rows only: categories or axes, ``*`` for all).
    """
    path = Path(path)
    try:
        raw = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        return [], [f"{path}: cannot read trigger lexicon ({exc}); check the path and encoding"]
    rows: list[Trigger] = []
    problems: list[str] = []
    seen: dict[tuple[tuple[str, ...], str], int] = {}
    seen_axis: dict[tuple[tuple[str, ...], str], tuple[str, int]] = {}
    known = ", ".join((*AXIS_OF, *CONTROL_CATEGORIES))

    for lineno, line in enumerate(raw.splitlines(), start=1):
        if not line.strip() or line.lstrip().startswith("#"):
            continue

        def bad(message: str, lineno: int = lineno) -> None:
            problems.append(f"{path}:{lineno}: {message}")

        cols = [c.strip() for c in line.split("\t")]
        while len(cols) > 2 and cols[-1] == "":
            cols.pop()
        if len(cols) < 2 or len(cols) > 5:
            bad(
                f"expected 2 to 5 tab-separated columns (phrase, category, direction, "
                f"scope, applies), found {len(cols)}"
            )
            continue
        cols += [""] * (5 - len(cols))
        phrase, category, direction, scope_text, applies_text = cols
        if category not in AXIS_OF and category not in CONTROL_CATEGORIES:
            bad(f"unknown category {category!r}; use one of: {known}")
            continue
        if category == "abbreviation":
            tokens: tuple[str, ...] = (phrase.lower().rstrip("."),)
            if not tokens[0] or any(ch.isspace() for ch in tokens[0]):
                bad(f"abbreviation must be one word, got {phrase!r}")
                continue
        elif category == "continue":
            tokens = _tokens(phrase)
            if len(tokens) != 1 or not tokens[0].isalnum():
                bad(f"a continue row takes one word, got {phrase!r}")
                continue
        else:
            tokens = _tokens(phrase)
        if not phrase or not tokens or not tokens[0]:
            bad("empty trigger phrase")
            continue
        if NUMBER in tokens and (tokens[0] == NUMBER or category == "break"):
            bad(
                f"{NUMBER} stands for a number inside a phrase: not as its first word, "
                f"nor in a break row ({phrase!r})"
            )
            continue

        scope: int | None = None
        within_line = False
        applies: frozenset[str] = frozenset()
        if category in AXIS_OF:
            if direction not in DIRECTIONS:
                bad(f"bad direction {direction!r} for {phrase!r}; use forward, backward or both")
                continue
            if scope_text not in _NO_VALUE:
                parsed_scope = _parse_scope(scope_text)
                if parsed_scope is None:
                    bad(
                        f"bad scope {scope_text!r} for {phrase!r}; use a word count, '-', "
                        "'line' or a word count then 'line' ('4 line')"
                    )
                    continue
                scope, within_line = parsed_scope
            if applies_text not in _NO_VALUE:
                bad(f"the fifth column is only for terminate rows, found {applies_text!r}")
                continue
        else:
            if direction not in _NO_VALUE or scope_text not in _NO_VALUE:
                bad(f"{category} rows take no direction or scope; put '-' in those columns")
                continue
            if category == "terminate":
                parsed = _expand_applies(applies_text or "*")
                if parsed is None:
                    bad(
                        f"bad applies {applies_text!r} for {phrase!r}; use '*', an axis "
                        f"({', '.join(AXES)}) or categories, comma-separated"
                    )
                    continue
                applies = parsed
            elif applies_text not in _NO_VALUE:
                bad(f"the fifth column is only for terminate rows, found {applies_text!r}")
                continue

        key = (tokens, category)
        if key in seen:
            bad(f"duplicate trigger {phrase!r} ({category}), first at line {seen[key]}")
            continue
        seen[key] = lineno
        axis = AXIS_OF.get(category)
        if axis is not None:
            other = seen_axis.get((tokens, axis))
            if other is not None:
                bad(
                    f"conflicting trigger {phrase!r}: {category} here, {other[0]} at line "
                    f"{other[1]}; one phrase gets one {axis} category"
                )
                continue
            seen_axis[(tokens, axis)] = (category, lineno)
        rows.append(
            Trigger(phrase, tokens, category, direction, scope, applies, lineno, within_line)
        )
    if not any(r.axis for r in rows) and not problems:
        problems.append(f"{path}:1: no assertion triggers in the lexicon")
    return rows, problems


def check_triggers(path: str | Path) -> list[str]:
    """Problems in a trigger lexicon as ``"file:line: message"`` (empty: fine).

    >>> check_triggers(default_triggers_path())
    []
    """
    return parse_triggers(path)[1]


# A trigger compiled for the hot path (plain tuples: no attribute look-ups):
# (axis index or -1, direction bits, scope, tie rank, applies, trigger, within line)
_FORWARD, _BACKWARD = 1, 2
_DIRECTION_BITS = {"forward": _FORWARD, "backward": _BACKWARD, "both": _FORWARD | _BACKWARD}
_UNLIMITED = 1 << 30
_AXIS_INDEX = {axis: i for i, axis in enumerate(AXES)}
_Spec = tuple[int, int, int, int, frozenset[str], Trigger, bool]
# A match: (first token, token after the last, spec)
_Hit = tuple[int, int, _Spec]


def _spec(t: Trigger) -> _Spec:
    axis = t.axis
    return (
        _AXIS_INDEX[axis] if axis is not None else -1,
        _DIRECTION_BITS.get(t.direction, 0),
        _UNLIMITED if t.scope is None else t.scope,
        _TIE_RANK.get(t.category, 9),
        t.applies,
        t,
        t.within_line,
    )


def _drop_covered(matches: list[_Hit]) -> list[_Hit]:
    """Longest phrase wins: drop a match inside a longer one, or starting inside a pseudo."""
    keep: list[_Hit] = []
    for m in matches:
        ms, me = m[0], m[1]
        for o in matches:
            os_, oe = o[0], o[1]
            if o is m or oe <= ms or os_ >= me:
                continue
            if os_ <= ms and me <= oe and oe - os_ > me - ms:
                break  # inside a longer phrase
            if o[2][5].category == "pseudo" and os_ <= ms and not (ms <= os_ and oe <= me):
                break  # starts inside a pseudo-trigger
        else:
            keep.append(m)
    return keep


class _Sentence:
    """The tokens of one sentence and the triggers found in them.

    Built from the lower-cased sentence alone, so one analysis serves every
    place the same sentence occurs (offsets here are relative to its start).
    Tokens come from one C-level ``findall``; their character offsets are
    computed only when a mention falls in a sentence that has triggers.
    """

    __slots__ = (
        "acting",
        "depth",
        "ends",
        "lines",
        "punct",
        "starts",
        "terminators",
        "text",
        "toks",
    )

    def __init__(self, index: _Index, firsts: frozenset[str], sent: str) -> None:
        self.text = sent
        self.punct: list[int] = []
        self.starts: list[int] | None = None  # token offsets, computed on first use
        self.ends: list[int] | None = None
        self.depth: list[int] | None = None
        # indices of the tokens that open a line (after a single line break)
        self.lines: list[int] | None = None
        self.terminators: list[tuple[int, int, frozenset[str]]] = []
        self.acting: list[_Hit] = []
        self.toks: list[str] = []
        toks = _TOKEN_RE.findall(sent)
        # most sentences hold no trigger word at all, and the rest a few: find
        # them with a set intersection and list.index (C loops), not per token
        present = firsts.intersection(toks)
        if not present:
            return
        where: list[int] = []
        for word in present:
            i = -1
            try:
                while True:
                    i = toks.index(word, i + 1)
                    where.append(i)
            except ValueError:
                pass
        where.sort()
        matches: list[_Hit] = []
        last = len(toks) - 1
        for i in where:
            single, longer = index[toks[i]]
            for sp in single:
                matches.append((i, i + 1, sp))
            if longer and i < last:
                nxt = toks[i + 1]
                for key in (nxt, NUMBER) if nxt.isdigit() else (nxt,):
                    cands = longer.get(key)
                    if cands is None:
                        continue
                    for ptoks, k, specs, wild in cands:
                        if k == 2 or (
                            _fits(ptoks, toks[i : i + k])
                            if wild and i + k <= len(toks)
                            else toks[i : i + k] == ptoks
                        ):
                            for sp in specs:
                                matches.append((i, i + k, sp))
        if len(matches) > 1:
            matches = _drop_covered(matches)
        self.acting = [m for m in matches if m[2][0] >= 0]
        if not self.acting:
            return
        self.toks = toks
        self.terminators = [
            (m[0], m[1], m[2][4]) for m in matches if m[2][5].category == "terminate"
        ]
        # punctuation tokens, to count words (not tokens) for scope distances
        punct = self.punct = [i for i, t in enumerate(toks) if not t[0].isalnum()]
        if "\n" in sent:
            # a piece is a token with the blanks after it: a line break in
            # piece k means token k + 1 opens a line
            self.lines = [
                k for k, piece in enumerate(_PIECE_RE.findall(sent), start=1) if "\n" in piece
            ]
        # bracket depth of each token: a trigger inside "( ... )" acts only
        # inside it ("report (slides not submitted) indicates lymphoma").
        # Brackets are punctuation tokens: walk those, fill the stretches between.
        if _BRACKET_RE.search(sent):
            depth: list[int] = []
            d = 0
            prev = 0
            for i in punct:
                t = toks[i]
                if t in _CLOSE:
                    depth += [d] * (i - prev)
                    if d:
                        d -= 1
                    depth.append(d)
                    prev = i + 1
                elif t in _OPEN:
                    depth += [d] * (i - prev)
                    depth.append(d)
                    d += 1
                    prev = i + 1
            depth += [d] * (len(toks) - prev)
            self.depth = depth

    def token_range(self, start: int, end: int) -> tuple[int, int]:
        """Indices of the tokens overlapping ``[start, end)`` (first, after last)."""
        starts, ends = self.starts, self.ends
        if starts is None or ends is None:
            # each token with the blanks after it: the lengths of these pieces
            # give the token offsets without one match object per token
            first = _TOKEN_RE.search(self.text)
            pieces = _PIECE_RE.findall(self.text)
            starts = list(accumulate(map(len, pieces[:-1]), initial=first.start() if first else 0))
            # ends first: a thread that sees ``starts`` set also sees ``ends``
            ends = self.ends = list(map(add, starts, map(len, self.toks)))
            self.starts = starts
        return bisect_right(ends, start), bisect_left(starts, end)

    def char_span(self, start: int, end: int) -> tuple[int, int]:
        """Character offsets of tokens ``start`` to ``end`` (exclusive)."""
        assert self.starts is not None and self.ends is not None
        return self.starts[start], self.ends[end - 1]


_Index = dict[
    str,
    tuple[tuple[_Spec, ...], dict[str, list[tuple[list[str], int, tuple[_Spec, ...], bool]]]],
]
_PLAIN = Assertion()
# text, sorted boundaries, lower-cased text, break starts, break ends
_TextBreaks = tuple[str, list[int], str, list[int], list[int]]
_SENTENCE_CACHE = 4096
# resolved path -> (modification time, size, engine): an edited file is reloaded
_CACHE: dict[str, tuple[int, int, AssertionEngine]] = {}
_CACHE_LOCK = threading.Lock()


class AssertionEngine:
    """Assess mentions against a trigger lexicon.

    >>> engine = AssertionEngine.load()
    >>> text = "Suspicious for adenocarcinoma."
    >>> a = engine.assess(text, [(15, 29)])[0]
    >>> a.certainty, a.triggers[0].text
    ('uncertain', 'Suspicious for')
    """

    def __init__(self, triggers: Iterable[Trigger], *, path: str | Path | None = None) -> None:
        self.path = None if path is None else Path(path)
        self.triggers: tuple[Trigger, ...] = tuple(triggers)
        grouped: dict[tuple[str, ...], list[Trigger]] = {}
        abbreviations: set[str] = set()
        joiners: set[str] = set()
        breaks: list[tuple[str, ...]] = []
        for t in self.triggers:
            if t.category == "abbreviation":
                abbreviations.add(t.tokens[0])
            elif t.category == "continue":
                joiners.add(t.tokens[0])
            elif t.category == "break":
                breaks.append(t.tokens)
            else:
                grouped.setdefault(t.tokens, []).append(t)
        # first word -> (one-word triggers, {second word -> longer phrases})
        index: _Index = {}
        for toks, trigs in grouped.items():
            specs = tuple(_spec(t) for t in trigs)
            single, longer = index.setdefault(toks[0], ((), {}))
            if len(toks) == 1:
                index[toks[0]] = (single + specs, longer)
            else:
                longer.setdefault(toks[1], []).append(
                    (list(toks), len(toks), specs, NUMBER in toks)
                )
        self._index = index
        self._firsts = frozenset(index)
        self._abbreviations = frozenset(abbreviations)
        self._joiners = frozenset(joiners)
        self._break_re = _phrase_regex(breaks)
        self._stop_re = re.compile(
            _STOP_HEAD
            + "(?i:"
            + "".join(rf"(?<!\b{re.escape(a)}\.)" for a in sorted(abbreviations))
            + "))"
        )
        # lower-cased sentence -> its analysis (a pure function of the sentence):
        # report templates and boilerplate repeat sentences across reports
        self._sentences: dict[str, _Sentence] = {}
        # the last text's sentence breaks: the pipeline assesses the values and
        # then the concept mentions of one report, with the same boundaries
        self._last: _TextBreaks | None = None

    @classmethod
    def load(cls, path: str | Path | None = None) -> AssertionEngine:
        """Load (and cache per path and file version) a trigger lexicon.

        Raises :class:`~pathsieve.errors.VocabError` naming the file and line of
        the first problem.
        """
        p = Path(path) if path is not None else default_triggers_path()
        try:
            st = p.stat()
        except OSError as exc:
            raise VocabError(
                f"trigger lexicon not found ({exc.strerror}); pass an existing file",
                path=p,
            ) from None
        key = str(p.resolve())
        with _CACHE_LOCK:
            cached = _CACHE.get(key)
        if cached is not None and cached[:2] == (st.st_mtime_ns, st.st_size):
            return cached[2]
        rows, problems = parse_triggers(p)
        if problems:
            where, _, message = problems[0].partition(": ")
            line = where.rsplit(":", 1)[-1]
            more = len(problems) - 1
            if more:
                message += f" (and {more} more; run `pathsieve vocab check`)"
            raise VocabError(message, path=p, line=int(line) if line.isdigit() else None)
        engine = cls(rows, path=p)
        with _CACHE_LOCK:
            _CACHE[key] = (st.st_mtime_ns, st.st_size, engine)
        return engine

    # -- sentences ---------------------------------------------------------

    def sentence_breaks(self, text: str, boundaries: Sequence[int] = ()) -> list[tuple[int, int]]:
        """Sorted ``(start, end)`` offsets of everything that ends a sentence.

        >>> AssertionEngine.load().sentence_breaks("No tumor. Benign; see note.")
        [(9, 9), (16, 17), (27, 27)]
        """
        spans: list[tuple[int, int]] = [(b, b) for b in boundaries]
        # the break falls after the stop, which stays with its sentence:
        # "Adenocarcinoma?" keeps its "?"
        spans.extend((e, e) for e in map(_match_end, self._stop_re.finditer(text)))
        for pattern in (_LINE_RE, _FLAT_RE):
            for m in pattern.finditer(text):
                start = m.start()
                if m.group("head") is not None:
                    # a heading right under an empty heading is its sub-heading
                    # ("SOCIAL HISTORY:  TOBACCO: quit"): the parent still governs it
                    # -- but only when that line holds nothing else: after "Ethnicity:
                    # Not Hispanic  Specific Ethnicity:" a new field starts afresh
                    k = start
                    while k > 0 and text[k - 1].isspace():
                        k -= 1
                    if k > 0 and text[k - 1] == ":":
                        ls = text.rfind("\n", 0, k) + 1
                        if _BARE_HEAD_RE.search(text[ls:k]):
                            continue
                spans.append((start, m.end()))
        spans.extend((b, b) for b in map(_match_start, _GLUED_HEAD_RE.finditer(text)))
        if self._break_re is not None:
            spans.extend(m.span() for m in self._break_re.finditer(text))
        spans.sort()
        return spans

    # -- assessment --------------------------------------------------------

    def assess(
        self,
        text: str,
        spans: Sequence[tuple[int, int]],
        *,
        boundaries: Sequence[int] = (),
    ) -> list[Assertion]:
        """One :class:`Assertion` per ``(start, end)`` span of ``text``.

        ``boundaries`` are offsets (section or specimen-part starts) that no
        scope crosses.

        >>> engine = AssertionEngine.load()
        >>> text = "A. No carcinoma.\\nB. Adenocarcinoma."
        >>> [a.certainty for a in engine.assess(text, [(6, 15), (20, 34)], boundaries=[17])]
        ['absent', 'present']
        """
        if not spans:
            return []
        n = len(text)
        bounds = sorted(boundaries)
        last = self._last
        if last is not None and last[0] == text and last[1] == bounds:
            low, bstarts, bends = last[2], last[3], last[4]
        else:
            low = text.lower()
            if len(low) != n:  # a few characters lower-case to two; keep offsets aligned
                low = "".join(c if len(c.lower()) != 1 else c.lower() for c in text)
            breaks = self.sentence_breaks(text, bounds)
            bstarts = [b[0] for b in breaks]
            bends = [b[1] for b in breaks]
            self._last = (text, bounds, low, bstarts, bends)
        nb = len(bstarts)
        index = self._index
        firsts = self._firsts
        cache = self._sentences
        sentences: dict[tuple[int, int], _Sentence] = {}
        out: list[Assertion] = []
        for s, e in spans:
            if not 0 <= s <= e <= n:
                raise InputError(
                    f"mention span ({s}, {e}) lies outside the text (length {n}); "
                    "pass character offsets into the text being assessed"
                )
            # the sentence: from the last break ending at or before s to the
            # first break starting at or after e (breaks inside a mention are
            # ignored: the mention holds the sentence together)
            i = bisect_right(bends, s) - 1
            lo = bends[i] if i >= 0 else 0
            j = bisect_left(bstarts, e)
            hi = bstarts[j] if j < nb else n
            sent = sentences.get((lo, hi))
            if sent is None:
                key = low[lo:hi]
                sent = cache.get(key)
                if sent is None:
                    if len(cache) >= _SENTENCE_CACHE:
                        cache.clear()  # bounded: a long run of new text starts afresh
                    sent = cache[key] = _Sentence(index, firsts, key)
                sentences[(lo, hi)] = sent
            out.append(_assess_one(text, sent, lo, s, e, self._joiners) if sent.acting else _PLAIN)
        return out


def _assess_one(
    text: str, sent: _Sentence, lo: int, s: int, e: int, joiners: frozenset[str]
) -> Assertion:
    # token range of the mention: the tokens overlapping [s, e) (``lo``: where
    # the sentence starts in ``text``)
    ms, me = sent.token_range(s - lo, e - lo)
    if me < ms:
        me = ms
    punct = sent.punct
    depth = sent.depth
    lines = sent.lines
    terminators = sent.terminators
    best: list[tuple[int, int, int, _Hit] | None] = [None, None, None]
    for hit in sent.acting:
        ts, te, sp = hit
        axis, bits, scope, tie, _, trig, within = sp
        if ts < me and te > ms and me > ms:
            # a certainty trigger inside the mention is part of its name ("no
            # acute distress" extracted whole); a temporal or experiencer
            # trigger opening the mention dates it ("status post CABG")
            if axis == 0 or ts != ms:
                continue
            g0, g1, order = ms, ms, 0
        elif te <= ms and bits & _FORWARD:
            g0, g1, order = te, ms, 0
        elif ts >= me and bits & _BACKWARD:
            g0, g1, order = me, ts, 1
        else:
            continue
        if g1 > g0:  # words between: tokens minus punctuation tokens
            dist = g1 - g0
            if punct:
                dist -= bisect_left(punct, g1) - bisect_left(punct, g0)
        else:
            dist = 0
        if dist > scope:
            continue
        if (
            lines is not None
            and not ts <= ms < te  # not a trigger opening the mention
            and not _may_cross_lines(
                text, sent, lo, g0, g1, joiners, forward=order == 0, within=within, trigger=ts
            )
        ):
            continue
        if depth is not None:
            d = depth[ts]
            if d and any(depth[k] < d for k in range(g0, g1)):
                continue
        if terminators:
            cat = trig.category
            if any(a >= g0 and b <= g1 and cat in applies for a, b, applies in terminators):
                continue
        cur = best[axis]
        if cur is None or (dist, tie, order) < cur[:3]:
            best[axis] = (dist, tie, order, hit)
    if best[0] is None and best[1] is None and best[2] is None:
        return _PLAIN
    values = ["present", "current", "patient"]
    hits: list[TriggerHit] = []
    for axis, chosen in enumerate(best):
        if chosen is not None:
            ts, te, sp = chosen[3]
            category = sp[5].category
            values[axis] = category
            a, b = sent.char_span(ts, te)
            a += lo
            b += lo
            hits.append(TriggerHit(text[a:b], a, b, category))
    hits.sort(key=lambda h: h.start)
    return Assertion(values[0], values[1], values[2], tuple(hits))


# A line that starts a new field or item, whatever came before it (matched at the
# line's first token): a capitalised word in mixed case ("Moderately
# differentiated"), a part or list marker glued to its text ("B.Sections",
# "-METASTATIC"), or a heading line of its own ("COLON, RESECTION:").  An all-caps
# or lower-case line with none of these may be prose wrapped mid-sentence.
_NEW_FIELD_RE = re.compile(
    r"[A-Z][a-z]"
    r"|(?:[A-Z]|\d{1,2})[.)][A-Za-z]"
    r"|[-*\u2022\u00b7][A-Za-z]"
    r"|[^\n]*:[ \t\r]*(?:\n|$)"
)


def _may_cross_lines(
    text: str,
    sent: _Sentence,
    lo: int,
    g0: int,
    g1: int,
    joiners: frozenset[str],
    *,
    forward: bool,
    within: bool,
    trigger: int = -1,
) -> bool:
    """Whether a trigger reaches over the line breaks between it and a mention.

    ``g0``..``g1`` is the token gap, both ends included (the mention may open a
    line, the trigger may close one).  Report forms and OCR text put one field
    a line ("qYes No qNA" boxes, "NO (0/20)" then the next field), so:

    * a forward trigger never reaches a line that starts a new field
      (:data:`_NEW_FIELD_RE`: "qYes No qNA" / "Moderately differentiated
      carcinoma"), unless the line before ends on a ``continue`` word
      ("negative for" / "Malignant cells") or is the trigger's own line ending
      on a colon (a label whose value comes next: "Negative for:" /
      "Carcinoma");
    * a line-bound trigger (``within``) crosses a line break only where the
      line was wrapped: right after the trigger ("status post" / "excision of
      an adenoma"; before it, for a backward trigger) or after a ``continue``
      word ("biopsies showing carcinoma with" / "Gleason score 9");
    * a forward trigger that is the whole value of a field ending its line
      ("Reviewed: No", token ``trigger`` right after the colon) reaches the next
      line at most: it answers its own key, and lines further on are other fields;
    * a backward trigger never reaches back over a whole line when one of the
      lines it crosses starts a new field: in a column of checklist answers
      ("Adenocarcinoma" / "G2, moderately differentiated" / "Not identified")
      each answer belongs to its own key.  Right on the next line it still
      answers the line before ("Perineural invasion" / "Not identified").
    """
    lines = sent.lines
    assert lines is not None
    a = bisect_left(lines, g0)
    b = bisect_right(lines, g1)
    if a >= b:
        return True  # all on one line
    toks = sent.toks
    punct = sent.punct

    def only_punct(i: int, j: int) -> bool:
        return bisect_left(punct, j) - bisect_left(punct, i) == j - i

    if within:
        for idx in range(a, b):
            k = lines[idx]
            if toks[k - 1] in joiners:
                continue
            if forward and idx == a and only_punct(g0, k):
                continue  # the trigger closes its line
            if not forward and idx == b - 1 and only_punct(k, g1):
                continue  # the trigger opens its line
            return False
    starts = sent.starts
    assert starts is not None
    n = len(starts)
    stop = lo + len(sent.text)
    if not forward:
        return b - a < 2 or not any(
            lines[idx] < n
            and toks[lines[idx] - 1] not in joiners
            and _NEW_FIELD_RE.match(text, lo + starts[lines[idx]], stop)
            for idx in range(a, b)
        )
    first = lines[a]
    if (
        b - a >= 2
        and trigger > 0
        and toks[trigger - 1] == ":"
        and only_punct(g0, first)
        and (a == 0 or lines[a - 1] < trigger)
    ):
        return False  # "Reviewed: No" ends its line: it answers its own key
    label = first > g0 and toks[first - 1] == ":" and only_punct(g0, first)
    for idx in range(a + 1 if label else a, b):
        k = lines[idx]
        if k < n and toks[k - 1] not in joiners and _NEW_FIELD_RE.match(text, lo + starts[k], stop):
            return False
    return True


def _phrase_regex(phrases: Sequence[tuple[str, ...]]) -> re.Pattern[str] | None:
    """A regex for token sequences, whitespace-flexible, not inside a word."""
    if not phrases:
        return None
    alts = []
    for toks in sorted(phrases, key=len, reverse=True):
        body = r"\s*".join(re.escape(t) for t in toks)
        left = r"(?<!\w)" if toks[0][0].isalnum() else ""
        right = r"(?!\w)" if toks[-1][-1].isalnum() else ""
        alts.append(left + body + right)
    return re.compile("|".join(alts), re.IGNORECASE)
