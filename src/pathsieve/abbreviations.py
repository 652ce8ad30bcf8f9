"""Abbreviations: the curated dictionary, sense choice, and in-text definitions.

The dictionary is the data file ``ontology/lexicon/abbreviations.tsv``, one row
per sense, tab-separated, with the header::

    abbr	expansion	concept_id	contexts	case_sensitive

* ``concept_id`` may be empty: a sense with no concept ("PR" = per rectum) is
  still worth listing, because choosing it keeps the short form from being
  read as a concept it does not mean here;
* ``contexts`` is ``*`` or comma-separated scheme names (colorectal,
  prostate, ...) and/or section kinds (diagnosis, gross, ...): where the sense
  is preferred (a preference, not a restriction: a short form with one sense
  is read with it everywhere);
* ``case_sensitive`` is ``yes`` or ``no`` (``true``/``false``/``1``/``0`` are
  read too).

Blank lines and lines starting with ``#`` are ignored.

Where a short form has several senses, :func:`choose_sense` picks one by the
scheme in use, the section kind, and the words around it; the reason is kept
for the mention's ``note``.  Definitions written in the report itself,
``long form (SF)``, found with the Schwartz & Hearst (2003) algorithm
(:func:`find_definitions`), override the dictionary for that report; the
matcher applies them.

>>> d = AbbreviationDictionary.from_rows([
...     ("HP", "hyperplastic polyp", "X:1", "colorectal", "yes"),
...     ("HP", "Helicobacter pylori", "X:2", "*", "yes"),
... ])
>>> choice = choose_sense("HP", d.senses_for("HP"), scheme="colorectal")
>>> choice.sense.expansion, choice.note
('hyperplastic polyp', "HP: chose 'hyperplastic polyp' by scheme colorectal over 'Helicobacter pylori'")
>>> [(x.short, x.long) for x in find_definitions("a traditional serrated adenoma (TSA).")]
[('TSA', 'traditional serrated adenoma')]
"""

from __future__ import annotations

import re
from collections.abc import Collection, Iterable, Mapping, Sequence
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import TYPE_CHECKING

from .errors import VocabError
from .normalize import normalize
from .records import SECTION_KINDS
from .vocab import lexicon_path, schemes_dir

if TYPE_CHECKING:
    from .ontology import Ontology

__all__ = [
    "HEADER",
    "AbbreviationDictionary",
    "Choice",
    "Definition",
    "Sense",
    "check_abbreviations",
    "choose_sense",
    "cue_words",
    "find_definitions",
    "fold_abbreviation",
    "window_words",
]

#: The columns of the dictionary file, in order.
HEADER: tuple[str, ...] = ("abbr", "expansion", "concept_id", "contexts", "case_sensitive")
_TRUE = frozenset({"yes", "true", "1", "y"})
_FALSE = frozenset({"no", "false", "0", "n"})
_CONTEXT_RE = re.compile(r"^[a-z][a-z0-9_]*$")

# Weights of the evidence for a sense (see choose_sense).
_SCHEME_WEIGHT = 3
_SECTION_WEIGHT = 2
_SPELLED_WEIGHT = 4
_SPELLED_CAP = 8
_RELATED_CAP = 3
_CUE_RE = re.compile(r"[^\W_]+")


@dataclass(frozen=True, slots=True)
class Sense:
    """One sense of a short form.

    ``contexts`` is ``("*",)`` or the scheme names and section kinds where the
    sense is preferred; ``line`` is its line in the dictionary file (0 for a
    sense taken from an ontology ABBREVIATION synonym).
    """

    abbr: str
    expansion: str
    concept_id: str = ""
    contexts: tuple[str, ...] = ("*",)
    case_sensitive: bool = True
    line: int = 0

    @property
    def schemes(self) -> frozenset[str]:
        """Context names that are not section kinds (scheme names)."""
        return frozenset(c for c in self.contexts if c != "*" and c not in SECTION_KINDS)

    @property
    def sections(self) -> frozenset[str]:
        return frozenset(c for c in self.contexts if c in SECTION_KINDS)


