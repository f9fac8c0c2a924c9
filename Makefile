# Everything a fresh clone needs: `make demo` and `make test` create .venv when it is missing.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin

.PHONY: demo test test-long bench clean browser

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip

$(VENV)/.installed: pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e '.[antenna]'
	touch $@

$(VENV)/.installed-test: pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e '.[test,antenna]'
	touch $(VENV)/.installed $@

demo: $(VENV)/.installed
	$(BIN)/linecalc budget stations/hilltop-dipole.yaml
	$(BIN)/linecalc budget stations/orchard-doublet.yaml
	$(BIN)/linecalc compare stations/tuner-in-shack.yaml --tuner-positions
	$(BIN)/linecalc budget stations/meadow-doublet-planned.yaml
	$(BIN)/linecalc antenna stations/garden-inverted-v.yaml --cut-for 7.1MHz
	$(BIN)/linecalc line stations/barn-dipole-old-coax.yaml

# Debian's chromium for the browser checks of the HTML report (tests/render/test_html_report_browser.py):
# installed with apt-get when /usr/bin/chromium is missing and make runs as root; otherwise (or if
# the package cannot be had) a message says why, and those tests are skipped with the same reason.
browser:
	@if [ -x /usr/bin/chromium ]; then :; \
	elif [ "$$(id -u)" != 0 ] || ! command -v apt-get >/dev/null 2>&1; then \
	  echo "make browser: /usr/bin/chromium is missing and this is not root with apt-get; the browser tests will be skipped"; \
	elif ! (apt-get update && DEBIAN_FRONTEND=noninteractive apt-get install -y chromium); then \
	  echo "make browser: apt-get could not install chromium; the browser tests will be skipped"; \
	fi

test: $(VENV)/.installed-test browser
	$(BIN)/python -m pytest -q

# The long checks the default run leaves out: the long fuzzing profile (random seeds) and slow tests.
test-long: $(VENV)/.installed-test browser
	$(BIN)/python -m pytest -q -m "fuzz_long or slow"

bench: $(VENV)/.installed-test
	$(BIN)/python bench/bench_solver.py
	$(BIN)/python bench/bench_advisor.py
	$(BIN)/python bench/bench_scale.py
	$(BIN)/python bench/bench_startup.py
	$(BIN)/python bench/bench_wire.py
	$(BIN)/python bench/bench_uncertainty.py
	$(BIN)/python bench/bench_pairs.py

clean:
	rm -rf $(VENV) build *.egg-info linecalc.egg-info
