# winnow: two set-up commands for a new user (make demo, make test), plus bench and lint.
PYTHON ?= python3
VENV ?= .venv
PY := $(VENV)/bin/python
WINNOW := $(VENV)/bin/winnow
DEMO_DB ?= demo.sqlite
DEMO_ARTICLES ?= fixtures/articles

.PHONY: demo test bench lint install install-dev clean

$(VENV)/.installed: pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install -q --upgrade pip
	$(PY) -m pip install -q -e .
	touch $@

$(VENV)/.installed-dev: $(VENV)/.installed
	$(PY) -m pip install -q -e ".[dev]"
	touch $@

install: $(VENV)/.installed
install-dev: $(VENV)/.installed-dev

demo: $(VENV)/.installed
	$(WINNOW) extract $(DEMO_ARTICLES) --db $(DEMO_DB)
	@echo
	@echo "Review the proposals as a curator:  $(WINNOW) review --db $(DEMO_DB)"

test: $(VENV)/.installed-dev
	$(PY) -m pytest -q

bench: $(VENV)/.installed-dev
	$(PY) -m pytest -q -s tests/benchmarks

lint: $(VENV)/.installed-dev
	$(VENV)/bin/ruff check extract tests fixtures
	$(VENV)/bin/ruff format --check extract tests fixtures
	$(VENV)/bin/mypy

clean:
	rm -rf $(VENV) $(DEMO_DB) .pytest_cache
