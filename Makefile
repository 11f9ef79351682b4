# Two entry points: `make demo` (convert the bundled samples) and `make test` (the whole suite).
PYTHON ?= python3
VENV ?= .venv
BIN := $(VENV)/bin

.PHONY: setup demo test clean

$(BIN)/mrlift: pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(BIN)/pip install --quiet --upgrade pip
	$(BIN)/pip install --quiet -e '.[test]'
	touch $(BIN)/mrlift

setup: $(BIN)/mrlift

demo: setup
	rm -rf demo-out/bikeshare
	$(BIN)/mrlift scan samples/bikeshare
	$(BIN)/mrlift convert samples/bikeshare -o demo-out/bikeshare

test: setup
	$(BIN)/python -m pytest tests

clean:
	rm -rf demo-out .pytest_cache
