# modeheat: two commands do all set-up.  `make run` serves the dashboard with
# demo data; `make test` installs the test dependencies (and Chromium +
# chromedriver through .ci/ensure-browser) and runs every test on 2 workers.
PYTHON ?= python3
VENV   ?= .venv
PY     := $(VENV)/bin/python
PORT   ?= 8050
# pytest-xdist workers of `make test`
WORKERS ?= 2

.PHONY: run test test-budget docs bench bench-json bench-quick demo-data clean

$(VENV)/.installed: requirements.txt
	$(PYTHON) -m venv $(VENV) || { echo "make: '$(PYTHON) -m venv' failed; run: sudo apt-get install python3-venv" >&2; exit 1; }
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -r requirements.txt
	$(PY) -m pip install --quiet --no-deps -e .
	touch $@

$(VENV)/.test-installed: $(VENV)/.installed requirements-test.txt requirements-docs.txt
	$(PY) -m pip install --quiet -r requirements-test.txt
	touch $@

run: $(VENV)/.installed
	$(PY) -m webapp --port $(PORT)

# Without a browser (and no way to install one) every other test still runs, then `make test` fails
# naming what is missing: the browser tests are never skipped silently.
test: $(VENV)/.test-installed
	@if .ci/ensure-browser; then \
	  $(PY) -m pytest -q --headless -n $(WORKERS) --dist worksteal; \
	else \
	  $(PY) -m pytest -q --headless -n $(WORKERS) --dist worksteal -m "not browser and not budget"; \
	  echo "make test: FAILED: the browser tests did not run (Chromium/chromedriver missing, see above)" >&2; exit 1; \
	fi

docs: $(VENV)/.test-installed         ## the documentation site in build/site (no warnings allowed)
	$(VENV)/bin/mkdocs build --strict

test-budget: $(VENV)/.test-installed  ## resource checks: each page and command at its documented limits (<= 1 GB, <= 10 s)
	$(PY) -m pytest -q -m budget tests/budget

bench: $(VENV)/.test-installed        ## every performance figure (p1-p13), readable (several minutes)
	$(PY) -m bench

bench-json: $(VENV)/.test-installed   ## the same as one JSON object
	$(PY) -m bench --json

bench-quick: $(VENV)/.test-installed  ## smoke run: fewer repeats, 200 batch files
	$(PY) -m bench --quick

demo-data: $(VENV)/.installed  ## regenerate every invented demo file (deterministic)
	$(PY) sample_dos/generate.py
	$(PY) sample_dos/generate_modes.py
	$(PY) sample_dos/volumes/generate_volumes.py
	$(PY) sample_dos/generate_calorimetry.py
	$(PY) sample_dos/electronic/generate_electronic.py
	$(PY) sample_dos/phases/generate_phases.py

clean:
	rm -rf $(VENV) build *.egg-info .pytest_cache
