# Everything a fresh clone needs: `make demo` and `make test` create .venv when it is missing.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin

.PHONY: demo test test-long bench clean

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

test: $(VENV)/.installed-test
	$(BIN)/python -m pytest -q

# The long checks the default run leaves out: the long fuzzing profile (random seeds) and slow tests.
test-long: $(VENV)/.installed-test
	$(BIN)/python -m pytest -q -m "fuzz_long or slow"

bench: $(VENV)/.installed-test
	$(BIN)/python bench/bench_solver.py
	$(BIN)/python bench/bench_advisor.py
	$(BIN)/python bench/bench_scale.py
	$(BIN)/python bench/bench_startup.py
	$(BIN)/python bench/bench_wire.py
	$(BIN)/python bench/bench_pairs.py

clean:
	rm -rf $(VENV) build *.egg-info linecalc.egg-info
