# acidlot: the two set-up commands and the test suites.
# SPDX-License-Identifier: GPL-3.0-or-later
#
#   make demo       install what is missing, build, run the assay on samples/
#   make check      build with -Werror and run every test, then again under
#                   AddressSanitizer + UndefinedBehaviorSanitizer
#   make valgrind   every test under valgrind (memcheck)
#   make regen      rewrite the CLI cases' expected output (review the diff)
#   make fuzz       every libFuzzer target for FUZZ_SECONDS (default 60) each
#   make bench      timing against the libcsv floor and GNU datamash

BUILD      ?= build
ASAN_BUILD ?= build-asan
FUZZ_BUILD ?= build-fuzz
FUZZ_SECONDS ?= 60
BENCH_ROWS ?= 100000 1000000 10000000
JOBS       ?= 2
DEBIAN_PACKAGES = cmake make gcc pkg-config libgsl-dev libcsv-dev libcmocka-dev \
                  libjansson-dev nettle-dev libsqlite3-dev sqlite3 libpq-dev postgresql \
                  libxlsxwriter-dev python3-openpyxl libreoffice-calc-nogui \
                  chromium poppler-utils \
                  libutf8proc-dev time strace bsdutils groff-base bc
SUDO := $(shell [ "$$(id -u)" = 0 ] || echo sudo)

.PHONY: all deps build demo check test asan valgrind regen fuzz bench install clean

all: build

# Installs only the Debian packages that are missing.
deps:
	@missing=""; for p in $(DEBIAN_PACKAGES); do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q 'install ok installed' \
	    || missing="$$missing $$p"; done; \
	if [ -n "$$missing" ]; then \
	  echo "installing:$$missing"; \
	  $(SUDO) apt-get update -qq && \
	  DEBIAN_FRONTEND=noninteractive $(SUDO) apt-get install -y -qq $$missing; \
	fi

build: deps
	cmake -S . -B $(BUILD) -DACIDLOT_WERROR=ON >/dev/null
	cmake --build $(BUILD) -j$(JOBS)

demo: build
	@echo
	@echo "== 1. standardise the titrants: acidlot standardize samples/standardisation.csv -o $(BUILD)/demo-register.csv"
	@rm -f $(BUILD)/demo-register.csv
	@$(BUILD)/acidlot standardize samples/standardisation.csv \
	  -o $(BUILD)/demo-register.csv --budget $(BUILD)/demo-budget.csv; \
	rc=$$?; echo "exit status $$rc (1: lot NaOH-0.1-2612 is rejected, as the demo intends)"; \
	[ $$rc -le 1 ]
	@echo
	@echo "== 2. the assay: acidlot assay samples/titrations.csv --spec samples/specs.csv --titrants $(BUILD)/demo-register.csv --decision guarded"
	@$(BUILD)/acidlot assay samples/titrations.csv --spec samples/specs.csv \
	  --titrants $(BUILD)/demo-register.csv --decision guarded \
	  --budget $(BUILD)/demo-budget-assay.csv --analyst "demo" \
	  -o $(BUILD)/demo-report.csv -r $(BUILD)/demo-replicates.csv; \
	rc=$$?; echo; \
	$(BUILD)/acidlot assay samples/titrations.csv --spec samples/specs.csv \
	  --titrants $(BUILD)/demo-register.csv --decision guarded \
	  --format table 2>/dev/null; echo; \
	echo "report: $(BUILD)/demo-report.csv  replicates: $(BUILD)/demo-replicates.csv"; \
	echo "record: $(BUILD)/demo-report.csv.record.json"; \
	echo "exit status $$rc (1: some lots fail or need a retest, as the demo intends)"; \
	[ $$rc -le 1 ]
	@echo
	@echo "== 3. nothing changed since: acidlot verify $(BUILD)/demo-report.csv.record.json"
	@$(BUILD)/acidlot verify --format table $(BUILD)/demo-report.csv.record.json
	@echo
	@echo "== 4. endpoints from pH curves: acidlot endpoint samples/curves.csv -o $(BUILD)/demo-endpoints.csv --plots $(BUILD)/demo-curves"
	@rm -rf $(BUILD)/demo-curves
	@$(BUILD)/acidlot endpoint samples/curves.csv -o $(BUILD)/demo-endpoints.csv \
	  --plots $(BUILD)/demo-curves; \
	rc=$$?; echo "pictures: $(BUILD)/demo-curves/*.svg"; \
	echo "exit status $$rc (1: curve AP-0952-1 stops before pH 8.1, as the demo intends)"; \
	[ $$rc -le 1 ]
	@$(BUILD)/acidlot assay samples/curves.csv --spec samples/specs.csv \
	  --rejects $(BUILD)/demo-curves-rejected.csv --format table; \
	rc=$$?; echo "exit status $$rc (1: lot AP-0952 needs a retest)"; [ $$rc -le 1 ]
	@echo
	@echo "== 5. the lab's history: the week's assay into a store, its chain verified, the orange juice charted"
	@rm -f $(BUILD)/demo-lab.db $(BUILD)/demo-lab.db-wal $(BUILD)/demo-lab.db-shm
	@$(BUILD)/acidlot assay samples/titrations.csv --spec samples/specs.csv \
	  --titrants $(BUILD)/demo-register.csv --store $(BUILD)/demo-lab.db \
	  --analyst "I. Okafor" --xlsx $(BUILD)/demo-week.xlsx >/dev/null 2>&1; \
	rc=$$?; echo "workbook: $(BUILD)/demo-week.xlsx"; [ $$rc -le 1 ]
	@$(BUILD)/acidlot verify --store $(BUILD)/demo-lab.db
	@$(BUILD)/acidlot trend --store $(BUILD)/demo-lab.db --product ORJ-NFC \
	  --format table --plot $(BUILD)/demo-trend.svg 2>/dev/null; \
	rc=$$?; echo "chart: $(BUILD)/demo-trend.svg (exit status $$rc: 1 when a point signals)"; [ $$rc -le 1 ]
	@echo
	@echo "== 6. reviewed, approved, certified: acidlot sign, then acidlot certificate --lot OJ-4471"
	@run=$$($(BUILD)/acidlot runs --store $(BUILD)/demo-lab.db --format csv 2>/dev/null | sed -n 2p | cut -d, -f2); \
	$(BUILD)/acidlot sign --store $(BUILD)/demo-lab.db --run $$run --name "T. Brandt" \
	  --role "QC reviewer" --meaning reviewed --reason "calculations and flags checked" && \
	$(BUILD)/acidlot sign --store $(BUILD)/demo-lab.db --run $$run --name "M. Sato" \
	  --role "QC manager" --meaning approved --reason "week released"
	@$(BUILD)/acidlot runs --store $(BUILD)/demo-lab.db --format table
	@$(BUILD)/acidlot certificate --store $(BUILD)/demo-lab.db --lot OJ-4471 \
	  --lab samples/lab.conf --customer "Blue Heron Juices Ltd" \
	  -o $(BUILD)/demo-certificate-OJ-4471.html
	@$(BUILD)/acidlot verify --store $(BUILD)/demo-lab.db
	@echo "certificate: $(BUILD)/demo-certificate-OJ-4471.html (open it in a browser; print to A4 or Letter)"

