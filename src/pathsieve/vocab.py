"""Where the vocabulary data files live.

All vocabulary — the ontology, schemes, abbreviations, assertion triggers and
section headers — is data under one folder (``ontology/`` in the source tree).
``PATHSIEVE_VOCAB`` points pathsieve at another copy of that folder.
"""

from __future__ import annotations

import hashlib
import os
from pathlib import Path

__all__ = [
    "cache_dir",
    "file_digest",
    "lexicon_path",
    "ontology_path",
    "schemes_dir",
    "vocab_dir",
]


def vocab_dir() -> Path:
    env = os.environ.get("PATHSIEVE_VOCAB")
    if env:
        return Path(env)
    return Path(__file__).resolve().parents[2] / "ontology"


def ontology_path() -> Path:
    return vocab_dir() / "pathsieve.obo"


def schemes_dir() -> Path:
    return vocab_dir() / "schemes"


def lexicon_path(name: str) -> Path:
    """A lexicon file under ``ontology/lexicon/`` (abbreviations, triggers, headers)."""
    return vocab_dir() / "lexicon" / name


def cache_dir() -> Path:
    env = os.environ.get("PATHSIEVE_CACHE")
    base = Path(env) if env else Path(os.environ.get("XDG_CACHE_HOME", Path.home() / ".cache"))
    return base if env else base / "pathsieve"


def file_digest(*paths: Path) -> str:
    """Content hash of one or more files (cache key)."""
    h = hashlib.sha256()
    for p in paths:
        h.update(p.read_bytes())
        h.update(b"\0")
    return h.hexdigest()[:24]
