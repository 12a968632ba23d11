# Every target builds its own virtual environment in .venv (override with VENV=...).
PYTHON ?= python3
VENV   ?= .venv
PY     := $(VENV)/bin/python
PIP    := $(PY) -m pip

.PHONY: demo test bench doctest docs reliability-table clean venv

$(VENV)/.created:
	$(PYTHON) -m venv $(VENV)
	$(PIP) install --quiet --upgrade pip
	touch $@

venv: $(VENV)/.created

$(VENV)/.installed-%: $(VENV)/.created pyproject.toml
	$(PIP) install --quiet -e ".[$*]"
	touch $@

## demo: install and run the main job on the bundled demo data
demo: $(VENV)/.installed-plot
	$(VENV)/bin/wedgepath demo --out demo-output --force

## test: install and run the whole test suite (unit, property, doctests, examples)
test: $(VENV)/.installed-test
	$(PY) -m pytest -q -n auto

## bench: run every benchmark, each against its baseline in the same run; writes docs/performance.md
bench: $(VENV)/.installed-bench $(VENV)/.installed-dask
	$(PY) benchmarks/run_all.py

## docs: install -e ".[docs]" and build the site into docs/_build/html (warnings are errors)
docs: $(VENV)/.installed-docs
	$(PY) -m sphinx -b html -W --keep-going -n -q docs docs/_build/html

## reliability-table: regenerate the bad-input table of docs/reliability.md from tests/reliability/
reliability-table: $(VENV)/.installed-test
	$(PY) docs/reliability_table.py

clean:
	rm -rf $(VENV) build dist src/*.egg-info .pytest_cache .hypothesis
	rm -rf docs/_build docs/reference/generated docs/auto_examples docs/sg_execution_times.rst
