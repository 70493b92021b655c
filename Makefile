# satorder — developer entry points. Every target sets up .venv on its own.
PY ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed
TESTSTAMP := $(VENV)/.installed-test

.PHONY: demo test bench lint clean

$(BIN)/python:
	$(PY) -m venv $(VENV)
	$(BIN)/python -m pip install -q --upgrade pip

$(STAMP): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install -q -e .
	touch $@

$(TESTSTAMP): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install -q -e '.[test]'
	touch $(STAMP) $@

demo: $(STAMP)
	$(BIN)/satorder demo --pictures demo-output

test: $(TESTSTAMP)
	$(BIN)/ruff check satorder tests benchmarks
	$(BIN)/lint-imports
	$(BIN)/python -m pytest

lint: $(TESTSTAMP)
	$(BIN)/ruff check satorder tests benchmarks
	$(BIN)/lint-imports

bench: $(TESTSTAMP)
	$(BIN)/python benchmarks/targets.py --out bench-results.json

clean:
	rm -rf $(VENV) build *.egg-info
