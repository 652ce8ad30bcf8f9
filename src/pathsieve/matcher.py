"""Concept matching: ontology names and synonyms, abbreviations, misspellings.

:class:`ConceptMatcher` finds ontology concepts in a report and returns
:class:`~pathsieve.records.Mention` records whose ``text`` is always
``original[start:end]``.  Three ways a mention is found:

* **exact** - every name and synonym of the ontology (scopes EXACT, NARROW and
  RELATED; BROAD synonyms are more general than the concept and would
  over-claim), with generated variants (plural of the last word, a hyphen
  removed, "CIN 2" <-> "CIN2"), matched with one Aho-Corasick automaton over
  the normalised text.  Matching text and keys both have punctuation turned
  into spaces and are padded with a space, so a key can only match whole
  words; a name never runs over a sentence end to a name of the next sentence
  ("adenocarcinoma.\n-Metastatic ..." is no "adenocarcinoma, metastatic");
* **abbreviation** - the rows of the abbreviation dictionary and the
  ABBREVIATION synonyms of the ontology the dictionary does not list, matched
  as whole tokens of the *original* text (case-sensitively where the row says
  so; an ontology short form is case-sensitive when written with a capital).
  Several senses are settled by :func:`~pathsieve.abbreviations.choose_sense`
  (scheme, section, nearby words); a definition in the report itself
  ("traditional serrated adenoma (TSA)") overrides the dictionary.  A name
  two unrelated concepts share ("acinar adenocarcinoma": prostate or lung) is
  settled the same way;
* **fuzzy** - a word that is neither a vocabulary word nor a common word
  (``ontology/lexicon/common_words.txt``) is corrected to the closest
  vocabulary word when similar enough (rapidfuzz ``ratio`` at or above
  ``fuzzy_cutoff``; words shorter than ``fuzzy_min_length`` are never
  corrected alone), or when undoing one typical OCR confusion ("rn" for "m",
  "0" for "o", "v" for "y") spells a vocabulary word (score 95), or, in a word
  of nine letters or more, when undoing a glyph run ("rn", "nn", "ri" for one
  letter) leaves a word within the cut-off ("adeuocarcinorna").  A word known
  only as a generated spelling ("squamouscell", of "squamous-cell
  carcinomas") is still corrected where it stands alone.  Two
  neighbouring words are joined when together they spell a vocabulary word
  ("adeno carcinoma", "car.cinoma", and "squamo us", the first half a known
  fragment that is no common word), and a word that is two vocabulary words
  run together is split.  Inside a multi-word name whose other words are
  written right, an ordinary or misread word one or two letters off the
  name's word is read as it ("squamous call carcinoma", "squamous 0e11
  carcinoma").  The corrected text is matched again with the exact
  automaton, so a correction yields a mention only when a whole name or
  synonym results, using the correction whole.  A negation glued to a word
  ("nomalignancy") is never corrected away;
* **fuzzy, loose** - a name of a neoplasm wrecked in more than one word
  ("squamous ceij, carcinoma", "squamou scellcarcinoma", "ade.noca rcinoma")
  or one long word further off than the cut-off ("adenocerxinoma"): windows
  of one to five words around an unknown word are compared letters-only with
  the names (rapidfuzz ``ratio`` at or above ``loose_cutoff``), under guards
  that keep ordinary text from becoming a disease: a distinctive word of the
  name borne by the window, the first letter kept, no known word that is no
  word of the name, no word of the name left unread, no name of another
  concept as near, no name of another concept spelled in the window, no glued
  negation.  The mention spans the window and its note reads like the other
  fuzzy notes.

The cut-off (88) and the shortest word (6) were chosen with
``tests/reading/fuzzy_calibration.py``: the smallest cut-off with no false hit
on several hundred ordinary and near-miss words, with the filter of common
words switched off; recall there is 95% on 61 realistic misspellings.  The
loose cut-off (85) was chosen on the TCGA development reports: below it the
readings it adds turn mostly wrong (a word run into "benign" read as
"tumour benign" at 82).

Overlaps: the longest span wins, then exact before abbreviation before fuzzy,
then the deeper concept in the is_a hierarchy.

>>> from pathsieve.ontology import load_ontology
>>> m = ConceptMatcher(load_ontology(), scheme_name="colorectal")
>>> [(x.label, x.text, x.match) for x in m.find("Tubulovilous adenoma with HGD.")][:1]
[('tubulovillous adenoma', 'Tubulovilous adenoma', 'fuzzy')]
"""

from __future__ import annotations

import re
from bisect import bisect_left, bisect_right
from collections.abc import Callable, Collection, Sequence
from dataclasses import dataclass, field
from functools import lru_cache
from itertools import pairwise
from pathlib import Path
from typing import Any

import ahocorasick
from rapidfuzz import fuzz, process
from rapidfuzz.distance import Levenshtein

from .abbreviations import (
    AbbreviationDictionary,
    Choice,
    Sense,
    choose_sense,
    cue_words,
    find_definitions,
    window_words,
)
from .errors import ConfigError, InputError, VocabError
from .normalize import NormText, normalize
from .ontology import Ontology
from .records import Mention
from .vocab import lexicon_path

__all__ = [
    "FUZZY_CUTOFF",
    "FUZZY_MIN_LENGTH",
    "LOOSE_CUTOFF",
    "ConceptMatcher",
    "check_common_words",
    "load_common_words",
    "matching_key",
    "matching_text",
    "plural_forms",
]

#: Default similarity cut-off (rapidfuzz ``ratio``, 0-100) for a fuzzy
#: correction; chosen by measurement (tests/reading/fuzzy_calibration.py).
FUZZY_CUTOFF = 88.0
#: Words shorter than this are never fuzzy-corrected (chosen by measurement).
FUZZY_MIN_LENGTH = 6
#: Least rapidfuzz ``ratio`` of a loose reading of a name (several words
#: misread, or one long word further off than ``FUZZY_CUTOFF``); chosen by
#: measurement on the TCGA development reports and the ordinary-text tables.
LOOSE_CUTOFF = 85.0

# Synonym scopes matched exactly, best first (BROAD is left out on purpose).
_KIND_RANK = {"name": 0, "exact": 1, "narrow": 2, "related": 3, "variant": 4}

# Matching text: every character that is not a letter, digit or space becomes a
# space (one for one, so offsets are kept).
_ASCII_KEEP = set(b"abcdefghijklmnopqrstuvwxyz0123456789 ")
_BYTES_TABLE = bytes(c if c in _ASCII_KEEP else 0x20 for c in range(256))
_NON_WORD_RE = re.compile(r"[^\w ]|_")
_WORD_RE = re.compile(r"[a-z0-9]+")

# Typical OCR confusions (as read -> as meant), undone one place at a time
# before a fuzzy comparison: "carcinorna" -> "carcinoma", "atrophv" -> "atrophy".
_OCR_CONFUSIONS: tuple[tuple[str, str], ...] = (
    ("rn", "m"),
    ("m", "rn"),
    ("cl", "d"),
    ("vv", "w"),
    ("li", "h"),
    ("0", "o"),
    ("1", "l"),
    ("1", "i"),
    ("l", "i"),
    ("i", "l"),
    ("5", "s"),
    ("v", "y"),
    ("nn", "m"),
    ("in", "m"),
    ("ri", "n"),
    ("ii", "u"),
    ("u", "n"),
    ("n", "u"),
)
#: Runs of two glyphs an OCR engine makes of one letter; undone, a long word may
#: still be a slip away from a vocabulary word.
_OCR_RUNS = tuple((w, r) for w, r in _OCR_CONFUSIONS if len(w) == 2 and len(r) == 1)
_OCR_RUN_MIN_WORD = 9
#: Words this long may be two slips off a vocabulary word (and three off any other).
_TWO_SLIPS_MIN_WORD = 12
# Score of a vocabulary word reached by undoing one OCR confusion: as good as
# one dropped letter in a long word, above any sensible cut-off.
_OCR_SCORE = 95.0
_OCR_FLOOR = 70.0
# In-context correction: a word of a multi-word name, the other words written
# right, may be misread by this many letters (OCR "squamous call carcinoma",
# "squamcus cell carcinoma"); names of up to four words, open words of four or
# more letters.  Digits OCR makes of letters are read as those letters first.
_SLOT_MAX_WORDS = 4
_SPLIT_MIN_PART = 4  # letters in each part of a run-together pair of words
_SLOT_MIN_LENGTH = 4
_SLOT_DIGITS = str.maketrans({"0": "o", "1": "l", "5": "s", "8": "b"})
# Words that, glued to a finding, carry its negation ("no", "not", "negative for").
_GLUED_PREFIXES = ("no", "not", "for")
# Loose reading of a name wrecked in more than one word ("squamous ceij,
# carcinoma", "squamou scellcarcinoma", "ade.noca rcinoma"): windows of up to
# five words around an unknown word, compared letters-only with the names of
# two or more words (ten letters or more) and the single-word names of twelve
# letters or more.  Cut-off and margin chosen by measurement (see
# tests/reading/loose_calibration.py).
_LOOSE_MAX_TOKENS = 5
_LOOSE_MIN_LETTERS = 10
_LOOSE_SINGLE_MIN = 12
_LOOSE_ANCHOR_MIN = 6  # letters of a name's word that vouches for the name
_LOOSE_NEAR_ANCHOR = 7  # letters of a vouching word that may be one letter off
_LOOSE_MARGIN = 4.0  # over the best name of an unrelated concept
_LOOSE_MAX_GAP = 2  # a single punctuation mark between words, no more
_LOOSE_RESIDUE = 50.0  # least ratio of the damaged words to the rest of the name
_LOOSE_WORD_MAX = 64  # longer "words" (noise, a million letters) are never weighed
_TOKEN_RE = re.compile(r"\S+")
# what a word may be in a loose reading (ConceptMatcher._loose_kind)
_TRIGGER, _ANCHOR, _BLOCKED = 1, 2, 4
# The loose reading reaches only names of neoplasms (the histological types it is
# for): sites, procedures and findings come in families of names one word apart
# ("pericolic" / "periaortic lymph node") where a loose reading guesses.  The
# root is found by name, as the pipeline finds the site and procedure roots.
_LOOSE_ROOT = "neoplasm"


def matching_text(normalised: str) -> str:
    """The string the automaton searches: punctuation -> space, same length.

    >>> matching_text("crohn's disease (her2/neu)")
    'crohn s disease  her2 neu '
    """
    if normalised.isascii():
        return normalised.encode("ascii").translate(_BYTES_TABLE).decode("ascii")
    return _NON_WORD_RE.sub(" ", normalised)


