# Two commands do all set-up on a fresh machine (Python 3.10+ and make):
#   make lab   - create .venv, install the workbook, open JupyterLab on the demo design
#   make test  - create .venv, install the workbook with its test extra, run every test
# Both are safe to re-run: the virtual environment is rebuilt only when pyproject.toml changes.

PYTHON ?= python3
VENV   ?= .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.installed-stamp
PORT   ?= 8888

.PHONY: lab test test-fast fuzz bench refresh-notebooks demo-records mutation clean-venv

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

# the long fuzz profile of tests/test_fuzz.py (a nightly or manual run; the counts go to fuzz-stats.json)
fuzz: $(STAMP)
	WORKBOOK_FUZZ=long WORKBOOK_KILL_ROUNDS=400 WORKBOOK_FUZZ_STATS=fuzz-stats.json \
		$(BIN)/python -m pytest tests/test_fuzz.py tests/test_hardening.py -p no:cacheprovider -q

bench: $(STAMP)
	$(BIN)/python benchmarks/run.py

refresh-notebooks: $(STAMP)
	$(BIN)/python -m workbook.tools.notebooks refresh notebooks

# The demo's design records (revisions A and B of the bin tipper), committed under
# notebooks/records/ as a design team commits its own. Revision A fails its tip axis (exit 1).
demo-records: $(STAMP)
	$(BIN)/axisbook evaluate notebooks/designs/bin-tipper.toml --out notebooks/records || [ $$? -eq 1 ]
	$(BIN)/axisbook evaluate notebooks/designs/bin-tipper-rev-b.toml --out notebooks/records

# Mutation testing (not part of `make test`: it runs the fast tests once per mutant). mutmut 2
# edits the files it mutates, so it runs on a copy of the tree in $(MUTATION_DIR); the
# configuration is [tool.mutmut] in pyproject.toml. MUTATION_PATCH=<file> limits the run to
# the lines of a patch. Survivors judged harmless are listed in tests/mutation-equivalent.txt.
MUTATION_DIR ?= /tmp/axisbook-mutation
mutation: $(STAMP)
	rm -rf $(MUTATION_DIR) && mkdir -p $(MUTATION_DIR)
	cp -r workbook tests pyproject.toml $(MUTATION_DIR)/
	cd $(MUTATION_DIR) && PATH=$(abspath $(BIN)):$$PATH $(abspath $(BIN))/mutmut run --no-progress \
		$(if $(MUTATION_PATCH),--use-patch-file $(abspath $(MUTATION_PATCH))) || true
	cd $(MUTATION_DIR) && $(abspath $(BIN))/mutmut results

clean-venv:
	rm -rf $(VENV)
