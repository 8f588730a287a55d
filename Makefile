# The two commands of the README: `make demo` runs the main job, `make test` the whole suite.
# Each creates .venv when it is missing and installs the project into it first: `make demo`
# the runtime only (with the optional compiled kernel, the `fast` extra), `make test` the test
# extras as well. A stamp file per install keeps them apart, so that the demo never pulls in
# the test tools and the suite always has them.
PYTHON ?= python3
VENV   ?= .venv
PY     := $(VENV)/bin/python
RUNTIME_STAMP := $(VENV)/.installed-runtime
TEST_STAMP    := $(VENV)/.installed-test

.PHONY: demo test bench install clean venv

venv:
	@$(PYTHON) -c 'import sys; sys.exit(0 if sys.version_info >= (3, 11) else "wbledger needs Python 3.11 or newer")'
	@test -x $(PY) || $(PYTHON) -m venv $(VENV)
	@$(PY) -m pip install --quiet --upgrade pip

$(RUNTIME_STAMP): pyproject.toml
	@$(MAKE) --no-print-directory venv
	$(PY) -m pip install --quiet -e '.[fast]'
	@touch $(RUNTIME_STAMP)

# The test extras include everything the runtime needs, so they also count as the runtime.
$(TEST_STAMP): pyproject.toml
	@$(MAKE) --no-print-directory venv
	$(PY) -m pip install --quiet -e '.[test]'
	@touch $(TEST_STAMP) $(RUNTIME_STAMP)

install: $(RUNTIME_STAMP)

demo: $(RUNTIME_STAMP)
	$(VENV)/bin/wbledger demo

test: $(TEST_STAMP)
	@bash tools/ensure-test-tools
	$(PY) -m ruff check ledger tests bench
	$(PY) -m mypy
	$(PY) -m pytest

bench: $(TEST_STAMP)
	$(PY) -m bench

clean:
	rm -rf $(VENV) build dist *.egg-info .pytest_cache