def fold_abbreviation(text: str) -> str:
    """The key of a case-insensitive short form: normalised as report text is.

    >>> fold_abbreviation("SSA/P"), fold_abbreviation("Ca")
    ('ssa/p', 'ca')
    """
    return normalize(text).text.strip()


class AbbreviationDictionary:
    """The senses of every short form, looked up by the text as written."""

    def __init__(self, senses: Iterable[Sense], *, path: str | None = None) -> None:
        self.path = path
        self.senses: tuple[Sense, ...] = tuple(senses)
        exact: dict[str, list[Sense]] = {}
        folded: dict[str, list[Sense]] = {}
        for s in self.senses:
            if s.case_sensitive:
                exact.setdefault(s.abbr, []).append(s)
            else:
                folded.setdefault(fold_abbreviation(s.abbr), []).append(s)
        self._exact = {k: tuple(v) for k, v in exact.items()}
        self._folded = {k: tuple(v) for k, v in folded.items()}

    def __len__(self) -> int:
        return len(self.senses)

    def __repr__(self) -> str:
        return f"AbbreviationDictionary({len(self.senses)} senses, path={self.path!r})"

    @classmethod
    def load(cls, path: str | Path | None = None) -> AbbreviationDictionary:
        """Read the dictionary file (default: the shipped ``abbreviations.tsv``).

        Raises :class:`~pathsieve.errors.VocabError` naming the file and line of
        the first structural problem (header, column count, empty field,
        ``case_sensitive`` value, malformed contexts).
        """
        p = Path(path) if path is not None else lexicon_path("abbreviations.tsv")
        senses, problems = _parse(p)
        if problems:
            line, message = problems[0]
            raise VocabError(message, path=p, line=line)
        return cls(senses, path=str(p))

    @classmethod
    def from_rows(
        cls, rows: Iterable[Sequence[str]], *, path: str | None = None
    ) -> AbbreviationDictionary:
        """Build from rows of the five columns (strings, as in the file)."""
        senses = []
        for n, row in enumerate(rows, 1):
            sense, problem = _row_to_sense(list(row), n)
            if problem:
                raise VocabError(problem, path=path or "<rows>", line=n)
            assert sense is not None
            senses.append(sense)
        return cls(senses, path=path)

    @classmethod
    def empty(cls) -> AbbreviationDictionary:
        return cls(())

    def senses_for(self, written: str) -> tuple[Sense, ...]:
        """Senses of the short form as written (case-sensitive rows match exactly)."""
        return self._exact.get(written, ()) + self._folded.get(fold_abbreviation(written), ())

    def case_sensitive_forms(self) -> Iterable[str]:
        return self._exact.keys()

    def folded_forms(self) -> Iterable[str]:
        return self._folded.keys()


# --------------------------------------------------------------------------- parsing


def _row_to_sense(fields: list[str], line: int) -> tuple[Sense | None, str]:
    if len(fields) != len(HEADER):
        return None, (
            f"expected {len(HEADER)} tab-separated columns ({', '.join(HEADER)}), "
            f"found {len(fields)}; separate columns with one TAB"
        )
    abbr, expansion, concept_id, contexts, case = fields
    if not abbr.strip() or abbr != abbr.strip():
        return None, f"bad abbr {abbr!r}: must be non-empty with no surrounding spaces"
    if not expansion.strip():
        return None, f"empty expansion for {abbr!r}; write the long form"
    flag = case.strip().lower()
    if flag not in _TRUE and flag not in _FALSE:
        return None, f"bad case_sensitive value {case!r} for {abbr!r}; write yes or no"
    names = tuple(c.strip() for c in contexts.split(",")) if contexts.strip() else ()
    if not names:
        return None, f"empty contexts for {abbr!r}; write * or scheme/section names"
    for name in names:
        if name != "*" and not _CONTEXT_RE.match(name):
            return None, (
                f"bad context {name!r} for {abbr!r}; write * or lower-case scheme/section "
                "names separated by commas"
            )
    if "*" in names and len(names) > 1:
        return None, f"contexts of {abbr!r} mix * with names; write either * or names"
    sense = Sense(
        abbr=abbr,
        expansion=expansion.strip(),
        concept_id=concept_id.strip(),
        contexts=names,
        case_sensitive=flag in _TRUE,
        line=line,
    )
    return sense, ""