@lru_cache(maxsize=16384)
def matching_key(surface: str) -> str:
    """The automaton key of a name or synonym.

    >>> matching_key("High-Grade  Dysplasia"), matching_key("HER2/neu")
    ('high grade dysplasia', 'her2 neu')
    """
    return " ".join(matching_text(normalize(surface).text).split())


def plural_forms(word: str) -> tuple[str, ...]:
    """English (and a few Latin/Greek) plurals of a lower-case word.

    >>> plural_forms("adenoma"), plural_forms("biopsy"), plural_forms("metastasis")
    (('adenomas', 'adenomata'), ('biopsies',), ('metastases',))
    """
    if not word.isalpha() or len(word) < 3:
        return ()
    if word.endswith("sis"):
        return (word[:-2] + "es",)
    if word.endswith("oma"):
        return (word + "s", word + "ta")
    if word.endswith("us") and not word.endswith("ous"):
        return (word[:-2] + "i", word + "es")
    if word.endswith("um"):
        return (word[:-2] + "a", word + "s")
    if word.endswith("ix") or word.endswith("ex"):
        return (word[:-2] + "ices", word + "es")
    if word.endswith("y") and word[-2] not in "aeiou":
        return (word[:-1] + "ies",)
    if word.endswith("ss") or word.endswith(("x", "z", "ch", "sh")):
        return (word + "es",)
    if word.endswith("s"):
        return ()  # most likely a plural already ("adenocarcinomas")
    if word.endswith("ous") or word.endswith("al") or word.endswith("ic"):
        return ()  # adjectives
    return (word + "s",)


def _variants(surface: str, key: str) -> set[str]:
    """Generated spellings of a key: plural, hyphen removed, "cin 2" <-> "cin2"."""
    out: set[str] = set()
    words = key.split()
    if words:
        for p in plural_forms(words[-1]):
            out.add(" ".join([*words[:-1], p]))
    if re.search(r"[A-Za-z]-[A-Za-z]", surface):
        out.add(matching_key(re.sub(r"(?<=[A-Za-z])-(?=[A-Za-z])", "", surface)))
    joined = re.sub(r"\b([a-z]+) (\d)", r"\1\2", key)
    split = re.sub(r"\b([a-z]+)(\d)", r"\1 \2", key)
    out.update({joined, split})
    out.discard(key)
    return {v for v in out if v}


# --------------------------------------------------------------------------- common words


def load_common_words(path: str | Path | None = None) -> frozenset[str]:
    """The ordinary words never treated as misspellings (``common_words.txt``)."""
    p = Path(path) if path is not None else lexicon_path("common_words.txt")
    words, problems = _parse_common_words(p)
    if problems:
        line, message = problems[0]
        raise VocabError(message, path=p, line=line)
    return words


def check_common_words(path: str | Path | None = None) -> list[str]:
    """Problems of a common-words file as ``"file:line: message"``."""
    p = Path(path) if path is not None else lexicon_path("common_words.txt")
    _, problems = _parse_common_words(p)
    return [f"{p}:{line}: {msg}" if line else f"{p}: {msg}" for line, msg in problems]


def _parse_common_words(p: Path) -> tuple[frozenset[str], list[tuple[int | None, str]]]:
    try:
        lines = p.read_text(encoding="utf-8").splitlines()
    except (OSError, UnicodeDecodeError) as exc:
        return frozenset(), [(None, f"cannot read common-words file ({exc}); check the path")]
    words: dict[str, int] = {}
    problems: list[tuple[int | None, str]] = []
    for n, raw in enumerate(lines, 1):
        w = raw.split("#", 1)[0].strip()
        if not w:
            continue
        if not re.fullmatch(r"[a-z][a-z']*", w):
            problems.append((n, f"bad word {w!r}: one lower-case word per line, letters only"))
        elif w in words:
            problems.append((n, f"duplicate word {w!r} (first at line {words[w]}); remove one"))
        else:
            words[w] = n
    return frozenset(words), problems


# --------------------------------------------------------------------------- index


@dataclass(slots=True)
class _Entry:
    """What one automaton key stands for."""

    concept_id: str = ""
    rank: int = 9
    senses: tuple[Sense, ...] = ()  # non-empty: a case-insensitive short form
    neg_depth: int = 0  # minus the concept's number of ancestors (sorts deeper first)
    # a name or synonym two unrelated concepts share: one pseudo-sense per concept,
    # settled by the words around it like the senses of a short form
    choices: tuple[Sense, ...] = ()


@dataclass(slots=True)
class _Index:
    """Everything built once per (ontology, dictionary, options)."""

    automaton: Any
    entries: list[_Entry]
    cs_automaton: Any
    cs_senses: dict[str, tuple[Sense, ...]]
    folded_senses: dict[str, tuple[Sense, ...]]
    key_concept: dict[str, str]
    labels: dict[str, str]
    depth: dict[str, int]
    concept_words: dict[str, frozenset[str]]
    sense_cues: dict[Sense, frozenset[str]]
    vocab_words: frozenset[str]
    known_words: frozenset[str]
    #: words known only from generated spellings ("squamouscell", of "squamous-cell
    #: carcinomas" without its hyphen): written alone they are still corrected
    variant_words: frozenset[str]
    #: a known fragment that starts a name's word -> the endings that complete it
    #: ("squamo" -> "us": "squamo us" is "squamous", both halves being words)
    split_heads: dict[str, frozenset[str]]
    targets_by_first: dict[tuple[int, str], list[str]]
    targets_by_last: dict[tuple[int, str], list[str]]
    target_text: dict[str, str]
    join_ends: frozenset[tuple[str, str]]
    join_heads: frozenset[str]
    join_tails: frozenset[str]
    ambiguous_keys: dict[str, tuple[str, ...]] = field(default_factory=dict)
    # (number of words, slot index, the other words) -> (slot word, key) of the
    # multi-word names with that shape
    slots: dict[tuple[int, int, tuple[str, ...]], list[tuple[str, str]]] = field(
        default_factory=dict
    )
    # the open words by (word right before / after them, first or "-" + last letter):
    # a cheap first test before the neighbours are compared
    slot_left: dict[tuple[str, str], tuple[str, ...]] = field(default_factory=dict)
    slot_right: dict[tuple[str, str], tuple[str, ...]] = field(default_factory=dict)
    # every open word by its first letter and by "-" + its last letter: a word no
    # open word is within reach of can never fill a slot (tested once per word)
    slot_words: dict[str, tuple[str, ...]] = field(default_factory=dict)
    # Loose reading: names by their letters run together ("squamouscellcarcinoma")
    # -> (key, concept id, words of the key), those letters by (length, first
    # letter) and by (length, last two letters), lengths within a tolerance, and
    # every word of those names
    loose_targets: dict[str, tuple[str, str, tuple[str, ...]]] = field(default_factory=dict)
    loose_by_first: dict[tuple[int, str], tuple[str, ...]] = field(default_factory=dict)
    loose_by_last: dict[tuple[int, str], tuple[str, ...]] = field(default_factory=dict)
    loose_words: frozenset[str] = frozenset()
    loose_word_list: tuple[str, ...] = ()
    # the words of six letters or more of those names that are no common words
    # ("squamous", "carcinoma"; not "small", "tumor"), and the first and last three
    # letters of the single-word names: a window holds one or is not compared
    loose_anchors: frozenset[str] = frozenset()
    loose_anchor_list: tuple[str, ...] = ()  # those of seven letters or more
    loose_heads: frozenset[str] = frozenset()
    loose_tails: frozenset[str] = frozenset()


