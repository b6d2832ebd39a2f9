# droprig: two commands do all the set-up — `make demo` and `make test`.
PYTHON ?= python3
VENV := .venv
PY := $(VENV)/bin/python
STAMP := $(VENV)/.installed
QT_DEBS := libglib2.0-0 libgl1 libegl1 libfontconfig1 libxkbcommon0 libdbus-1-3 poppler-utils

.PHONY: demo test lint bench sysdeps clean

$(STAMP): pyproject.toml
	@test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -e '.[test]'
	@touch $(STAMP)

sysdeps:
	@sh scripts/sysdeps.sh $(QT_DEBS)

test: sysdeps $(STAMP)
	$(PY) -m mypy
	QT_QPA_PLATFORM=offscreen $(PY) -m pytest -q

demo: sysdeps $(STAMP)
	$(PY) -m droprig demo

lint: $(STAMP)
	$(PY) -m ruff check droprig tests benchmarks
	$(PY) -m mypy

bench: sysdeps $(STAMP)
	@for f in benchmarks/bench_*.py; do echo "== $$f"; QT_QPA_PLATFORM=offscreen $(PY) $$f || exit 1; done

clean:
	rm -rf $(VENV) build *.egg-info out