def _parse(path: Path) -> tuple[list[Sense], list[tuple[int | None, str]]]:
    """Senses and structural problems ``(line, message)`` of a dictionary file."""
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except FileNotFoundError:
        return [], [(None, "abbreviation dictionary not found; check the path")]
    except (OSError, UnicodeDecodeError) as exc:
        return [], [(None, f"cannot read abbreviation dictionary ({exc}); check the file")]
    senses: list[Sense] = []
    problems: list[tuple[int | None, str]] = []
    header_seen = False
    for n, raw in enumerate(lines, 1):
        if not raw.strip() or raw.lstrip().startswith("#"):
            continue
        fields = raw.rstrip("\r\n").split("\t")
        if not header_seen:
            header_seen = True
            if tuple(f.strip() for f in fields) != HEADER:
                problems.append(
                    (n, f"bad header {raw.strip()!r}; the first row must be: " + "\t".join(HEADER))
                )
                return senses, problems
            continue
        sense, problem = _row_to_sense(fields, n)
        if problem:
            problems.append((n, problem))
        elif sense is not None:
            senses.append(sense)
    if not header_seen:
        problems.append((None, "abbreviation dictionary is empty; it needs the header row"))
    return senses, problems


def _known_contexts() -> frozenset[str] | None:
    """Scheme names (from the scheme files) and section kinds, or None if no schemes."""
    names = (
        {p.stem for p in Path(schemes_dir()).glob("*.yaml")} if schemes_dir().is_dir() else set()
    )
    if not names:
        return None
    return frozenset(names) | frozenset(SECTION_KINDS)


def check_abbreviations(
    path: str | Path | None = None,
    ontology: Ontology | None = None,
    *,
    known_contexts: Collection[str] | None = None,
) -> list[str]:
    """Check a dictionary file; return problems as ``"file:line: message"``.

    Checks the structure (as :meth:`AbbreviationDictionary.load` does, but
    listing every problem), concept ids against the ontology (default: the
    shipped one), duplicate senses (same short form and expansion), and
    context names against the scheme files and section kinds.
    """
    p = Path(path) if path is not None else lexicon_path("abbreviations.tsv")
    senses, structural = _parse(p)
    out = [f"{p}:{line}: {msg}" if line else f"{p}: {msg}" for line, msg in structural]
    if ontology is None:
        from .ontology import load_ontology

        try:
            ontology = load_ontology()
        except VocabError as exc:
            return [*out, f"{p}: concept ids not checked: {exc}"]
    contexts = frozenset(known_contexts) if known_contexts is not None else _known_contexts()
    seen: dict[tuple[str, str], int] = {}
    for s in senses:
        if s.concept_id and s.concept_id not in ontology.terms:
            out.append(
                f"{p}:{s.line}: unknown concept id {s.concept_id!r} for {s.abbr!r}; "
                "use an id from the ontology or leave the column empty"
            )
        key = (
            s.abbr if s.case_sensitive else fold_abbreviation(s.abbr),
            normalize(s.expansion).text,
        )
        if key in seen:
            out.append(
                f"{p}:{s.line}: duplicate sense {s.abbr!r} = {s.expansion!r} "
                f"(first at line {seen[key]}); remove one row"
            )
        else:
            seen[key] = s.line
        if contexts is not None:
            for name in s.contexts:
                if name != "*" and name not in contexts:
                    out.append(
                        f"{p}:{s.line}: unknown context {name!r} for {s.abbr!r}; use * or one "
                        f"of: {', '.join(sorted(contexts))}"
                    )
    return out


# --------------------------------------------------------------------------- sense choice


@dataclass(frozen=True, slots=True)
class Choice:
    """The sense chosen for one occurrence of a short form, and why."""

    sense: Sense
    score: int
    note: str
    tied: bool = False  # another sense scored as well; the first-listed one was taken


