# Two commands do all set-up on a fresh machine (Python 3.10+ and make):
#   make lab   - create .venv, install the workbook, open JupyterLab on the demo design
#   make test  - create .venv, install the workbook with its test extra, run every test
# Both are safe to re-run: the virtual environment is rebuilt only when pyproject.toml changes.

PYTHON ?= python3
VENV   ?= .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.installed-stamp
PORT   ?= 8888

.PHONY: lab test test-fast fuzz bench refresh-notebooks demo-records design-guide mutation clean-venv

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

# The guide to the design file (notebooks/designs/README.md), rendered from the catalogue in
# workbook/inputs.py; tests/test_design_guide.py fails until it is rerun after a field changes.
design-guide: $(STAMP)
	$(BIN)/python -m workbook.tools.design_guide notebooks/designs/README.md

# The demo's design records (revisions A and B of the bin tipper), committed under
# notebooks/records/ as a design team commits its own. Revision A fails (exit 1): tip ratings, lift buckling at its stop.
demo-records: $(STAMP)
	$(BIN)/axisbook evaluate notebooks/designs/bin-tipper.toml --out notebooks/records || [ $$? -eq 1 ]
	$(BIN)/axisbook evaluate notebooks/designs/bin-tipper-rev-b.toml --out notebooks/records

# Mutation testing (not part of `make test`: it runs fast tests once per mutant; see
# DEVELOPERS.md, "Mutation testing"). mutmut 2 edits the files it mutates, so it runs on a copy
# of the tree in $(MUTATION_DIR); the configuration is [tool.mutmut] in pyproject.toml.
#   MUTATION_PATHS=workbook/checks.py,workbook/units.py  mutate only these (default: all of [tool.mutmut])
#   MUTATION_RUNNER='python -m pytest -x -q ...'         a narrower test command for those modules
#   MUTATION_PATCH=<file>                                mutate only the lines a patch adds or changes
#   MUTATION_ONLY='workbook/valve.py:CounterbalanceValve,BackPressureValve workbook/checks.py'
#                                                        mutate only these functions / classes / modules
#                                                        (tests/mutation_patch.py writes the patch)
#   MUTATION_KEEP=1                                      keep the last run's cache: killed mutants stay
#                                                        killed, only survivors and untested ones re-run
# Pytest plugins are not loaded (PYTEST_DISABLE_PLUGIN_AUTOLOAD): a run then costs about a second
# per mutant. The last step counts killed / survived / equivalent per module and lists the
# survivors that tests/mutation-equivalent.txt does not explain.
MUTATION_DIR ?= /tmp/axisbook-mutation
comma := ,
mutation: $(STAMP)
	mkdir -p $(MUTATION_DIR)
	$(if $(MUTATION_KEEP),,rm -f $(MUTATION_DIR)/.mutmut-cache)
	rm -rf $(MUTATION_DIR)/workbook $(MUTATION_DIR)/tests $(MUTATION_DIR)/notebooks
	cp -r workbook tests pyproject.toml $(MUTATION_DIR)/
	mkdir -p $(MUTATION_DIR)/notebooks && cp -r notebooks/designs $(MUTATION_DIR)/notebooks/
	find $(MUTATION_DIR) -name __pycache__ -prune -exec rm -rf {} +
	$(if $(MUTATION_ONLY),cd $(MUTATION_DIR) && $(abspath $(BIN))/python tests/mutation_patch.py only.patch $(MUTATION_ONLY))
	cd $(MUTATION_DIR) && PYTEST_DISABLE_PLUGIN_AUTOLOAD=1 PATH=$(abspath $(BIN)):$$PATH \
		$(abspath $(BIN))/mutmut run --no-progress --simple-output \
		$(if $(MUTATION_PATHS),--paths-to-mutate $(MUTATION_PATHS)) \
		$(if $(MUTATION_RUNNER),--runner "$(MUTATION_RUNNER)") \
		$(if $(MUTATION_PATCH),--use-patch-file $(abspath $(MUTATION_PATCH))) \
		$(if $(MUTATION_ONLY),--use-patch-file only.patch) || true
	cd $(MUTATION_DIR) && $(abspath $(BIN))/python tests/mutation_survivors.py \
		$(abspath tests/mutation-equivalent.txt) $(subst $(comma), ,$(MUTATION_PATHS))

clean-venv:
	rm -rf $(VENV)
