# Sumpside: every set-up step a fresh machine needs, then build, serve or test.
#   make serve   set up, build dist/, serve it on http://127.0.0.1:8000
#   make test    set up (Chromium too, as root), build, run every test
#   make bench   set up, build, run the start-up and latency benchmark
.PHONY: setup chromium build serve test test-calc bench clean

VENV      := .venv
PY        := $(VENV)/bin/python
STAMP     := $(VENV)/.installed
NODE_STAMP := node_modules/.installed
WHEELS    := .cache/pyodide-wheels
WHEELS_STAMP := $(WHEELS)/.installed
CHROMIUM  := /usr/bin/chromium
# pyodide-build needs Python >= 3.12: take the first one found.
PYTHON312 := $(shell for p in python3.13 python3.12 $$HOME/.pyenv/versions/3.13*/bin/python3 \
               $$HOME/.pyenv/versions/3.12*/bin/python3 /usr/bin/python3 python3; do \
               command -v $$p >/dev/null 2>&1 && $$p -c 'import sys; sys.exit(sys.version_info < (3, 12))' \
               2>/dev/null && { command -v $$p; break; }; done)
# Pytest, Hypothesis and their dependencies, unpacked into Pyodide for the in-Pyodide run.
PYODIDE_TEST_PACKAGES := pytest pluggy iniconfig packaging pygments hypothesis sortedcontainers

setup: $(STAMP) $(NODE_STAMP) $(WHEELS_STAMP)

$(STAMP): pyproject.toml
	@test -n "$(PYTHON312)" || { echo "make: no Python >= 3.12 found (pyodide-build needs one)"; exit 1; }
	$(PYTHON312) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -e ".[dev]"
	touch $@

$(NODE_STAMP): package.json package-lock.json
	npm ci --no-audit --no-fund
	touch $@

$(WHEELS_STAMP): $(STAMP) $(NODE_STAMP) Makefile tests/pyodide/download_wheels.py
	rm -rf $(WHEELS) && mkdir -p $(WHEELS)
	$(PY) tests/pyodide/download_wheels.py $(WHEELS) $(PYODIDE_TEST_PACKAGES)
	touch $@

chromium:
	@if [ -x $(CHROMIUM) ]; then :; \
	elif [ "$$(id -u)" = 0 ]; then \
	  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null; \
	else echo "make: $(CHROMIUM) is missing; install Debian's chromium (as root: apt-get install chromium)"; exit 1; fi

build: setup
	$(PY) build.py

serve: setup
	$(PY) build.py serve

test: setup chromium build
	$(PY) -m pytest

test-calc: setup
	$(PY) -m pytest calc tests/calc

bench: setup chromium build
	$(PY) -m sitebuild.bench

clean:
	rm -rf dist .cache $(VENV) node_modules