@lru_cache(maxsize=4096)
def cue_words(text: str) -> frozenset[str]:
    """Content words of a phrase for sense choice: 4+ letters, plural 's' dropped.

    >>> sorted(cue_words("Helicobacter-like organisms in the antrum"))
    ['antrum', 'helicobacter', 'like', 'organism']
    """
    return window_words(text)


def window_words(text: str) -> frozenset[str]:
    """:func:`cue_words` without the cache, for one-off stretches of report text."""
    out = set()
    for w in _CUE_RE.findall(normalize(text).text):
        if len(w) >= 4 and not w.isdigit():
            plural = len(w) > 4 and w.endswith("s") and not w.endswith(("ss", "us", "is"))
            out.add(w[:-1] if plural else w)
    return frozenset(out)


def _stem(word: str) -> str:
    return word[:5]


#: (senses, cues) -> the words each sense brings; the same few short forms recur in
#: every report, and these sets were the bulk of choosing a sense.
_Words = list[tuple[str, str]]  # (word, stem), sorted by word
_SENSE_WORDS: dict[
    tuple[tuple[Sense, ...], int], tuple[object, list[_Words], list[_Words], frozenset[str]]
] = {}


def _sense_words(
    senses: tuple[Sense, ...], cues: Mapping[Sense, Collection[str]] | None
) -> tuple[list[_Words], list[_Words], frozenset[str]]:
    """Per sense: its expansion's cue words, its other cue words; and the stems all share."""
    key = (senses, id(cues))
    hit = _SENSE_WORDS.get(key)
    if hit is not None and hit[0] is cues:  # the very same cue mapping, not a reused id
        return hit[1], hit[2], hit[3]
    own = [cue_words(s.expansion) for s in senses]
    extra = [frozenset(cues.get(s, ())) if cues else frozenset() for s in senses]
    everyone = [frozenset(_stem(w) for w in o | x) for o, x in zip(own, extra, strict=True)]
    shared = frozenset.intersection(*everyone) if len(senses) > 1 else frozenset()
    own_words = [[(w, _stem(w)) for w in sorted(o)] for o in own]
    other_words = [[(w, _stem(w)) for w in sorted(x - o)] for o, x in zip(own, extra, strict=True)]
    if len(_SENSE_WORDS) >= 4096:
        _SENSE_WORDS.clear()
    _SENSE_WORDS[key] = (cues, own_words, other_words, shared)
    return own_words, other_words, shared


def choose_sense(
    written: str,
    senses: Sequence[Sense],
    *,
    scheme: str | None = None,
    section: str | None = None,
    neighbours: Collection[str] = (),
    cues: Mapping[Sense, Collection[str]] | None = None,
) -> Choice | None:
    """Pick the sense of ``written`` that fits its context best, or None.

    ``neighbours`` are the :func:`cue_words` near the short form; ``cues[sense]``
    are further words that belong to a sense (its concept's names and
    ancestors, its scheme names).  Evidence, added up per sense:

    * scheme: +3 when the sense names the scheme in use;
    * section: +2 when the sense names the section kind;
    * words of the sense's own expansion nearby: +4 each, at most +8 - the
      writer spelled the long form out ("Helicobacter-like organisms ... HP"),
      which outweighs the scheme's prior;
    * other cue words nearby: +1 each, at most +3.

    Words are compared by their first five letters ("prostate" meets
    "prostatic", "cervix" meets "cervical").  A word that every sense shares
    tells nothing and is not counted.  The best
    total wins; a tie goes to the sense listed first.  Contexts are
    preferences: a sense whose contexts do not fit still wins when nothing
    better does.  None only for an empty ``senses``.
    """
    if not senses:
        return None
    near = frozenset(_stem(w) for w in neighbours)
    own, extra, shared = _sense_words(tuple(senses), cues)
    scored: list[tuple[int, int, Sense, list[str]]] = []
    for order, sense in enumerate(senses):
        total = 0
        why: list[str] = []
        if scheme and scheme in sense.schemes:
            total += _SCHEME_WEIGHT
            why.append(f"scheme {scheme}")
        if section and section in sense.sections:
            total += _SECTION_WEIGHT
            why.append(f"section {section}")
        spelled = [w for w, st in own[order] if st in near and st not in shared]
        related = [w for w, st in extra[order] if st in near and st not in shared]
        if spelled:
            total += min(_SPELLED_WEIGHT * len(spelled), _SPELLED_CAP)
        if related:
            total += min(len(related), _RELATED_CAP)
        hits = spelled + related
        if hits:
            why.append("nearby " + ", ".join(f"'{h}'" for h in hits[:4]))
        scored.append((total, order, sense, why))
    scored.sort(key=lambda x: (-x[0], x[1]))
    best, _, sense, why = scored[0]
    if len(senses) == 1:
        return Choice(sense, best, "")
    others = ", ".join(f"'{s.expansion}'" for _, _, s, _ in scored[1:])
    tied = best == scored[1][0]
    reason = "as the first-listed sense (no context decides)" if tied else "by " + "; ".join(why)
    return Choice(sense, best, f"{written}: chose '{sense.expansion}' {reason} over {others}", tied)


