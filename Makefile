# pathsieve: two commands on a fresh machine — `make demo` and `make test`.
PYTHON ?= python3
VENV ?= .venv
PY := $(VENV)/bin/python
STAMP := $(VENV)/.installed

.PHONY: install demo test lint typecheck check bench clean

$(STAMP): requirements.lock pyproject.toml
	test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install -q --upgrade pip
	$(PY) -m pip install -q -r requirements.lock
	$(PY) -m pip install -q --no-deps -e .
	touch $(STAMP)

install: $(STAMP)

demo: $(STAMP)
	$(PY) -m pathsieve demo

test: $(STAMP)
	$(PY) -m pathsieve vocab check
	$(PY) -m ruff check src tests benchmarks
	$(PY) -m ruff format --check src
	$(PY) -m mypy
	$(PY) -m pytest -n 2 --dist loadfile

bench: $(STAMP)
	$(PY) benchmarks/assertion.py
	$(PY) benchmarks/throughput.py
	$(PY) benchmarks/long_report.py

clean:
	rm -rf $(VENV) demo-output .pytest_cache .mypy_cache .ruff_cache
