# Two commands do all set-up on a fresh machine: `make demo` and `make test`.
# Each creates .venv when missing and installs the package with its dependencies.
PYTHON ?= python3
VENV := .venv
PY := $(VENV)/bin/python
STAMP := $(VENV)/.installed-stamp

.PHONY: demo lint test bench mutation tex clean-venv

$(STAMP): pyproject.toml
	test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install -q --upgrade pip
	$(PY) -m pip install -q -e ".[test]"
	$(PY) -m isolation.app.workbook_saving
	touch $(STAMP)

demo: $(STAMP)
	$(PY) -m isolation demo

# Static checks: ruff (pyflakes, pycodestyle, import order, bugbear) over the repository,
# mypy over the package; settings in pyproject.toml.
lint: $(STAMP)
	$(VENV)/bin/ruff check .
	$(PY) -m mypy

test: lint
	$(PY) -m pytest -q

bench: $(STAMP)
	$(PY) -m benchmarks

# Mutation testing (mutmut) of the numeric core, one module at a time in .mutation/<module>/;
# hours for all of them, so not in CI. Choose modules: make mutation MODULES="codes/asce7 site/spectra"
mutation: $(STAMP)
	$(PY) -m pip install -q -e ".[mutation]"
	$(PY) -m mutation $(MODULES)

# The LaTeX report engine (--engine latex) needs XeLaTeX and pandoc (Debian packages, about 0.7 GB);
# the default engine, Typst, comes from PyPI with the package.
tex:
	apt-get update -q && DEBIAN_FRONTEND=noninteractive apt-get install -y -q \
	  texlive-xetex texlive-fonts-recommended texlive-plain-generic texlive-latex-extra pandoc poppler-utils

clean-venv:
	rm -rf $(VENV)
