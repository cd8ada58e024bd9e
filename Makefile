# modeheat: two commands do all set-up.  `make run` serves the dashboard with
# demo data; `make test` installs the test dependencies and runs every test.
PYTHON ?= python3
VENV   ?= .venv
PY     := $(VENV)/bin/python
PORT   ?= 8050

.PHONY: run test bench demo-data clean

$(VENV)/.installed: requirements.txt
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -r requirements.txt
	$(PY) -m pip install --quiet --no-deps -e .
	touch $@

$(VENV)/.test-installed: $(VENV)/.installed requirements-test.txt
	$(PY) -m pip install --quiet -r requirements-test.txt
	touch $@

run: $(VENV)/.installed
	$(PY) -m webapp --port $(PORT)

test: $(VENV)/.test-installed
	$(PY) -m pytest -q --headless

bench: $(VENV)/.test-installed
	$(PY) -m bench

demo-data: $(VENV)/.installed
	$(PY) sample_dos/generate.py

clean:
	rm -rf $(VENV) build *.egg-info .pytest_cache
