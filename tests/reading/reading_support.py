"""Helpers the reading tests import by name (conftest modules are not importable by name)."""

from __future__ import annotations

from pathlib import Path

from pathsieve.ontology import Ontology

MINI_OBO = Path(__file__).resolve().parent / "data" / "mini.obo"


def concept(onto: Ontology, name: str) -> str:
    """The id of the concept called ``name`` (name or synonym); fails loudly if absent."""
    ids = onto.lookup(name)
    assert ids, f"the ontology has no concept called {name!r}"
    return ids[0]