def _build_index(
    onto: Ontology,
    abbreviations: AbbreviationDictionary,
    common_words: frozenset[str],
    min_length: int,
) -> _Index:
    best: dict[str, tuple[int, str]] = {}  # key -> (rank, concept id)
    ambiguous: dict[str, set[str]] = {}
    depth = {cid: len(onto.ancestors(cid)) for cid in onto.terms}
    line = {cid: t.line for cid, t in onto.terms.items()}
    cs: dict[str, list[Sense]] = {}
    folded: dict[str, list[Sense]] = {}
    punctuated: dict[str, str] = {}  # key spelled with its punctuation -> plain key

    def offer(key: str, cid: str, rank: int) -> None:
        if not key:
            return
        old = best.get(key)
        if old is None or rank < old[0]:
            best[key] = (rank, cid)
            return
        if rank > old[0] or old[1] == cid:
            return
        # two concepts share a key at the same rank: the deeper one if one is
        # a kind of the other, else the one defined first (and remember it)
        if onto.is_a(cid, old[1]):
            best[key] = (rank, cid)
        elif not onto.is_a(old[1], cid):
            ambiguous.setdefault(key, {old[1]}).add(cid)
            if line.get(cid, 0) < line.get(old[1], 0):
                best[key] = (rank, cid)

    # The dictionary is the authority on every short form it lists (its rows
    # carry contexts and case rules); an ontology ABBREVIATION synonym it does
    # not list is read in every context, case-sensitively when written with a
    # capital.
    for s in abbreviations.senses:
        if s.case_sensitive:
            cs.setdefault(s.abbr, []).append(s)
        else:
            folded.setdefault(matching_key(s.abbr), []).append(s)
    in_dictionary = {matching_key(s.abbr) for s in abbreviations.senses}
    for text, cid, kind in onto.surface_forms():
        if kind == "abbreviation":
            if matching_key(text) in in_dictionary:
                continue
            sense = Sense(text, onto.terms[cid].label, cid, ("*",), any(c.isupper() for c in text))
            bucket = (
                cs.setdefault(text, [])
                if sense.case_sensitive
                else folded.setdefault(matching_key(text), [])
            )
            if all(b.concept_id != cid for b in bucket):
                bucket.append(sense)
            continue
        if kind not in _KIND_RANK:
            continue  # broad synonyms
        key = matching_key(text)
        offer(key, cid, _KIND_RANK[kind])
        # Punctuation inside a wording ("Adenocarcinoma, signet ring cell type",
        # "H. pylori") is a double space in the searched text: that spelling is a
        # key too, for the same entry as the plain one.
        spelled = matching_text(normalize(text).text).strip()
        if spelled != key and key:
            punctuated.setdefault(spelled, key)
        for v in _variants(text, key):
            offer(v, cid, _KIND_RANK["variant"])

    automaton = ahocorasick.Automaton()
    entries: list[_Entry] = []
    entry_of: dict[str, int] = {}
    for key, (rank, cid) in best.items():
        choices: tuple[Sense, ...] = ()
        if key in ambiguous:
            ids = sorted(ambiguous[key] | {cid}, key=lambda c: (line.get(c, 0), c))
            choices = tuple(Sense(key, onto.terms[c].label, c, ("*",)) for c in ids)
        entry_of[key] = len(entries)
        automaton.add_word(f" {key} ", (len(key) + 2, len(entries)))
        entries.append(_Entry(cid, rank, (), -depth.get(cid, 0), choices))
    for spelled, key in punctuated.items():
        if spelled not in best and key in entry_of:
            automaton.add_word(f" {spelled} ", (len(spelled) + 2, entry_of[key]))
    for key, senses in folded.items():
        if key in best:
            continue  # a name or synonym wins over a short form spelled the same
        automaton.add_word(f" {key} ", (len(key) + 2, len(entries)))
        entries.append(_Entry("", 9, tuple(senses)))
    if entries:
        automaton.make_automaton()
    cs_automaton = ahocorasick.Automaton()
    for form, senses in cs.items():
        cs_automaton.add_word(form, (len(form), tuple(senses)))
    if cs:
        cs_automaton.make_automaton()

    vocab_words = frozenset(w for key in best for w in key.split())
    abbreviation_words = frozenset(
        w for form in [*folded, *(matching_key(f) for f in cs)] for w in form.split()
    )
    known = vocab_words | common_words | abbreviation_words

    # Fuzzy targets: words of the names and synonyms as written (generated
    # variants such as plurals are left out: "koilocytoses" sits too close to
    # the ordinary "koilocytes"), and two-word names run together.
    primary = [k for k, (rank, _) in best.items() if rank < _KIND_RANK["variant"]]
    target_text: dict[str, str] = {}
    for key in primary:
        for w in key.split():
            if len(w) >= min_length - 2 and w.isalpha():
                target_text[w] = w
    for key in primary:
        parts = key.split()
        if len(parts) == 2 and all(p.isalpha() for p in parts):
            target_text.setdefault("".join(parts), key)
    primary_words = frozenset(w for key in primary for w in key.split())
    variant_words = vocab_words - primary_words - common_words - abbreviation_words
    split_heads_sets: dict[str, set[str]] = {}
    for t, text_of in target_text.items():
        if t != text_of or not t.isalpha():
            continue
        for k in range(_SPLIT_MIN_PART, len(t) - 1):
            head = t[:k]
            if head in vocab_words and head not in common_words and len(t) - k <= 4:
                split_heads_sets.setdefault(head, set()).add(t[k:])
    split_heads = {h: frozenset(v) for h, v in split_heads_sets.items()}
    # Candidates for a word of length n: targets within 2 letters of n that
    # share its first letter, plus those that share its last two (a slip seldom
    # hits both ends of a word; scanning every target would cost 10x more).
    by_first: dict[tuple[int, str], list[str]] = {}
    by_last: dict[tuple[int, str], list[str]] = {}
    for t in sorted(target_text):
        if (t.endswith("s") and t[:-1] in target_text) or (
            t.endswith("es") and t[:-2] in target_text
        ):
            # a plural ("carcinoids") only draws real words ("carcinosis") closer;
            # a misspelled plural still reaches its singular, or the plural itself
            # through the OCR path, which looks targets up exactly
            continue
        for n in range(len(t) - 2, len(t) + 3):
            by_first.setdefault((n, t[0]), []).append(t)
            by_last.setdefault((n, t[-2:]), []).append(t)
    # Multi-word names with one word left open: "squamous _ carcinoma" -> "cell".
    slots: dict[tuple[int, int, tuple[str, ...]], list[tuple[str, str]]] = {}
    slot_left: dict[tuple[str, str], set[str]] = {}
    slot_right: dict[tuple[str, str], set[str]] = {}
    for key in primary:
        name_words = key.split()
        if not 2 <= len(name_words) <= _SLOT_MAX_WORDS or not all(w.isalpha() for w in name_words):
            continue
        for i, w in enumerate(name_words):
            others = tuple(name_words[:i] + name_words[i + 1 :])
            if len(w) < _SLOT_MIN_LENGTH or max(map(len, others)) < _SLOT_MIN_LENGTH + 1:
                continue
            slots.setdefault((len(name_words), i, others), []).append((w, key))
            # only a neighbour of four or more letters is a test ("of", "in" are
            # beside every other word)
            before = name_words[i - 1] if i > 0 else ""
            after = name_words[i + 1] if i + 1 < len(name_words) else ""
            for end in (w[0], "-" + w[-1]):
                if len(before) >= _SLOT_MIN_LENGTH:
                    slot_left.setdefault((before, end), set()).add(w)
                if len(after) >= _SLOT_MIN_LENGTH:
                    slot_right.setdefault((after, end), set()).add(w)
    roots = onto.lookup(_LOOSE_ROOT)
    loose_targets, loose_by_first, loose_by_last = _loose_tables(
        [k for k in primary if any(onto.is_a(best[k][1], r) for r in roots)],
        {k: cid for k, (_, cid) in best.items()},
        frozenset(ambiguous),
    )
    join_ends = frozenset((t[:2], t[-2:]) for t in target_text)
    # the first and last three letters of the targets (a two-letter fragment is
    # compared with the first or last two)
    join_heads = frozenset(t[:3] for t in target_text) | frozenset(t[:2] for t in target_text)
    join_tails = frozenset(t[-3:] for t in target_text) | frozenset(t[-2:] for t in target_text)

    concept_words: dict[str, frozenset[str]] = {}
    for cid, term in onto.terms.items():
        words = set(cue_words(term.label))
        for syn in term.synonyms:
            if syn.type != "ABBREVIATION" and syn.scope != "BROAD":
                words |= cue_words(syn.text)
        for a in onto.ancestors(cid):
            words |= cue_words(onto.terms[a].label) if a in onto.terms else set()
        concept_words[cid] = frozenset(words)
    sense_cues: dict[Sense, frozenset[str]] = {}
    sense_lists: list[Sequence[Sense]] = [*cs.values(), *folded.values()]
    sense_lists += [e.choices for e in entries]
    for group in sense_lists:
        for s in group:
            cue = set(s.schemes)
            if s.concept_id:
                cue |= concept_words.get(s.concept_id, frozenset())
            sense_cues[s] = frozenset(cue)

    return _Index(
        automaton=automaton if entries else None,
        entries=entries,
        cs_automaton=cs_automaton if cs else None,
        cs_senses={k: tuple(v) for k, v in cs.items()},
        folded_senses={k: tuple(v) for k, v in folded.items()},
        key_concept={k: cid for k, (_, cid) in best.items()},
        labels={cid: t.label for cid, t in onto.terms.items()},
        depth=depth,
        concept_words=concept_words,
        sense_cues=sense_cues,
        vocab_words=vocab_words,
        known_words=known,
        variant_words=variant_words,
        split_heads=split_heads,
        targets_by_first=by_first,
        targets_by_last=by_last,
        target_text=target_text,
        join_ends=join_ends,
        join_heads=join_heads,
        join_tails=join_tails,
        ambiguous_keys={k: tuple(sorted(v)) for k, v in ambiguous.items()},
        slots=slots,
        slot_left={k: tuple(sorted(v)) for k, v in slot_left.items()},
        slot_right={k: tuple(sorted(v)) for k, v in slot_right.items()},
        slot_words=_slot_words(slot_left, slot_right),
        loose_targets=loose_targets,
        loose_by_first=loose_by_first,
        loose_by_last=loose_by_last,
        loose_words=frozenset(w for _, _, words in loose_targets.values() for w in words),
        loose_word_list=tuple(sorted({w for _, _, words in loose_targets.values() for w in words})),
        loose_anchors=frozenset(
            w
            for _, _, words in loose_targets.values()
            if len(words) > 1
            for w in words
            if len(w) >= _LOOSE_ANCHOR_MIN and w not in common_words
        ),
        loose_anchor_list=tuple(
            sorted(
                {
                    w
                    for _, _, words in loose_targets.values()
                    if len(words) > 1
                    for w in words
                    if len(w) >= _LOOSE_NEAR_ANCHOR and w not in common_words
                }
            )
        ),
        loose_heads=frozenset(t[:3] for t, (_, _, w) in loose_targets.items() if len(w) == 1),
        loose_tails=frozenset(t[-3:] for t, (_, _, w) in loose_targets.items() if len(w) == 1),
    )