# --------------------------------------------------------------------------- definitions


@dataclass(frozen=True, slots=True)
class Definition:
    """An in-text definition ``long (short)`` or ``short (long)``, with offsets."""

    short: str
    long: str
    short_start: int
    short_end: int
    long_start: int
    long_end: int


# Where a long-form candidate may start: after sentence or clause punctuation
# followed by white space (the published algorithm cuts at ". " and ", "),
# after a blank line, or after a list bullet at the start of a line.  The
# greedy ".*" makes one match find the *last* such place before the "(".
_CLAUSE_RE = re.compile(r"(?s).*(?:[.,;:!?](?=\s)|\n[ \t]*\n|\n[ \t]*[-•*][ \t])")
_LETTER_RE = re.compile(r"[^\W\d_]")
_CAPITAL_RE = re.compile(r"[A-Z]")
_LAST_WORD_RE = re.compile(r"(\S+)\s*$")
_ALNUM_RE = re.compile(r"[^\W_]")
_WORD_START_RE = re.compile(r"\S+")


def find_definitions(text: str, *, at: Iterable[int] | None = None) -> list[Definition]:
    """In-text abbreviation definitions (Schwartz & Hearst, PSB 2003).

    For each ``(`` preceded by white space: the text up to the matching ``)``
    (cut at ``", "`` or ``"; "``) is the short-form candidate and the text back
    to the last clause boundary the long-form candidate; when the parenthesis
    holds more than two words, or more characters than the text before it, the
    roles swap (``SF (long form)``, the short form being the preceding word,
    which must contain a capital).  A short form has 2-10 alphanumeric
    characters, at least one letter, and starts with a letter or digit.  The
    long form is found by matching the short form's characters right to left,
    the first one at the start of a word, and must be at most
    ``min(|A| + 5, |A| * 2)`` words for ``|A|`` short-form characters, must not
    contain the short form as a word nor end with it, and (an addition to the
    published rules) must not start with it.

    ``at`` limits the search to the parentheses opening at those offsets.
    """
    out: list[Definition] = []
    if at is not None:
        for open_at in at:
            d = _definition_at(text, open_at) if text[open_at : open_at + 1] == "(" else None
            if d is not None:
                out.append(d)
        return out
    open_at = text.find("(")
    while open_at >= 0:
        d = _definition_at(text, open_at)
        if d is not None:
            out.append(d)
        open_at = text.find("(", open_at + 1)
    return out


