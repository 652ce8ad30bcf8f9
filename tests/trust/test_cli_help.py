"""Every trust command registers with help text and a run function."""

from __future__ import annotations

import argparse
from types import ModuleType

import pytest

from pathsieve.cli import review, sample, validate


@pytest.mark.parametrize(
    ("module", "name"), [(validate, "validate"), (sample, "sample"), (review, "review")]
)
def test_command_has_help(
    module: ModuleType, name: str, capsys: pytest.CaptureFixture[str]
) -> None:
    parser = argparse.ArgumentParser(prog="pathsieve")
    sub = parser.add_subparsers()
    module.register(sub)
    assert name in sub.choices
    assert sub._choices_actions[0].help  # the one-line help in `pathsieve --help`
    assert sub.choices[name].description
    for action in sub.choices[name]._actions:
        assert action.help, (name, action.dest)
    with pytest.raises(SystemExit):
        parser.parse_args([name, "--help"])
    assert "usage: pathsieve " + name in capsys.readouterr().out
    assert callable(module.run)