def _loose_tables(
    primary: Sequence[str], concept_of: dict[str, str], ambiguous: frozenset[str]
) -> tuple[
    dict[str, tuple[str, str, tuple[str, ...]]],
    dict[tuple[int, str], tuple[str, ...]],
    dict[tuple[int, str], tuple[str, ...]],
]:
    """The names a loose reading may reach, by their letters run together.

    Names of two or more words need ten letters and a word of six or more (the
    word that must be found intact); single words need twelve letters.  A name
    two unrelated concepts share is left out (nothing nearby is weighed here).
    """
    targets: dict[str, tuple[str, str, tuple[str, ...]]] = {}
    for key in primary:
        words = tuple(key.split())
        if key in ambiguous or not all(w.isalpha() for w in words):
            continue
        letters = "".join(words)
        if len(words) == 1:
            if len(letters) < _LOOSE_SINGLE_MIN:
                continue
        elif len(letters) < _LOOSE_MIN_LETTERS or max(map(len, words)) < _LOOSE_ANCHOR_MIN:
            continue
        # "adeno carcinoma" and "adenocarcinoma" have the same letters: the
        # first (best-ranked) wording keeps them
        targets.setdefault(letters, (key, concept_of[key], words))
    by_first: dict[tuple[int, str], list[str]] = {}
    by_last: dict[tuple[int, str], list[str]] = {}
    for letters in sorted(targets):
        n = len(letters)
        tolerance = max(2, n // 6)  # a lost or doubled letter or three in a long name
        for m in range(n - tolerance, n + tolerance + 1):
            by_first.setdefault((m, letters[0]), []).append(letters)
            by_last.setdefault((m, letters[-2:]), []).append(letters)
    return (
        targets,
        {k: tuple(v) for k, v in by_first.items()},
        {k: tuple(v) for k, v in by_last.items()},
    )


def _slot_words(*tables: dict[tuple[str, str], set[str]]) -> dict[str, tuple[str, ...]]:
    by_end: dict[str, set[str]] = {}
    for table in tables:
        for (_, end), words in table.items():
            by_end.setdefault(end, set()).update(words)
    return {end: tuple(sorted(words)) for end, words in by_end.items()}


_INDEX_CACHE: dict[tuple[Any, ...], tuple[Ontology, AbbreviationDictionary, _Index]] = {}


def _index_for(
    onto: Ontology, abbreviations: AbbreviationDictionary, common: frozenset[str], min_length: int
) -> _Index:
    # Keyed by object identity; the cache holds the objects, so ids stay valid.
    key = (id(onto), getattr(onto, "digest", ""), id(abbreviations), hash(common), min_length)
    hit = _INDEX_CACHE.get(key)
    if hit is not None and hit[0] is onto and hit[1] is abbreviations:
        return hit[2]
    index = _build_index(onto, abbreviations, common, min_length)
    if len(_INDEX_CACHE) >= 8:
        _INDEX_CACHE.pop(next(iter(_INDEX_CACHE)))
    _INDEX_CACHE[key] = (onto, abbreviations, index)
    return index


# --------------------------------------------------------------------------- matching


# A candidate mention is a plain tuple, so that sorting is one C-level
# ``list.sort()``: the order is the overlap rule (longest first, then exact >
# abbreviation > fuzzy, then the deeper concept, then the earlier start).
#   (start - end, match rank, -depth, start, end, concept id, score, note)
_Cand = tuple[int, int, int, int, int, str, float, str]
_MATCH_NAMES = ("exact", "abbreviation", "fuzzy")


@dataclass(slots=True)
class _Correction:
    start: int  # in the matching text (padded)
    end: int
    replacement: str
    score: float
    written: str


class ConceptMatcher:
    """Finds ontology concepts in report text (exact, abbreviation, fuzzy).

    ``fuzzy_cutoff`` is the least rapidfuzz ``ratio`` (0-100) for a fuzzy
    correction; ``None`` turns fuzzy matching off (the loose reading too).
    ``loose_cutoff`` is the least ``ratio`` of a loose reading of a name;
    ``None`` turns that reading off.  ``fuzzy_min_length`` is the
    shortest word ever corrected.  ``scheme_name`` is the label scheme in use,
    which guides the choice among senses of a short form.  ``common_words``
    defaults to the shipped ``common_words.txt``.

    The automata are built once per (ontology, dictionary, options) and shared
    by every matcher built with the same objects.
    """

    def __init__(
        self,
        ontology: Ontology,
        abbreviations: AbbreviationDictionary | None = None,
        *,
        fuzzy_cutoff: float | None = FUZZY_CUTOFF,
        fuzzy_min_length: int = FUZZY_MIN_LENGTH,
        scheme_name: str | None = None,
        common_words: Collection[str] | None = None,
        loose_cutoff: float | None = LOOSE_CUTOFF,
    ) -> None:
        if fuzzy_cutoff is not None and not 0 <= fuzzy_cutoff <= 100:
            raise ConfigError(
                f"fuzzy_cutoff must be within 0-100, got {fuzzy_cutoff}; pass e.g. {FUZZY_CUTOFF}"
            )
        if loose_cutoff is not None and not 0 <= loose_cutoff <= 100:
            raise ConfigError(
                f"loose_cutoff must be within 0-100, got {loose_cutoff}; pass e.g. {LOOSE_CUTOFF}"
            )
        # the loose reading is a kind of fuzzy reading: off when fuzzy matching is
        self.loose_cutoff = loose_cutoff if fuzzy_cutoff is not None else None
        self.ontology = ontology
        self.abbreviations = abbreviations if abbreviations is not None else _empty_dictionary()
        self.fuzzy_cutoff = fuzzy_cutoff
        self.fuzzy_min_length = fuzzy_min_length
        self.scheme_name = scheme_name
        common = frozenset(common_words) if common_words is not None else _default_common_words()
        self._index = _index_for(ontology, self.abbreviations, common, fuzzy_min_length)
        self._fuzzy_cache: dict[str, tuple[str, float] | None] = {}
        # words known to be (or not to be) within reach of an open word of a name
        self._slot_yes: set[str] = set()
        self._slot_no: set[str] = set()
        self._worth_cache: dict[str, bool | None] = {}
        self._loose_kind_cache: dict[str, int] = {}
        self._loose_triggers: set[str] = set()
        self._loose_centres: set[str] = set()
        self._loose_cache: dict[tuple[str, ...], tuple[str, str, float] | None] = {}
        self._context_cache: dict[
            tuple[str, str, str, bool], tuple[int, str, float, str] | None
        ] = {}

    @property
    def known_words(self) -> frozenset[str]:
        """Vocabulary, short-form and common words (lower case)."""
        return self._index.known_words

    @property
    def ambiguous_keys(self) -> dict[str, tuple[str, ...]]:
        """Names/synonyms that unrelated concepts share (settled by context per mention)."""
        return self._index.ambiguous_keys

    # ------------------------------------------------------------------ public

    def find(
        self,
        text: str,
        norm: NormText | None = None,
        section_at: Callable[[int], str | None] | None = None,
        place: Callable[[int], tuple[str, str]] | None = None,
    ) -> list[Mention]:
        """Mentions in ``text``, sorted by start offset.

        ``norm`` is ``normalize(text)`` if the caller already has it;
        ``section_at(offset)`` gives the section kind at an original offset,
        used to choose among senses of a short form.  Mentions carry the
        default section and part, or ``place(start)``'s (section, part).
        """
        idx = self._index
        if norm is None:
            norm = normalize(text, known_words=idx.known_words)
        elif norm.original != text:
            raise InputError("norm was made from another text; pass normalize(text)")
        padded = f" {matching_text(norm.text)} "
        exact: list[_Cand] = []
        hits: list[tuple[int, int, tuple[Sense, ...]]] = []
        if idx.automaton is not None:
            entries = idx.entries
            raw = [(end, eid, end - klen + 1) for end, (klen, eid) in idx.automaton.iter(padded)]
            # the key spans [end - klen + 1, end - 1) of the normalised text
            spans = [(ns, end - 1) for end, _, ns in raw]
            if norm._maps:
                spans = norm.spans_to_original(spans)
            shared: list[tuple[int, int, _Entry]] = []
            for (_, eid, _), (s, e) in zip(raw, spans, strict=True):
                entry = entries[eid]
                if entry.senses:
                    hits.append((s, e, entry.senses))
                elif entry.choices:
                    shared.append((s, e, entry))
                else:
                    exact.append((s - e, 0, entry.neg_depth, s, e, entry.concept_id, 100.0, ""))
            if shared:
                exact += self._shared_names(text, shared, exact)
        if idx.cs_automaton is not None:
            n = len(text)
            for end, (klen, senses) in idx.cs_automaton.iter(text):
                s, e = end - klen + 1, end + 1
                if (s > 0 and text[s - 1].isalnum()) or (e < n and text[e].isalnum()):
                    continue
                hits.append((s, e, senses))
        found = exact + self._abbreviations(text, hits, exact, section_at)
        if self.fuzzy_cutoff is not None:
            found += self._fuzzy(norm, padded)
        return self._resolve(text, found, place)

    # ------------------------------------------------------------------ stages

    def _abbreviations(
        self,
        text: str,
        hits: list[tuple[int, int, tuple[Sense, ...]]],
        exact: list[_Cand],
        section_at: Callable[[int], str | None] | None,
    ) -> list[_Cand]:
        idx = self._index
        depth = idx.depth
        out: list[_Cand] = []
        defined: set[str] = set()  # folded short forms the report defines itself
        if "(" in text:
            for d in find_definitions(text, at=self._definition_sites(text, exact)):
                cid = self._concept_of_long_form(d.short, d.long, d.long_start, d.long_end, exact)
                defined.add(d.short.casefold())
                if not cid:
                    continue  # defined as something that is no concept: read nothing
                note = f"{d.short}: defined in this report as '{d.long}'"
                for s in _whole_token_starts(text, d.short):
                    e = s + len(d.short)
                    out.append((s - e, 1, -depth.get(cid, 0), s, e, cid, 100.0, note))
        near = _Near(exact)
        for s, e, senses in hits:
            written = text[s:e]
            if defined and written.casefold() in defined:
                continue  # the report's own definition decides
            if len(senses) == 1:
                sense, note = senses[0], ""  # one sense: contexts are only preferences
            else:
                choice = choose_sense(
                    written,
                    senses,
                    scheme=self.scheme_name,
                    section=section_at(s) if section_at is not None else None,
                    neighbours=self._neighbours(text, s, e, near),
                    cues=idx.sense_cues,
                )
                if choice is None:
                    continue
                sense, note = choice.sense, choice.note
            cid = sense.concept_id
            if not cid or cid not in idx.labels:
                # the sense names no concept (or an id this ontology lacks, which
                # the dictionary checker reports): the short form yields nothing
                continue
            out.append((s - e, 1, -depth.get(cid, 0), s, e, cid, 100.0, note))
        return out

    def _shared_names(
        self, text: str, shared: list[tuple[int, int, _Entry]], exact: list[_Cand]
    ) -> list[_Cand]:
        """Settle names two concepts share ("acinar adenocarcinoma": prostate or lung)."""
        depth = self._index.depth
        out: list[_Cand] = []
        cues = self._index.sense_cues
        near = _Near(exact)
        for s, e, entry in shared:
            written = text[s:e]
            near_words = self._neighbours(text, s, e, near)
            choice = choose_sense(written, entry.choices, neighbours=near_words, cues=cues)
            if (choice is None or choice.tied) and self.scheme_name:
                # nothing nearby decides: let the scheme's name speak for the organ
                by_scheme = choose_sense(
                    written, entry.choices, neighbours={self.scheme_name}, cues=cues
                )
                if by_scheme is not None and not by_scheme.tied:
                    choice = Choice(
                        by_scheme.sense,
                        by_scheme.score,
                        f"{written}: chose '{by_scheme.sense.expansion}' by scheme "
                        f"{self.scheme_name} over "
                        + ", ".join(
                            f"'{c.expansion}'" for c in entry.choices if c is not by_scheme.sense
                        ),
                    )
            cid = choice.sense.concept_id if choice else entry.concept_id
            note = choice.note if choice else ""
            out.append((s - e, 0, -depth.get(cid, 0), s, e, cid, 100.0, note))
        return out

    def _definition_sites(self, text: str, exact: list[_Cand]) -> list[int]:
        """The "(" worth the definition search: a definition there would matter.

        It matters when a concept name ends right before the "(" ("hyperplastic
        polyp (HP)") or inside it ("HP (hyperplastic polyp)"), or when the
        parenthesis holds a known short form (the report may redefine it).
        """
        idx = self._index
        ends = {c[4] for c in exact}
        sites = []
        at = text.find("(")
        while at >= 0:
            before = at
            while before > 0 and text[before - 1].isspace():
                before -= 1
            close = text.find(")", at)
            inner = text[at + 1 : close].strip() if close > at else ""
            if (
                before in ends
                or (close > at and at + 1 + len(text[at + 1 : close].rstrip()) in ends)
                or inner in idx.cs_senses
                or (0 < len(inner) <= 12 and matching_key(inner) in idx.folded_senses)
            ):
                sites.append(at)
            at = text.find("(", at + 1)
        return sites

    def _concept_of_long_form(
        self, short: str, long: str, start: int, end: int, exact: list[_Cand]
    ) -> str:
        idx = self._index
        key = matching_key(long)
        cid = idx.key_concept.get(key)
        if cid:
            return cid
        # the longest exact mention that ends the long form ("a new ... adenoma")
        inside = [c for c in exact if start <= c[3] and c[4] == end]
        if inside:
            return min(inside)[5]
        for s in self.abbreviations.senses_for(short):
            if s.concept_id and matching_key(s.expansion) == key:
                return s.concept_id
        return ""

    def _neighbours(self, text: str, s: int, e: int, near: _Near) -> set[str]:
        lo, hi = max(0, s - 80), min(len(text), e + 80)
        words = set(window_words(text[lo:s] + " " + text[e:hi]))
        concept_words = self._index.concept_words
        for _, _, cid in near.overlapping(lo, hi):
            words |= concept_words.get(cid, frozenset())
        return words

    def _fuzzy(self, norm: NormText, padded: str) -> list[_Cand]:
        idx = self._index
        distinct = set(padded.split())
        unknown = distinct - idx.known_words
        in_context = self._slot_corrections(padded, distinct - idx.vocab_words)
        if (
            not unknown
            and not in_context
            and distinct.isdisjoint(idx.variant_words)
            and distinct.isdisjoint(idx.split_heads)
        ):
            return []
        loose = self._loose(norm, padded, distinct, unknown) if unknown else []
        corrections: list[_Correction] = self._known_splits(padded, distinct)
        for word in unknown | (distinct & idx.variant_words):
            single = self._worth_correcting(word)
            if single is None:
                continue  # nothing this word could become: skip finding it
            # every word of the padded matching text has a space on each side
            needle = f" {word} "
            at = padded.find(needle)
            while at >= 0:
                c = self._correct_at(padded, at + 1, at + 1 + len(word), single)
                if c is not None:
                    corrections.append(c)
                at = padded.find(needle, at + len(word) + 1)
        corrections += in_context
        if not corrections:
            return loose
        # keep the best correction where two overlap
        corrections.sort(key=lambda c: (-c.score, -(c.end - c.start), c.start))
        kept: list[_Correction] = []
        for c in corrections:
            if all(c.end <= k.start or c.start >= k.end for k in kept):
                kept.append(c)
        kept.sort(key=lambda c: c.start)
        return self._rematch(norm, padded, kept) + loose

    def _known_splits(self, padded: str, distinct: set[str]) -> list[_Correction]:
        """A name's word split into two known words ("squamo us" -> "squamous").

        The first half is a known fragment that is no common word (``split_heads``:
        "squamo", of "squamo-columnar"), the second the exact rest of the word,
        across a single space.  Two common words never join ("a typical" stays).
        """
        heads = self._index.split_heads
        out: list[_Correction] = []
        for head in distinct.intersection(heads):
            ends = heads[head]
            if ends.isdisjoint(distinct):
                continue  # the usual case: "lymph" is here, "oma" is not
            needle = f" {head} "
            at = padded.find(needle)
            while at >= 0:
                s = at + 1
                e = s + len(head)
                nxt_end = padded.find(" ", e + 1)
                nxt = padded[e + 1 : nxt_end] if nxt_end > e + 1 else ""
                if nxt in ends:
                    out.append(_Correction(s, nxt_end, head + nxt, 100.0, f"{head} {nxt}"))
                at = padded.find(needle, e)
        return out

    # ------------------------------------------------------------------ loose names

    def _loose(
        self, norm: NormText, padded: str, distinct: set[str], unknown: set[str]
    ) -> list[_Cand]:
        """Names wrecked in more than one word, read from windows around unknown words.

        Every window of one to five words that holds an unknown word and a word
        of a name (or starts and ends like a single-word name), with at most one
        punctuation mark between two words, is compared letters-only ("squamous
        ceij, carcinoma" -> "squamousceijcarcinoma") with the names of
        :func:`_loose_tables`; :meth:`_loose_name` says which name, if any, it
        reads as.  Where accepted windows overlap, the longer name wins, then the
        better score.  The candidates are made here (the name is known whole),
        with match "fuzzy" and the usual note.  Only the words around words of
        names are looked at, so a long report of OCR noise costs little more
        than its words of names.
        """
        idx = self._index
        cutoff = self.loose_cutoff
        if cutoff is None or not idx.loose_targets:
            return []
        kinds = self._loose_kind_cache
        if len(kinds) > 100_000:
            # bounded memory on long runs of OCR noise
            kinds.clear()
            self._loose_triggers.clear()
            self._loose_centres.clear()
        # each word is weighed once (set operations: only new words cost Python)
        for w in distinct.difference(kinds):
            self._loose_kind(w)
        # a window needs an unknown word: most reports have none that could be one
        triggers = distinct & self._loose_triggers
        if not triggers:
            return []
        kind_of = kinds
        tails = idx.loose_tails
        centres = distinct & self._loose_centres
        seen: set[tuple[int, int]] = set()
        accepted: list[tuple[int, float, int, int, str, str, str]] = []
        cache = self._loose_cache
        reach = _LOOSE_MAX_TOKENS - 1
        for centre in centres:
            needle = f" {centre} "
            at = padded.find(needle)
            while at >= 0:
                s0, e0 = at + 1, at + 1 + len(centre)
                at = padded.find(needle, e0)
                toks = _words_around(padded, s0, e0, reach, kind_of)
                c = next(k for k, t in enumerate(toks) if t[0] == s0)
                if not any(kind_of[t[2]] & _TRIGGER for t in toks):
                    continue
                # around a word of a name, every window holding it; from the
                # start of a single-word name, the windows that end like one
                anchor = kind_of[centre] & _ANCHOR
                for a in range(c + 1) if anchor else (c,):
                    for b in range(c, min(len(toks), a + _LOOSE_MAX_TOKENS)):
                        if not anchor and toks[b][2][-3:] not in tails:
                            continue
                        span = (toks[a][0], toks[b][1])
                        if span in seen:
                            continue
                        seen.add(span)
                        window = tuple(t[2] for t in toks[a : b + 1])
                        if not any(kind_of[w] & _TRIGGER for w in window):
                            continue
                        if window in cache:
                            found = cache[window]
                        else:
                            found = self._loose_name(window, cutoff)
                            if len(cache) > 50_000:
                                cache.clear()
                            cache[window] = found
                        if found is not None:
                            key, cid, score = found
                            written = padded[span[0] : span[1]]
                            accepted.append((-len(key), -score, *span, key, cid, written))
        if not accepted:
            return []
        accepted.sort()
        depth = idx.depth
        taken: list[tuple[int, int]] = []
        out: list[_Cand] = []
        for _, neg_score, s, e, key, cid, written in accepted:
            if any(s < te and e > ts for ts, te in taken):
                continue
            taken.append((s, e))
            os_, oe = norm.to_original(s - 1, e - 1)
            score = -neg_score
            note = f"fuzzy: '{written}' read as '{key}' (score {score:.0f})"
            out.append((os_ - oe, 2, -depth.get(cid, 0), os_, oe, cid, score, note))
        return out

    def _loose_kind(self, word: str) -> int:
        """What a word may be in a loose reading: bits ``_TRIGGER``, ``_ANCHOR``, ``_BLOCKED``.

        * trigger: an unknown word with letters and two digits at most (a window
          must hold one);
        * anchor: a distinctive word of a name (``_Index.loose_anchors``), a word
          beginning or ending with one ("scellcarcinoma"), or one letter off one
          of seven letters or more ("squamoas");
        * blocked: a known word that is no word of a name nor one letter off one
          ("no", "the", "small" beside "squamous"): no window holds it, as
          :meth:`_loose_fits` would refuse any that did.

        Cached across reports: the same words recur.
        """
        cache = self._loose_kind_cache
        kind = cache.get(word)
        if kind is not None:
            return kind
        idx = self._index
        kind = 0
        if len(word) > _LOOSE_WORD_MAX:
            # a run of letters this long is noise, no name's words run together
            # (and the prefix test below would copy it once per letter)
            cache[word] = kind
            return kind
        folded = word.translate(_SLOT_DIGITS)
        anchors = idx.loose_anchors
        n = len(folded)
        if (
            folded in anchors
            or any(
                folded[:k] in anchors or folded[n - k :] in anchors
                for k in range(_LOOSE_ANCHOR_MIN, n)
            )
            or (
                n >= _LOOSE_NEAR_ANCHOR - 1
                and folded.isalpha()
                and process.extractOne(
                    folded, idx.loose_anchor_list, scorer=Levenshtein.distance, score_cutoff=1
                )
                is not None
            )
        ):
            kind |= _ANCHOR
        if word in idx.known_words:
            if (
                n > 1
                and word not in idx.loose_words
                and process.extractOne(
                    word, idx.loose_word_list, scorer=Levenshtein.distance, score_cutoff=1
                )
                is None
            ):
                kind |= _BLOCKED
        elif n <= 40 and any(c.isalpha() for c in word) and sum(map(str.isdigit, word)) <= 2:
            kind |= _TRIGGER
        cache[word] = kind  # bounded in _loose
        if kind & _TRIGGER:
            self._loose_triggers.add(word)
        if not kind & _BLOCKED and (
            kind & _ANCHOR or (kind & _TRIGGER and word[:3] in idx.loose_heads)
        ):
            # a window is built around it: a word of a name, or the start of a
            # single-word name
            self._loose_centres.add(word)
        return kind

    def _loose_name(self, window: tuple[str, ...], cutoff: float) -> tuple[str, str, float] | None:
        """(key, concept id, score) the words of ``window`` read as, or None.

        The letters of the window (digits OCR makes of letters read as those
        letters) are compared with the names of about the same length that
        share their first letter or their last two; the best name at or above
        ``cutoff`` that passes :meth:`_loose_fits` is taken, unless a name of
        an unrelated concept comes within ``_LOOSE_MARGIN`` of it, or the window
        spells a name of an unrelated concept exactly, or the window is a
        negation glued to the name.
        """
        idx = self._index
        # digits are read as letters in a word, never in a number ("5", "12")
        folded = tuple(
            w if w.isdigit() and len(w) < 3 else w.translate(_SLOT_DIGITS) for w in window
        )
        letters = "".join(folded)
        n = len(letters)
        if n < _LOOSE_MIN_LETTERS or not letters.isalpha():
            return None
        # the name starts with the window's first letter (see _loose_fits)
        choices = idx.loose_by_first.get((n, letters[0]))
        if not choices:
            return None
        hits = process.extract(
            letters,
            choices,
            scorer=fuzz.ratio,
            score_cutoff=cutoff - _LOOSE_MARGIN,
            limit=8,
        )
        best: tuple[str, float] | None = None
        for target, score, _ in hits:
            if score < cutoff:
                break
            if self._loose_fits(window, folded, letters, target, score):
                best = (target, score)
                break
        if best is None:
            return None
        key, cid, _ = idx.loose_targets[best[0]]
        onto = self.ontology
        # names of other concepts ending like the window count too ("a squamoas
        # cell carcinoma" is as near "squamous cell carcinoma" as "adenosquamous ...")
        hits += process.extract(
            letters,
            idx.loose_by_last.get((n, letters[-2:]), ()),
            scorer=fuzz.ratio,
            score_cutoff=best[1] - _LOOSE_MARGIN,
            limit=8,
        )
        for target, score, _ in hits:
            other = idx.loose_targets[target][1]
            if score > best[1] - _LOOSE_MARGIN and not (
                onto.is_a(cid, other) or onto.is_a(other, cid)
            ):
                return None  # too close to call between two unrelated names
        if idx.automaton is not None:
            for _, (_, eid) in idx.automaton.iter(f" {' '.join(folded)} "):
                entry = idx.entries[eid]
                other = entry.concept_id
                if other and not entry.senses and not onto.is_a(cid, other):
                    return None  # "small cell carcinoma" is never read as another name
        if _glued_negation(" ".join(folded), key):
            return None
        return key, cid, round(best[1], 1)

    def _loose_fits(
        self,
        window: tuple[str, ...],
        folded: tuple[str, ...],
        letters: str,
        target: str,
        score: float,
    ) -> bool:
        """The guards of a loose reading of ``window`` as the name spelled ``target``.

        * a single-word name: the window's letters start and end as it does
          ("adenocerxinoma" -> "adenocarcinoma");
        * a name of several words: one of its words of six or more letters that
          is no common word ("carcinoma", not "small") is borne by a word of the
          window (:func:`_bears`: "scellcarcinoma", "squamoas"), and the
          window starts with the name's first letter;
        * every known word of the window (but a lone letter) is a word of the
          name or one or two letters off one ("call" for "cell"): a negation, an
          ordinary word or a word of another name in the window forbids the
          reading;
        * a short word of the name (three letters or fewer) is in the window;
        * word for word, each word of the window is a misreading of the name's
          word (:func:`_misread_as`), and no long word of the name is missing;
        * what the name's intact words leave over is spelled, roughly, by the
          other words of the window (ratio ``_LOOSE_RESIDUE`` or more);
        * both end words are needed: without either the window reads no worse
          (no "squamous cell carcinoma xq" when "squamous cell carcinoma" is there).
        """
        idx = self._index
        words = idx.loose_targets[target][2]
        if len(words) == 1:
            if letters[:2] != target[:2] or letters[-2:] != target[-2:]:
                return False
        else:
            if letters[0] != target[0]:
                return False
            anchors = [w for w in words if w in idx.loose_anchors]
            if not any(_bears(f, a) for f in folded for a in anchors):
                return False
        # a short word of the name ("in", "of", "no", "nos") is written out, never guessed
        if any(len(w) <= 3 and w not in window for w in words):
            return False
        # the damaged words read as the rest of the name: what the intact words of
        # the name leave over is spelled, roughly, by the words that are no words
        # of it ("tcga ej" is no "specimen")
        intact = set(words) & set(folded)
        if intact:
            rest_name = "".join(w for w in words if w not in intact)
            rest_window = "".join(f for f in folded if f not in intact)
            if fuzz.ratio(rest_window, rest_name) < _LOOSE_RESIDUE:
                return False
        if len(folded) == len(words):
            # word for word: a short word of the name is read from a word one letter
            # off, or two sharing its first or last two letters ("toll", "ceij" for
            # "cell", never "clin" for "colon"); a long one within a third of it
            for f, w in zip(folded, words, strict=True):
                if f != w and not _misread_as(f, w):
                    return False
        # every word of four letters or more of the name is read from the window:
        # without it the name would match no worse ("well differentiated
        # adenocarcinoma" is no "well differentiated fetal adenocarcinoma")
        for k, w in enumerate(words):
            if (
                len(w) >= 4
                and w not in folded
                and len(words) > 1
                and fuzz.ratio(letters, "".join(words[:k] + words[k + 1 :])) >= score
            ):
                return False
        # two pieces that join into another word are that word ("carci noma
        # neoplasm" is no "carcinoid neoplasm")
        vocab = idx.vocab_words
        for a, b in pairwise(folded):
            if a + b in vocab and a + b not in words:
                return False
        known = idx.known_words
        for w in window:
            # a lone letter is a fragment ("c~cinoma"), never a negation or a name
            if len(w) > 1 and w in known and w not in words and not _near_word(w, words, 1):
                return False
        if len(folded) > 1:
            for rest in (folded[1:], folded[:-1]):
                if fuzz.ratio("".join(rest), target) >= score:
                    return False
        return True

    def _worth_correcting(self, word: str) -> bool | None:
        """None: an unknown word nothing could become; else whether it may stand alone.

        A word of ``fuzzy_min_length`` letters or more (not a number) may be
        corrected alone; a fragment of a split word starts or ends some vocabulary
        word.  Cached across reports: the same unknown words recur.
        """
        cache = self._worth_cache
        if word in cache:
            return cache[word]
        single = len(word) >= self.fuzzy_min_length and not word.isdigit()
        idx = self._index
        joinable = (
            len(word) >= 2
            and word.isalpha()
            and (word[:3] in idx.join_heads or word[-3:] in idx.join_tails)
        )
        found = single if joinable or (single and self._closest(word) is not None) else None
        if len(cache) > 50_000:
            cache.clear()
        cache[word] = found
        return found

    def _slot_corrections(self, padded: str, candidates: set[str]) -> list[_Correction]:
        """Misread words inside a multi-word name whose other words are written right.

        A word that is no vocabulary word ("call", "toll", "squamcus", "0e11") is
        read as the open word of a name when the words around it spell the rest
        of that name exactly and it is within one letter of the open word (two
        for words of seven letters or more) sharing its first or last letter:
        "squamous call carcinoma" -> "squamous cell carcinoma".  Only words
        separated by single spaces (no punctuation) make a name.
        """
        idx = self._index
        if not idx.slots:
            return []
        # Most words are no open word's near miss: settle that once per word (cached
        # across reports) and skip the walk over the text when no word can be one.
        # The test is implied by the one below, so it changes no answer.
        yes, no = self._slot_yes, self._slot_no
        for w in candidates - yes - no:  # set operations: only new words cost Python
            (yes if self._slot_plausible(w) else no).add(w)
        if len(yes) + len(no) > 100_000:
            yes.clear()  # bounded memory on long runs of OCR noise
            no.clear()
        open_words = candidates & yes
        if not open_words:
            return []
        out: list[_Correction] = []
        by_left, by_right = idx.slot_left, idx.slot_right
        # Every word of the padded text has a space on each side; a double space
        # stands for punctuation, so an empty neighbour means none in a name.
        for word in open_words:
            needle = f" {word} "
            at = padded.find(needle)
            while at >= 0:
                start, end = at + 1, at + 1 + len(word)
                left = padded[padded.rfind(" ", 0, at) + 1 : at]
                right_end = padded.find(" ", end + 1)
                right = padded[end + 1 : right_end] if right_end >= 0 else padded[end + 1 :]
                at = padded.find(needle, end)
                folded = word.translate(_SLOT_DIGITS)
                # a name needs a word of it right beside the open word, sharing the
                # open word's first or last letter
                head, tail = folded[0], "-" + folded[-1]
                near = (
                    *by_left.get((left, head), ()),
                    *by_left.get((left, tail), ()),
                    *by_right.get((right, head), ()),
                    *by_right.get((right, tail), ()),
                )
                if not near:
                    continue
                reach = _slot_reach(folded)
                if any(Levenshtein.distance(folded, t, score_cutoff=reach) <= reach for t in near):
                    c = self._slot_at(padded, start, end)
                    if c is not None:
                        out.append(c)
        out.sort(key=lambda c: c.start)
        return out

    def _slot_plausible(self, word: str) -> bool:
        """Whether ``word`` is within reach of some open word sharing its first or last letter."""
        if len(word) < _SLOT_MIN_LENGTH - 1:
            return False
        folded = word.translate(_SLOT_DIGITS)
        if not folded.isalpha():
            return False
        reach = _slot_reach(folded)
        by_end = self._index.slot_words
        near = by_end.get(folded[0], ()) + by_end.get("-" + folded[-1], ())
        return near != () and (
            process.extractOne(folded, near, scorer=Levenshtein.distance, score_cutoff=reach)
            is not None
        )

    def _slot_at(self, padded: str, s: int, e: int) -> _Correction | None:
        """The best name the word at ``padded[s:e]`` completes with its neighbours."""
        idx = self._index
        word = padded[s:e]
        folded = word.translate(_SLOT_DIGITS)
        reach = _slot_reach(folded)
        # up to three words either side, stopping at punctuation (a double space)
        before: list[tuple[int, str]] = []
        pos = s - 1
        while len(before) < _SLOT_MAX_WORDS - 1 and pos > 0 and padded[pos - 1] != " ":
            start = padded.rfind(" ", 0, pos) + 1
            before.insert(0, (start, padded[start:pos]))
            pos = start - 1
        after: list[tuple[int, str]] = []
        pos = e + 1
        while len(after) < _SLOT_MAX_WORDS - 1 and pos < len(padded) and padded[pos] != " ":
            end = padded.find(" ", pos)
            end = len(padded) if end < 0 else end
            after.append((end, padded[pos:end]))
            pos = end + 1
        best: _Correction | None = None
        for k in range(2, _SLOT_MAX_WORDS + 1):
            for i in range(k):
                if i > len(before) or k - 1 - i > len(after):
                    continue
                left = before[len(before) - i :]
                right = after[: k - 1 - i]
                others = tuple(w for _, w in left) + tuple(w for _, w in right)
                for target, key in idx.slots.get((k, i, others), ()):
                    if target[0] != folded[0] and target[-1] != folded[-1]:
                        continue
                    if Levenshtein.distance(folded, target, score_cutoff=reach) > reach:
                        continue
                    start = left[0][0] if left else s
                    end = right[-1][0] if right else e
                    written = padded[start:end]
                    score = round(fuzz.ratio(written, key), 1)
                    if best is None or (score, end - start) > (best.score, best.end - best.start):
                        best = _Correction(start, end, key, score, written)
        return best

    def _correct_at(self, padded: str, s: int, e: int, single: bool) -> _Correction | None:
        """The best correction of the unknown word at ``padded[s:e]`` (maybe with a neighbour).

        Joins are only tried across a single separator: "car.cinoma" or "adeno
        carcinoma", never across ", ".  The answer depends on the word and its
        two neighbours only, so it is cached on them.
        """
        word = padded[s:e]
        nxt_end = padded.find(" ", e + 1)
        nxt = padded[e + 1 : nxt_end] if nxt_end > e + 1 else ""
        prev_start = padded.rfind(" ", 0, s - 1) + 1 if s >= 2 else s
        prev = padded[prev_start : s - 1] if prev_start < s - 1 else ""
        key = (prev, word, nxt, single)
        cache = self._context_cache
        if key in cache:
            found = cache[key]
        else:
            found = self._correct_words(prev, word, nxt, single)
            if len(cache) > 50_000:
                cache.clear()
            cache[key] = found
        if found is None:
            return None
        side, replacement, score, written = found
        if side < 0:
            return _Correction(prev_start, e, replacement, score, written)
        if side > 0:
            return _Correction(s, nxt_end, replacement, score, written)
        return _Correction(s, e, replacement, score, written)

    def _correct_words(
        self, prev: str, word: str, nxt: str, single: bool
    ) -> tuple[int, str, float, str] | None:
        """(side, replacement, score, written): side -1 joins ``prev``, +1 joins ``nxt``."""
        options: list[tuple[float, int, int, str, str]] = []  # score, length, side, ...
        if single:
            hit = self._closest(word)
            if hit is not None:
                options.append((hit[1], len(word), 0, hit[0], word))
        if word.isalpha():
            if nxt:
                joined = self._closest_join(word, nxt)
                if joined is not None:
                    written = f"{word} {nxt}"
                    options.append((joined[1], len(written), 1, joined[0], written))
            if prev:
                joined = self._closest_join(prev, word)
                if joined is not None:
                    written = f"{prev} {word}"
                    options.append((joined[1], len(written), -1, joined[0], written))
        options = [o for o in options if not _glued_negation(o[4], o[3])]
        if not options:
            return None
        score, _, side, replacement, written = max(options)
        return side, replacement, score, written

    def _closest_join(self, first: str, second: str) -> tuple[str, float] | None:
        if len(second) < 2 or not second.isalpha() or not first.isalpha():
            return None
        joined = first + second
        if len(first) < 2:
            # a lone letter split off a word ("C ARCINOMA") joins an unknown rest
            # only, spelling a word exactly: "a typical" never becomes "atypical"
            if second in self._index.known_words:
                return None
            replacement = self._index.target_text.get(joined)
            return (replacement, 100.0) if replacement is not None else None
        if len(joined) < self.fuzzy_min_length:
            return None
        idx = self._index
        if (joined[:2], joined[-2:]) not in idx.join_ends:
            return None  # both halves must carry the target: its ends are theirs
        known = idx.known_words
        if first in known or second in known:
            # a real word plus a fragment must spell the form exactly: "adeno
            # carcinoma" yes, "carcinoma id" -> "carcinoid" no
            replacement = idx.target_text.get(joined)
            return (replacement, 100.0) if replacement is not None else None
        hit = self._closest(joined)
        if hit is None:
            return None
        target = hit[0].replace(" ", "")
        return hit if (target[:2], target[-2:]) == (joined[:2], joined[-2:]) else None

    def _closest(self, word: str) -> tuple[str, float] | None:
        """(replacement text, score) of the closest vocabulary form, or None."""
        cache = self._fuzzy_cache
        if word in cache:
            return cache[word]
        result = self._closest_uncached(word)
        if len(cache) > 50_000:
            cache.clear()
        cache[word] = result
        return result

    def _closest_uncached(self, word: str) -> tuple[str, float] | None:
        idx = self._index
        cutoff = self.fuzzy_cutoff if self.fuzzy_cutoff is not None else 100.0
        if word in idx.target_text:
            # two vocabulary words run together ("tubularadenoma")
            replacement = idx.target_text[word]
            return replacement, fuzz.ratio(word, replacement)
        if sum(map(str.isdigit, word)) > 2:
            return None  # a code or a number with letters, not a misspelled word
        split = self._run_together(word)
        if split is not None:
            return split, fuzz.ratio(word, split)
        n = len(word)
        choices = idx.targets_by_first.get((n, word[0]), []) + idx.targets_by_last.get(
            (n, word[-2:]), []
        )
        if not choices:
            return None
        # One OCR confusion costs at most two letters, which keeps the plain
        # ratio of a word of six or more letters at or above 70: below that,
        # undoing confusions cannot reach a vocabulary word and is not tried.
        hit = process.extractOne(word, choices, scorer=fuzz.ratio, score_cutoff=_OCR_FLOOR)
        if hit is None:
            return None
        if cutoff <= _OCR_SCORE:
            for variant in _ocr_variants(word):
                if variant in idx.target_text:
                    return idx.target_text[variant], _OCR_SCORE
        if hit[1] < cutoff and len(word) >= _TWO_SLIPS_MIN_WORD:
            # a long word two letters off one vocabulary word, and three off any
            # other ("aaenocarcinomo", "adenocarc1nomo"): a slip at each of two
            # places, which a ratio cut-off made for short words refuses
            folded = word.translate(_SLOT_DIGITS)
            if folded.isalpha():
                slips = process.extract(
                    folded, set(choices), scorer=Levenshtein.distance, score_cutoff=3, limit=3
                )
                two = [t for t, d, _ in slips if d <= 2]
                if len(two) == 1 and _two_apart_slips(folded, two[0]):
                    return idx.target_text[two[0]], round(fuzz.ratio(folded, two[0]), 1)
        if hit[1] < cutoff:
            # a long word with one glyph run undone ("adeuocarcinorna": "rn" -> "m"),
            # then a slip within the cut-off: the run costs nothing, the slip its
            # ratio.  Only runs of two glyphs read as one letter, and only in words
            # of nine letters or more: a single-letter swap in a short word
            # ("focality", "corion") comes too close to other words.
            if len(word) < _OCR_RUN_MIN_WORD:
                return None
            best: tuple[str, float] | None = None
            for variant in _ocr_variants(word, _OCR_RUNS):
                n = len(variant)
                near_v = idx.targets_by_first.get((n, variant[0]), []) + idx.targets_by_last.get(
                    (n, variant[-2:]), []
                )
                v_hit = process.extractOne(variant, near_v, scorer=fuzz.ratio, score_cutoff=cutoff)
                if v_hit is not None and (best is None or v_hit[1] > best[1]):
                    best = (v_hit[0], float(v_hit[1]))
            if best is None:
                return None
            return idx.target_text[best[0]], best[1]
        return idx.target_text[hit[0]], float(hit[1])

    def _run_together(self, word: str) -> str | None:
        """Two vocabulary words written as one ("cellcarcinoma" -> "cell carcinoma").

        Both parts must be words of names or synonyms of four letters or more; the
        longest first part wins.  Only a word that is no known word gets here, and
        the corrected text must then spell a name for a mention to come of it.
        """
        if not word.isalpha() or not 2 * _SPLIT_MIN_PART <= len(word) <= _LOOSE_WORD_MAX:
            return None  # (a longer run of letters is noise: each split would copy it)
        vocab = self._index.vocab_words
        for i in range(len(word) - _SPLIT_MIN_PART, _SPLIT_MIN_PART - 1, -1):
            if word[:i] in vocab and word[i:] in vocab:
                return f"{word[:i]} {word[i:]}"
        return None

    def _rematch(self, norm: NormText, padded: str, corrections: list[_Correction]) -> list[_Cand]:
        """Match the corrected text again; keep matches that use a correction."""
        idx = self._index
        pieces: list[str] = []
        spans: list[tuple[int, int, _Correction]] = []  # corrected-text span of each correction
        pos = 0
        length = 0
        for c in corrections:
            pieces.append(padded[pos : c.start])
            length += c.start - pos
            spans.append((length, length + len(c.replacement), c))
            pieces.append(c.replacement)
            length += len(c.replacement)
            pos = c.end
        pieces.append(padded[pos:])
        corrected = "".join(pieces)

        # corrections do not overlap, so their spans are sorted by start and by end
        span_starts = [a for a, _, _ in spans]
        span_ends = [b for _, b, _ in spans]

        def to_padded(i: int, as_end: bool) -> int:
            k = bisect_left(span_starts, i) if as_end else bisect_right(span_starts, i)
            if k == 0:
                return i
            _, b, c = spans[k - 1]
            if i < b or (as_end and i == b):
                return c.end if as_end else c.start
            return i + c.end - b

        out: list[_Cand] = []
        for end, (klen, eid) in idx.automaton.iter(corrected):
            entry = idx.entries[eid]
            if entry.senses:
                continue
            cs, ce = end - klen + 2, end  # the key inside the padding
            touched = spans[bisect_right(span_ends, cs) : bisect_left(span_starts, ce)]
            used = [c for _, _, c in touched]
            if not used or any(cs > a or ce < b for a, b, _ in touched):
                # a correction is used whole or not at all: "malignancy" inside
                # the replacement "no malignancy" is no reading of the words
                continue
            ps, pe = to_padded(cs, False), to_padded(ce, True)
            s, e = norm.to_original(ps - 1, pe - 1)
            score = min(c.score for c in used)
            note = "; ".join(
                f"fuzzy: '{c.written}' read as '{c.replacement}' (score {c.score:.0f})"
                for c in used
            )
            out.append((s - e, 2, entry.neg_depth, s, e, entry.concept_id, round(score, 1), note))
        return out

    def _resolve(
        self,
        text: str,
        found: list[_Cand],
        place: Callable[[int], tuple[str, str]] | None = None,
    ) -> list[Mention]:
        """Longest first, then exact > abbreviation > fuzzy, then the deeper concept."""
        labels = self._index.labels
        found.sort()
        taken = bytearray(len(text) + 1)
        kept: list[_Cand] = []
        for c in found:
            s, e = c[3], c[4]
            if e <= s or taken.find(1, s, e) != -1:
                continue
            if _joins_two_sentences(text, s, e, found):
                continue
            taken[s:e] = b"\x01" * (e - s)
            kept.append(c)
        kept.sort(key=lambda c: c[3])
        if place is not None:
            return [
                Mention(
                    cid, labels.get(cid, cid), text[s:e], s, e, *place(s), _MATCH_NAMES[r], sc, nt
                )
                for _, r, _, s, e, cid, sc, nt in kept
            ]
        return [
            Mention(
                cid, labels.get(cid, cid), text[s:e], s, e, "other", "", _MATCH_NAMES[r], sc, nt
            )
            for _, r, _, s, e, cid, sc, nt in kept
        ]

    # ------------------------------------------------------------------ introspection

    def fuzzy_correction(self, word: str) -> tuple[str, float] | None:
        """What a single unknown word would be corrected to, ignoring the common-word filter.

        For calibration and tests: ``(replacement, score)`` or None.
        """
        w = matching_key(word)
        if len(w) < self.fuzzy_min_length or " " in w:
            return None
        return self._closest(w)


class _Near:
    """Exact candidates by start, for "which mentions overlap [lo, hi)" in log time.

    A report of megabytes has tens of thousands of mentions and short forms; a scan
    of every mention per short form made such a report quadratic.
    """

    __slots__ = ("_cands", "_longest", "_starts")

    def __init__(self, exact: Sequence[_Cand]) -> None:
        self._cands = sorted((c[3], c[4], c[5]) for c in exact)
        self._starts = [c[0] for c in self._cands]
        self._longest = max((e - s for s, e, _ in self._cands), default=0)

    def overlapping(self, lo: int, hi: int) -> list[tuple[int, int, str]]:
        """Candidates with ``end > lo`` and ``start < hi``."""
        first = bisect_left(self._starts, lo - self._longest)
        last = bisect_left(self._starts, hi)
        return [c for c in self._cands[first:last] if c[1] > lo]


def _slot_reach(word: str) -> int:
    """Letters an open word of a name may differ by: one, two from seven letters on."""
    return 2 if len(word) >= 7 else 1


def _words_around(
    padded: str, s: int, e: int, reach: int, kind_of: dict[str, int]
) -> list[tuple[int, int, str]]:
    """The word at ``padded[s:e]`` and up to ``reach`` words either side that may
    share a window with it: at most one punctuation mark (two spaces) between
    two words, and no blocked word (``_BLOCKED``).
    """
    out = [(s, e, padded[s:e])]
    pos = s
    while len(out) <= reach:
        end = pos
        while end > 0 and padded[end - 1] == " ":
            end -= 1
        if end == 0 or pos - end > _LOOSE_MAX_GAP:
            break
        start = padded.rfind(" ", 0, end) + 1
        word = padded[start:end]
        if kind_of.get(word, _BLOCKED) & _BLOCKED:
            break
        out.insert(0, (start, end, word))
        pos = start
    left = len(out)
    pos = e
    n = len(padded)
    while len(out) - left < reach:
        start = pos
        while start < n and padded[start] == " ":
            start += 1
        if start >= n or start - pos > _LOOSE_MAX_GAP:
            break
        end = padded.find(" ", start)
        end = n if end < 0 else end
        word = padded[start:end]
        if kind_of.get(word, _BLOCKED) & _BLOCKED:
            break
        out.append((start, end, word))
        pos = end
    return out


def _bears(word: str, anchor: str) -> bool:
    """Whether a window word carries a distinctive word of a name.

    It is the word, begins or ends with it ("scellcarcinoma"), or is one letter
    off a word of seven letters or more ("squamoas").

    >>> _bears("scellcarcinoma", "carcinoma"), _bears("squamoas", "squamous")
    (True, True)
    """
    if word == anchor:
        return True
    if len(word) > len(anchor) and (word.startswith(anchor) or word.endswith(anchor)):
        return True
    return (
        len(anchor) >= _LOOSE_NEAR_ANCHOR
        and Levenshtein.distance(word, anchor, score_cutoff=1) <= 1
    )


def _misread_as(word: str, target: str) -> bool:
    """Whether ``word`` may be OCR's or a typist's ``target``, in a loose reading.

    >>> _misread_as("toll", "cell"), _misread_as("clin", "colon")
    (True, False)
    """
    if len(target) <= 5:
        d = Levenshtein.distance(word, target, score_cutoff=2)
        return d <= 1 or (d == 2 and (word[:2] == target[:2] or word[-2:] == target[-2:]))
    reach = max(2, len(target) // 3)
    return Levenshtein.distance(word, target, score_cutoff=reach) <= reach


def _near_word(word: str, words: Sequence[str], reach: int) -> bool:
    """Whether ``word`` is ``reach`` letters or fewer off one of ``words``.

    It must share that word's first or last letter, and have three letters or
    more.  A known word in a loose reading may be one letter off ("call" for "cell").
    """
    if len(word) < 3:
        return False
    return any(
        (word[0] == w[0] or word[-1] == w[-1])
        and Levenshtein.distance(word, w, score_cutoff=reach) <= reach
        for w in words
    )


def _whole_token_starts(text: str, token: str) -> list[int]:
    """Offsets where ``token`` occurs in ``text`` with no letter or digit either side."""
    out = []
    n, k = len(text), len(token)
    at = text.find(token)
    while at >= 0:
        if (at == 0 or not text[at - 1].isalnum()) and (at + k >= n or not text[at + k].isalnum()):
            out.append(at)
        at = text.find(token, at + 1)
    return out


def _glued_negation(written: str, replacement: str) -> bool:
    """Whether ``written`` is a negation word glued to the form.

    "nomalignancy", "noperineural", "notidentified"... and "formalignancy"
    (from "negative formalignancy"): reading the form would hide the negation
    from the assertion stage and turn "No malignancy" into a present finding,
    so such a correction is not made.
    """
    w = written.replace(" ", "")
    r = replacement.replace(" ", "")
    for prefix in _GLUED_PREFIXES:
        if w.startswith(prefix) and not r.startswith(prefix):
            rest = w[len(prefix) :]
            if rest and r.startswith(rest[:3]):
                return True
    return False


#: A sentence or clause end inside a span: ";", ":", "!" or "?" before white space,
#: or a full stop after a word of two letters or more ("carcinoma. Metastatic"),
#: never after an initial ("H. pylori", "C. difficile").
_SENTENCE_END = re.compile(r"[;:!?](?=\s)|(?<=[^\W_][^\W_])\.(?=\s)")
_END_CHARS = frozenset(";:!?.")
_NEXT_WORD = re.compile(r"[\W_]*?([^\W\d_])")


def _joins_two_sentences(text: str, s: int, e: int, found: Sequence[_Cand]) -> bool:
    r"""Whether the candidate ``text[s:e]`` joins a whole name to the next sentence.

    A name written with a comma ("adenocarcinoma, metastatic") is matched with
    its punctuation read as a space, so it could join the end of one sentence or
    line to the start of the next ("... adenocarcinoma.\n-Metastatic ...") and
    take the first name's place.  Refused where the span runs over a sentence or
    clause end (:data:`_SENTENCE_END`) and what comes before that end is a
    candidate name by itself, unless the text goes on in lower case; a name that
    OCR broke with a stray full stop ("squamous celi. carcinoma") still reads,
    its first half being no name.
    """
    span = text[s:e]
    if _END_CHARS.isdisjoint(span):
        return False
    ends = None
    for m in _SENTENCE_END.finditer(span):
        nxt = _NEXT_WORD.match(span, m.end())
        if nxt is not None and nxt.group(1).islower():
            continue  # a sentence goes on in lower case: a stray mark ("cell.\ncarcinoma")
        if ends is None:
            ends = {c[4] for c in found if c[3] == s}
        if s + m.start() in ends:
            return True
    return False


def _two_apart_slips(word: str, target: str) -> bool:
    """Whether ``word`` is ``target`` with one or two letters misread, apart, not the first.

    Same length (OCR misreads letters; a lost or added letter changes the word
    more: "adenosarcomas" is no "adenocarcinomas"), and two misread letters not
    side by side (an ending changed whole is another word: "adenocarcinoid").

    >>> _two_apart_slips("aaenocarcinomo", "adenocarcinoma")
    True
    >>> _two_apart_slips("adenocarcinoid", "adenocarcinoma")
    False
    >>> _two_apart_slips("bdenocarcinomo", "adenocarcinoma")
    False
    """
    if len(word) != len(target) or word[0] != target[0]:
        return False
    at = [i for i, (a, b) in enumerate(zip(word, target, strict=True)) if a != b]
    return len(at) == 1 or (len(at) == 2 and at[1] - at[0] > 1)


def _ocr_variants(word: str, confusions: tuple[tuple[str, str], ...] | None = None) -> list[str]:
    """The word with one OCR confusion undone, each place in turn."""
    out = []
    for wrong, right in _OCR_CONFUSIONS if confusions is None else confusions:
        at = word.find(wrong)
        while at >= 0:
            out.append(word[:at] + right + word[at + len(wrong) :])
            at = word.find(wrong, at + 1)
    return out


_COMMON_CACHE: dict[str, frozenset[str]] = {}


def _default_common_words() -> frozenset[str]:
    p = lexicon_path("common_words.txt")
    key = str(p)
    if key not in _COMMON_CACHE:
        _COMMON_CACHE[key] = load_common_words(p)
    return _COMMON_CACHE[key]


_EMPTY: list[AbbreviationDictionary] = []


def _empty_dictionary() -> AbbreviationDictionary:
    if not _EMPTY:
        _EMPTY.append(AbbreviationDictionary.empty())
    return _EMPTY[0]
