# droprig: two commands do all the set-up — `make demo` and `make test`.
PYTHON ?= python3
VENV := .venv
VPY := $(VENV)/bin/python
PY := PYTHONPATH="$(CURDIR)" $(VPY)
STAMP := $(VENV)/.installed
QT_DEBS := libglib2.0-0 libgl1 libegl1 libfontconfig1 libxkbcommon0 libdbus-1-3 poppler-utils
# the X server and the xcb libraries for the scripted run of the real window (make test)
X_DEBS := xvfb xdotool libxkbcommon-x11-0 libxcb-cursor0 libxcb-icccm4 libxcb-keysyms1 \
	libxcb-shape0 libxcb-randr0 libxcb-render-util0 libxcb-image0 libxcb-xinerama0

.PHONY: demo test lint bench sysdeps sysdeps-test clean

# A .venv that is a link to another tree's (a second working tree of the repository)
# is that tree's: installing this tree into it would re-point its `import droprig`.
# Then nothing is installed and every command below imports this tree by PYTHONPATH.
$(STAMP): pyproject.toml
	@if [ -L $(VENV) ]; then \
		echo "$(VENV) is linked from another tree: not installing this one into it"; \
	else \
		test -x $(VPY) || $(PYTHON) -m venv $(VENV); \
		$(VPY) -m pip install --quiet --upgrade pip && \
		$(VPY) -m pip install --quiet -e '.[test]' && touch $(STAMP); \
	fi

sysdeps:
	@sh scripts/sysdeps.sh $(PYTHON) $(QT_DEBS)

sysdeps-test:
	@sh scripts/sysdeps.sh $(PYTHON) $(QT_DEBS) $(X_DEBS)

test: sysdeps-test $(STAMP)
	$(PY) -m mypy
	QT_QPA_PLATFORM=offscreen $(PY) -m pytest -q -n auto --dist loadfile

demo: sysdeps $(STAMP)
	$(PY) -m droprig demo

lint: $(STAMP)
	$(PY) -m ruff check droprig tests benchmarks
	$(PY) -m mypy

bench: sysdeps $(STAMP)
	@for f in benchmarks/bench_*.py; do echo "== $$f"; a=; [ $$f = benchmarks/bench_fuzz.py ] && a=--quick; \
		QT_QPA_PLATFORM=offscreen $(PY) $$f $$a || exit 1; done

clean:
	rm -rf $(VENV) build *.egg-info out
