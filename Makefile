# Two commands do all set-up on a fresh machine (Python 3.10+ and make):
#   make lab   - create .venv, install the workbook, open JupyterLab on the demo design
#   make test  - create .venv, install the workbook with its test extra, run every test
# Both are safe to re-run: the virtual environment is rebuilt only when pyproject.toml changes.

PYTHON ?= python3
VENV   ?= .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.installed-stamp
PORT   ?= 8888

.PHONY: lab test test-fast bench refresh-notebooks clean-venv

$(STAMP): pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -e '.[test]'
	touch $(STAMP)

# JupyterLab refuses to run as root unless told; a fresh container often is root
ROOT_FLAG := $(if $(filter 0,$(shell id -u)),--allow-root,)

lab: $(STAMP)
	$(BIN)/jupyter lab --ServerApp.root_dir=notebooks --port=$(PORT) $(ROOT_FLAG) notebooks/1-restrictor-sizing.ipynb

test: $(STAMP)
	$(BIN)/python -m pytest --nbval workbook tests notebooks

test-fast: $(STAMP)
	$(BIN)/python -m pytest workbook tests -m "not browser"

bench: $(STAMP)
	$(BIN)/python benchmarks/run.py

refresh-notebooks: $(STAMP)
	$(BIN)/python -m workbook.tools.notebooks refresh notebooks

clean-venv:
	rm -rf $(VENV)