test: build
	cd $(BUILD) && ctest --output-on-failure -j$(JOBS)

asan: deps
	cmake -S . -B $(ASAN_BUILD) -DACIDLOT_WERROR=ON -DACIDLOT_SANITIZE=ON \
	  -DCMAKE_BUILD_TYPE=Debug >/dev/null
	cmake --build $(ASAN_BUILD) -j$(JOBS)
	cd $(ASAN_BUILD) && ASAN_OPTIONS=detect_leaks=1:abort_on_error=0 \
	  UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1 \
	  ctest --output-on-failure -j$(JOBS)

check: test asan

valgrind: build
	@command -v valgrind >/dev/null || { $(SUDO) apt-get install -y -qq valgrind; }
	cd $(BUILD) && ACIDLOT_VALGRIND=1 ctest --output-on-failure -j$(JOBS)
	@# the report's two threads (src/report.c), under helgrind's race
	@# check
	valgrind --tool=helgrind -q --error-exitcode=99 $(BUILD)/tests/test_assay >/dev/null

regen: build
	sh tests/cli/regen.sh $(BUILD)

fuzz: deps
	@for p in clang libclang-rt-14-dev; do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q 'install ok installed' \
	    || { $(SUDO) apt-get update -qq; $(SUDO) apt-get install -y -qq $$p; }; done
	CC=clang cmake -S . -B $(FUZZ_BUILD) -DACIDLOT_FUZZ=ON >/dev/null
	cmake --build $(FUZZ_BUILD) -j$(JOBS)
	sh tests/fuzz/run.sh $(FUZZ_BUILD) $(FUZZ_SECONDS)

bench: build
	@for p in datamash time bc; do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q 'install ok installed' \
	    || { $(SUDO) apt-get update -qq; $(SUDO) apt-get install -y -qq $$p; }; done
	sh bench/run.sh $(BUILD) $(BENCH_ROWS)
	sh bench/memory.sh $(BUILD)/acidlot $(BUILD)/tests/bench_gen
	sh bench/startup.sh $(BUILD)/acidlot samples
	sh bench/tables.sh $(BUILD)/acidlot
	sh bench/curves.sh $(BUILD)/acidlot
	sh bench/store.sh $(BUILD)/acidlot $(BUILD)/tests/bench_gen

# the program, the static library, its headers and acidlot.pc under
# PREFIX (default /usr/local); DESTDIR=... stages them elsewhere
install: build
	cmake --install $(BUILD) $(if $(PREFIX),--prefix $(PREFIX))

clean:
	rm -rf $(BUILD) $(ASAN_BUILD) $(FUZZ_BUILD)
