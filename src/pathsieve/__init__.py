"""pathsieve: graded, auditable weak labels from surgical pathology reports.

The public API (everything else may change)::

    import pathsieve
    lab = pathsieve.Labeler("colorectal")      # label texts and DataFrames
    res = lab.label_text("DIAGNOSIS: Rectum, biopsy: adenocarcinoma.")
    doc = pathsieve.read("...")                # the spaCy Doc, doc._.pathsieve
    rep = pathsieve.read_report("...")         # plain frozen records

Labels are research aids for model training, not diagnoses; the signing
pathologist's report is authoritative.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from .errors import ConfigError, InputError, OntologyError, PathsieveError, SchemeError, VocabError
from .records import Assertion, LabelState, Mention, Part, Section, TriggerHit, Value

__version__ = "0.1.0"

__all__ = [
    "Assertion",
    "ConfigError",
    "InputError",
    "LabelState",
    "Labeler",
    "Mention",
    "OntologyError",
    "Part",
    "PathsieveError",
    "SchemeError",
    "Section",
    "TriggerHit",
    "Value",
    "VocabError",
    "check_vocab",
    "label_file",
    "list_schemes",
    "load_ontology",
    "load_scheme",
    "read",
    "read_report",
]

# Heavy pieces (spaCy, pandas) load on first use so `pathsieve --help` stays quick.
_LAZY = {
    "Labeler": "labeler",
    "read": "pipeline",
    "read_report": "pipeline",
    "load_ontology": "ontology",
    "load_scheme": "schemes",
    "list_schemes": "schemes",
    "check_vocab": "check",
    "label_file": "runner",
}

if TYPE_CHECKING:
    from .check import check_vocab
    from .labeler import Labeler
    from .ontology import load_ontology
    from .pipeline import read, read_report
    from .runner import label_file
    from .schemes import list_schemes, load_scheme


def __getattr__(name: str) -> Any:
    module = _LAZY.get(name)
    if module is None:
        raise AttributeError(f"module 'pathsieve' has no attribute {name!r}")
    import importlib

    return getattr(importlib.import_module(f".{module}", __name__), name)
