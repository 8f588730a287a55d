# The two commands of the README: `make demo` runs the main job, `make test` the whole suite.
# Each creates .venv when it is missing and installs the project into it first.
PYTHON ?= python3
VENV   ?= .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed

.PHONY: demo test bench install clean

$(STAMP): pyproject.toml
	@$(PYTHON) -c 'import sys; sys.exit(0 if sys.version_info >= (3, 11) else "wbledger needs Python 3.11 or newer")'
	@test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -e '.[test]'
	@touch $(STAMP)

install: $(STAMP)

demo: $(STAMP)
	$(VENV)/bin/wbledger demo

test: $(STAMP)
	@bash tools/ensure-test-tools
	$(PY) -m ruff check ledger tests bench
	$(PY) -m mypy
	$(PY) -m pytest

bench: $(STAMP)
	$(PY) -m bench

clean:
	rm -rf $(VENV) build dist *.egg-info .pytest_cache
