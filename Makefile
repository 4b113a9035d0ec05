# Everyday commands (DEVELOPERS.md). Run them inside the virtual environment that has the project:
#   python3 -m venv .venv && . .venv/bin/activate && pip install -e '.[test,dev]'
PYTHON ?= python
MIN_VENV ?= .venv-min

.PHONY: test lint format bench min-versions

test:  ## the whole suite (the README's test command)
	$(PYTHON) -m pytest -q -p no:cacheprovider

lint:  ## style and types, as .ci/run checks them
	$(PYTHON) -m ruff check .
	$(PYTHON) -m ruff format --check .
	$(PYTHON) -m mypy

format:  ## apply the formatter and the import order
	$(PYTHON) -m ruff check --select I --fix .
	$(PYTHON) -m ruff format .

bench:  ## the quick benchmarks: a few minutes on 2 cores (bench/README.md has the full runs)
	$(PYTHON) -m bench.dates --paragraphs 500
	$(PYTHON) -m bench.bm25 --sizes 50000 --questions 200
	$(PYTHON) -m bench.scale --passages 20000 --questions 1000

# The demo PDFs are compared byte for byte with the committed ones, and those bytes depend on the
# fpdf2 and pypdf releases that wrote them: that one test is left out at the floors.
min-versions:  ## the suite with every dependency at its declared floor, in a fresh $(MIN_VENV)
	rm -rf $(MIN_VENV)
	$(PYTHON) -m venv $(MIN_VENV)
	$(MIN_VENV)/bin/pip install -q --only-binary=:all: $$($(PYTHON) -m tools.min_versions --extras test)
	$(MIN_VENV)/bin/pip install -q --no-deps -e .
	$(MIN_VENV)/bin/pip check
	$(MIN_VENV)/bin/python -m pytest -q -p no:cacheprovider \
		--deselect tests/test_demo_fixtures.py::test_make_pdfs_regenerates_byte_identical_files
