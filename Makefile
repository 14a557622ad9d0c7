# Two commands: `make run` opens the tool on a demo project, `make test` runs the whole suite offscreen.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed
DEMO ?= demo_projects/appliance_ferrite_12v.toml

.PHONY: run test lint bench setup clean

$(STAMP): pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -e '.[gui,test]'
	touch $(STAMP)

setup: $(STAMP)

run: $(STAMP)
	$(BIN)/pmdc-sizer gui $(DEMO)

lint: $(STAMP)
	$(BIN)/python -m ruff check core app tests benchmarks
	$(BIN)/python -m mypy core

test: $(STAMP) lint
	QT_QPA_PLATFORM=offscreen $(BIN)/python -m pytest -q -n auto --maxprocesses 4 --dist loadfile

bench: $(STAMP)
	$(BIN)/python benchmarks/bench_magnetics.py
	$(BIN)/python benchmarks/bench_evaluate.py
	$(BIN)/python benchmarks/bench_batch.py
	$(BIN)/python benchmarks/bench_sizing.py
	$(BIN)/python benchmarks/bench_refit.py
	$(BIN)/python benchmarks/bench_field.py
	QT_QPA_PLATFORM=offscreen $(BIN)/python benchmarks/bench_gui_latency.py

clean:
	rm -rf $(VENV) build *.egg-info
