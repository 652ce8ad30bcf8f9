"""The report tokenizer: lean spaCy affix rules for pathology report text.

spaCy's default English tokenizer carries hundreds of exception strings, a URL
matcher and long affix alternations; on report text it is slow and it breaks
the forms that matter (``3+4=7`` becomes five tokens, ``A1-A3`` three).  This
tokenizer splits on whitespace, peels sentence punctuation off the ends of a
chunk, and splits inside a chunk only where two *words* meet (``high-grade``,
``polyp/adenoma``, ``carcinoma.The``) or a number meets a unit (``2.5cm``).
Values keep their shape: ``3+4=7``, ``pT3N1a``, ``ypT0``, ``CIN2-3``, ``0/14``,
``2.5``, ``A1-A3``, ``ER+``, ``ER-``, ``HER2``, ``2+``, ``Ki-67``, ``40%``.

It has no exception list, on purpose: a list of strings would be vocabulary,
and vocabulary lives in data files.  "e.g." becomes ``e.g`` + ``.``, which no
later stage cares about.  Concept mentions found on the character level may
end inside a token (``ER`` in ``ER+``); align them with
``doc.char_span(start, end, alignment_mode="expand")``.

>>> import spacy
>>> nlp = spacy.blank("en")
>>> nlp.tokenizer = make_tokenizer(nlp)
>>> [t.text for t in nlp("Gleason 3+4=7 (Grade Group 2), pT3a.")]
['Gleason', '3+4=7', '(', 'Grade', 'Group', '2', ')', ',', 'pT3a', '.']
"""

from __future__ import annotations

import re
from collections.abc import Callable

import spacy
from spacy.language import Language
from spacy.tokenizer import Tokenizer

__all__ = ["INFIX_PATTERN", "PREFIX_PATTERN", "SUFFIX_PATTERN", "make_tokenizer"]

# Opening brackets and quotes, bullets, and comparison signs before a number
# ("<1%", ">5 cm") come off the front of a chunk.
PREFIX_PATTERN = r"""^(?:[(\[{"'“‘«•*·]|[<>≤≥~](?=\d))"""

# A number directly followed by a unit of two or more lower-case letters
# ("2.5cm", "12mm", "3x4cm" after the infix split) loses the unit.  The number
# must not be glued to a preceding letter: "pT1mi" and "pN1mi" stay whole.
# Python's re has only fixed-width look-behind, hence one branch per width.
_UNIT_AFTER_NUMBER = (
    r"(?:(?<=^\d)|(?<=^\d\d)|(?<=^\d\d\d)"
    r"|(?<=[^A-Za-z0-9]\d)|(?<=[^A-Za-z0-9]\d\d)|(?<=[^A-Za-z0-9]\d\d\d)"
    r"|(?<=\d[xX×]\d)|(?<=\d[xX×]\d\d))"
    r"[a-zµ]{2,3}$"
)
# Closing brackets and quotes, and sentence punctuation, come off the end.  A
# trailing "+" or "-" stays: "ER+", "ER-", "2+" are values.  A "." after a
# digit is sentence punctuation as well ("measures 2.5." -> "2.5" ".").
SUFFIX_PATTERN = r"""(?:[)\]}"'”’»,;:!?]|\.{1,3}|…)$""" + "|" + _UNIT_AFTER_NUMBER

# Split inside a chunk only where two words meet, so value forms with digits
# ("CIN2-3", "A1-A3", "Ki-67", "0/14", "3+4=7") are never cut:
#  - a hyphen or slash between letters: "high-grade", "polyp/adenoma";
#  - a comma, semicolon or colon before a letter: "DIAGNOSIS:Adenocarcinoma";
#  - a full stop between a lower-case letter and a capital: "polyp.The";
#  - brackets glued to a word: "pN0(i+)", "margin(s)";
#  - "x" between numbers in dimensions: "2.5x1.5x1.0".
INFIX_PATTERN = (
    r"(?<=[A-Za-z])[-/‐–—](?=[A-Za-z])"
    r"|(?<=[A-Za-z0-9)])[,;:](?=[A-Za-z(])"
    r"|(?<=[a-z])\.(?=[A-Z])"
    r"|[()\[\]]"
    r"|(?<=\d)[xX×](?=\d)"
)

_PREFIX_RE = re.compile(PREFIX_PATTERN)
_SUFFIX_RE = re.compile(SUFFIX_PATTERN)
_INFIX_RE = re.compile(INFIX_PATTERN)


def make_tokenizer(nlp: Language) -> Tokenizer:
    """A spaCy :class:`~spacy.tokenizer.Tokenizer` with the report rules.

    The tokenizer holds only compiled regular expressions, so it survives
    ``nlp.to_disk`` / ``nlp.from_disk`` and ``to_bytes`` unchanged.
    """
    return Tokenizer(
        nlp.vocab,
        rules={},
        prefix_search=_PREFIX_RE.search,
        suffix_search=_SUFFIX_RE.search,
        infix_finditer=_INFIX_RE.finditer,
        token_match=None,
        url_match=None,
    )


@spacy.registry.tokenizers("pathsieve.report_tokenizer.v1")
def create_report_tokenizer() -> Callable[[Language], Tokenizer]:
    """Config entry point: ``[nlp.tokenizer] @tokenizers = "pathsieve.report_tokenizer.v1"``."""
    return make_tokenizer
