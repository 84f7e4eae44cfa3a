# Sumpside: every set-up step a fresh machine needs, then build, serve or test.
#   make serve   set up, build dist/, serve it on http://127.0.0.1:8000
#   make test    set up (Chromium too, as root), build, run every test
#   make bench   set up, build, run the start-up and latency benchmark
#   make lock    refresh constraints.txt: the newest releases pyproject.toml allows, pinned
.PHONY: setup chromium build serve test test-calc bench lock clean

VENV      := .venv
PY        := $(VENV)/bin/python
STAMP     := $(VENV)/.installed
NODE_STAMP := node_modules/.installed
WHEELS    := .cache/pyodide-wheels
WHEELS_STAMP := $(WHEELS)/.installed
# Pure-Python wheels the app ships beside calc's (build.py APP_PACKAGES), at the versions
# installed here from constraints.txt.
APP_WHEELS := .cache/app-wheels
APP_WHEELS_STAMP := $(APP_WHEELS)/.installed
APP_PACKAGES := segno
# Every build and test tool at an exact version, so two fresh clones build with the same tools.
CONSTRAINTS := constraints.txt
LOCK_VENV := .cache/lock-venv
CHROMIUM  := /usr/bin/chromium
# pyodide-build needs Python >= 3.12: take the first one found.
PYTHON312 := $(shell for p in python3.13 python3.12 $$HOME/.pyenv/versions/3.13*/bin/python3 \
               $$HOME/.pyenv/versions/3.12*/bin/python3 /usr/bin/python3 python3; do \
               command -v $$p >/dev/null 2>&1 && $$p -c 'import sys; sys.exit(sys.version_info < (3, 12))' \
               2>/dev/null && { command -v $$p; break; }; done)
# Pytest, Hypothesis and their dependencies, unpacked into Pyodide for the in-Pyodide run.
PYODIDE_TEST_PACKAGES := pytest pluggy iniconfig packaging pygments hypothesis sortedcontainers

setup: $(STAMP) $(NODE_STAMP) $(WHEELS_STAMP) $(APP_WHEELS_STAMP)

$(STAMP): pyproject.toml $(CONSTRAINTS)
	@test -n "$(PYTHON312)" || { echo "make: no Python >= 3.12 found (pyodide-build needs one)"; exit 1; }
	$(PYTHON312) -m venv $(VENV)
	# PIP_CONSTRAINT also reaches the isolated environment that builds the editable install.
	PIP_CONSTRAINT=$(CONSTRAINTS) $(PY) -m pip install --quiet pip
	PIP_CONSTRAINT=$(CONSTRAINTS) $(PY) -m pip install --quiet -e ".[dev]"
	touch $@

# A scratch environment takes the newest releases pyproject.toml allows; its exact versions
# become the new constraints.txt. Review the diff, then `make test`.
lock:
	@test -n "$(PYTHON312)" || { echo "make: no Python >= 3.12 found (pyodide-build needs one)"; exit 1; }
	rm -rf $(LOCK_VENV) && $(PYTHON312) -m venv $(LOCK_VENV)
	$(LOCK_VENV)/bin/python -m pip install --quiet --upgrade pip setuptools
	$(LOCK_VENV)/bin/python -m pip install --quiet -e ".[dev]"
	{ echo "# Exact versions of the build and test tools (pyproject.toml's dev extra), for"; \
	  echo "# Python $$($(LOCK_VENV)/bin/python -c 'import platform; print(platform.python_version())'). Made by \`make lock\`; do not edit by hand."; \
	  $(LOCK_VENV)/bin/python -m pip freeze --all --exclude-editable; } > $(CONSTRAINTS)
	rm -rf $(LOCK_VENV)

$(NODE_STAMP): package.json package-lock.json
	# No package's install script runs: what the app and the tests use needs none (the test
	# database server runs in memory), and some would try to fetch or compile native code.
	npm ci --no-audit --no-fund --ignore-scripts
	touch $@

$(WHEELS_STAMP): $(STAMP) $(NODE_STAMP) Makefile tests/pyodide/download_wheels.py
	rm -rf $(WHEELS) && mkdir -p $(WHEELS)
	$(PY) tests/pyodide/download_wheels.py $(WHEELS) $(PYODIDE_TEST_PACKAGES)
	touch $@

$(APP_WHEELS_STAMP): $(STAMP) $(NODE_STAMP) Makefile tests/pyodide/download_wheels.py
	rm -rf $(APP_WHEELS) && mkdir -p $(APP_WHEELS)
	$(PY) tests/pyodide/download_wheels.py $(APP_WHEELS) $(APP_PACKAGES)
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