def _definition_at(text: str, open_at: int) -> Definition | None:
    """The definition around the ``(`` at ``open_at``, if there is one."""
    if open_at == 0 or not text[open_at - 1].isspace():
        return None  # the algorithm looks at " (" only
    close_at = _close_paren(text, open_at)
    if close_at < 0:
        return None
    inner_start = open_at + 1
    inner = text[inner_start:close_at]
    for sep in (", ", "; "):
        cut = inner.find(sep)
        if cut >= 0:
            inner = inner[:cut]
    n_inner = len(inner.split())
    if n_inner <= 2 and _LETTER_RE.search(inner) is None:
        return None  # "(0/12)", "(60%)": no short form, and too short to be a long form
    before_end = open_at - 1  # the white space before "("
    lo = max(0, open_at - 300)
    clause = _CLAUSE_RE.match(text, lo, before_end)
    begin = clause.end() if clause else lo
    long_text = text[begin:before_end]
    if len(inner.strip()) < 2 or len(long_text.strip()) < 2:
        return None
    if n_inner > 2 or len(inner) > len(long_text):
        # "SF (long form)": the short form is the word before the parenthesis
        word = _LAST_WORD_RE.search(long_text)
        if word is None or _CAPITAL_RE.search(word.group(1)) is None:
            return None
        short, s_start = word.group(1), begin + word.start(1)
        long_cand, l_start = inner, inner_start
    else:
        short, s_start = inner, inner_start
        long_cand, l_start = long_text, begin
    # trim white space, keeping offsets
    lead = len(short) - len(short.lstrip())
    short, s_start = short.strip(), s_start + lead
    lead = len(long_cand) - len(long_cand.lstrip())
    long_cand, l_start = long_cand.strip(), l_start + lead
    return _pair(short, s_start, long_cand, l_start)


def _close_paren(text: str, open_at: int) -> int:
    """Index of the ``)`` closing the ``(`` at ``open_at`` (nesting allowed), or -1.

    A parenthesis left open for 200 characters or across a blank line is not one.
    """
    limit = min(len(text), open_at + 200)
    depth, i = 1, open_at + 1
    while True:
        close = text.find(")", i, limit)
        if close < 0:
            return -1
        depth += text.count("(", i, close) - 1
        if depth == 0:
            return -1 if "\n\n" in text[open_at:close] else close
        i = close + 1


def _valid_short(short: str) -> bool:
    return (
        len(short) >= 2
        and (short[0].isalnum() or short[0] == "(")
        and _LETTER_RE.search(short) is not None
        and len(_ALNUM_RE.findall(short)) <= 10
    )


def _best_long_form(short: str, long: str) -> int:
    """Start index in ``long`` of the shortest long form matching ``short``, or -1.

    Right to left: every alphanumeric character of the short form must appear
    in the long form in order; the first one must begin a word.
    """
    low = long.lower()
    li = len(long) - 1
    chars = [c for c in short.lower() if c.isalnum()]
    for k in range(len(chars) - 1, -1, -1):
        c = chars[k]
        li = low.rfind(c, 0, li + 1)
        if k == 0:
            # the first character must begin a word
            while li > 0 and low[li - 1].isalnum():
                li = low.rfind(c, 0, li)
        if li < 0:
            return -1
        li -= 1
    return long.rfind(" ", 0, li + 1) + 1


def _pair(short: str, s_start: int, long: str, l_start: int) -> Definition | None:
    if not _valid_short(short):
        return None
    n_chars = len(_ALNUM_RE.findall(short))
    limit = min(n_chars + 5, n_chars * 2)
    # A long form beyond the word limit is rejected anyway, so search only the
    # last `limit` words (hyphens split words too, so this never cuts a valid one).
    starts = [w.start() for w in _WORD_START_RE.finditer(long)]
    if len(starts) > limit:
        head = starts[-limit]
        long, l_start = long[head:], l_start + head
    begin = _best_long_form(short, long)
    if begin < 0:
        return None
    best = long[begin:]
    n_words = len(best.replace("-", " ").split())
    if (
        len(best) < len(short)
        or f"{short} " in best
        or best.endswith(short)
        or n_words > limit
        # pathsieve's addition: a long form that starts with the short form is
        # the short form inflected ("TAs (TA)"), not a definition
        or best.lower().startswith(short.lower())
    ):
        return None
    return Definition(
        short=short,
        long=best,
        short_start=s_start,
        short_end=s_start + len(short),
        long_start=l_start + begin,
        long_end=l_start + len(long),
    )
