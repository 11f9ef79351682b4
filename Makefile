# Two entry points: `make demo` (convert the bundled samples) and `make test` (the whole suite).
PYTHON ?= python3
VENV ?= .venv
BIN := $(VENV)/bin

.PHONY: setup browser demo test clean

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

# The review page's browser test drives Debian's Chromium; install it where we may (root, apt).
browser:
	@command -v chromium >/dev/null 2>&1 || command -v chromium-browser >/dev/null 2>&1 || \
	  { [ "$$(id -u)" = 0 ] && command -v apt-get >/dev/null 2>&1 && \
	    { apt-get install -y -q chromium >/dev/null 2>&1 || \
	      { apt-get update -q >/dev/null 2>&1 && apt-get install -y -q chromium >/dev/null 2>&1; }; }; } || \
	  echo "Chromium is not installed: the review page's browser test will be skipped"

# pytest's exit 5 (no tests collected) is a failure here, said as such rather than passed on by accident.
test: setup browser
	$(BIN)/python -m pytest tests; rc=$$?; \
	  if [ $$rc -eq 5 ]; then echo "make test: pytest collected no tests: failing on purpose" >&2; exit 1; fi; \
	  exit $$rc

clean:
	rm -rf demo-out .pytest_cache
