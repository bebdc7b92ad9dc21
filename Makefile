# opwin - one plain Makefile. `make test` and `make demo` install what is
# missing (deps), build and run. Settable variables first.
CC       ?= gcc
BUILD    ?= build
PREFIX   ?= /usr/local
OPT      ?= -O2
SANFLAGS ?=
# -Werror under CI (CI=true is set by the CI runner).
WERROR   ?= $(if $(CI),-Werror,)

PKGS     := udunits libcjson cairo cairo-ft freetype2 gsl zlib
WARN     := -Wall -Wextra -Wshadow -Wconversion -Wstrict-prototypes \
            -Wmissing-prototypes -Wno-sign-conversion
# lib/'s folders, lowest layer first: a file may include the headers of its
# own folder and of those before it, never of one after it (make layers).
LAYERS   := base model config physics solve window out calib spread map \
            draw doc fit compare
LIB_DIRS := $(addprefix lib/,$(LAYERS))

CPPFLAGS += -Ilib $(addprefix -I,$(LIB_DIRS)) -Itests/support -D_POSIX_C_SOURCE=200809L -D_DEFAULT_SOURCE
CFLAGS   += -std=c11 $(OPT) -g -fopenmp $(WARN) $(WERROR) $(SANFLAGS) -MMD -MP \
            $(shell pkg-config --cflags $(PKGS) 2>/dev/null)
LDLIBS   += $(shell pkg-config --libs $(PKGS) 2>/dev/null) -lhpdf -lm
LDFLAGS  += -fopenmp $(SANFLAGS)
TEST_LIBS := $(shell pkg-config --libs cmocka 2>/dev/null)

LIB_SRC  := $(sort $(wildcard $(addsuffix /*.c,$(LIB_DIRS))))
CLI_SRC  := $(sort $(wildcard cli/*.c))
TEST_SRC := $(sort $(wildcard tests/test_*.c))
SUP_SRC  := $(sort $(wildcard tests/support/*.c))
LIB_OBJ  := $(LIB_SRC:%.c=$(BUILD)/%.o)
CLI_OBJ  := $(CLI_SRC:%.c=$(BUILD)/%.o)
SUP_OBJ  := $(SUP_SRC:%.c=$(BUILD)/%.o)
TESTS    := $(TEST_SRC:tests/%.c=$(BUILD)/tests/%)
LIBA     := $(if $(filter build,$(BUILD)),lib/libopwin.a,$(BUILD)/libopwin.a)
OPWIN    := $(BUILD)/opwin

# Debian packages (verified on a fresh Debian 12).
APT_PKGS := build-essential pkg-config libcjson-dev libudunits2-dev \
            libcairo2-dev libhpdf-dev libcmocka-dev libgsl-dev zlib1g-dev \
            fonts-dejavu-core poppler-utils valgrind
FONT     := /usr/share/fonts/truetype/dejavu/DejaVuSans.ttf

.SECONDARY:
.PHONY: all deps test check-run demo bench sanitize memcheck mutate lint format clean install \
        layers format-deps format-check \
        fuzz fuzz-deps fuzz-run

all: $(LIBA) $(OPWIN)

# Install only when something is missing; re-read pkg-config afterwards by
# running the real work in a sub-make.
deps:
	@missing=0; \
	for p in $(PKGS) cmocka; do pkg-config --exists $$p || missing=1; done; \
	[ -f /usr/include/hpdf.h ] || missing=1; \
	[ -f $(FONT) ] || missing=1; \
	command -v pdftotext >/dev/null || missing=1; \
	command -v valgrind >/dev/null || missing=1; \
	if [ $$missing = 1 ]; then \
	  echo "deps: installing missing Debian packages"; \
	  apt-get update -qq && \
	  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq \
	    --no-install-recommends $(APT_PKGS) >/dev/null || exit 1; \
	fi

# Rebuilt whole, so members of deleted sources never linger.
$(LIBA): $(LIB_OBJ)
	@mkdir -p $(dir $@)
	@rm -f $@
	$(AR) rcs $@ $^

$(OPWIN): $(CLI_OBJ) $(LIBA)
	$(CC) $(LDFLAGS) -o $@ $(CLI_OBJ) $(LIBA) $(LDLIBS)

$(BUILD)/%.o: %.c
	@mkdir -p $(dir $@)
	$(CC) $(CPPFLAGS) $(CFLAGS) -c -o $@ $<

# Tests write under their own build folder.
$(BUILD)/tests/%.o: CPPFLAGS += -DOW_TEST_OUT='"$(BUILD)/tests"'

$(BUILD)/tests/%: $(BUILD)/tests/%.o $(SUP_OBJ) $(LIBA)
	$(CC) $(LDFLAGS) -o $@ $< $(SUP_OBJ) $(LIBA) $(LDLIBS) $(TEST_LIBS)

test: deps
	@$(MAKE) --no-print-directory check-run

check-run: all $(TESTS) layers
	@OPWIN=$(OPWIN) sh tests/run.sh $(TESTS)

demo: deps
	@$(MAKE) --no-print-directory all
	@sh demo/run.sh $(OPWIN)

bench: all $(BUILD)/bench
	@$(BUILD)/bench demo/study-si.json demo/line/line3-readings.csv $(OPWIN)

$(BUILD)/bench: $(BUILD)/tests/bench/bench.o $(LIBA)
	$(CC) $(LDFLAGS) -o $@ $< $(LIBA) $(LDLIBS)

# ASan + UBSan build in its own folder, running every test.
sanitize: deps
	@$(MAKE) --no-print-directory BUILD=build-san OPT=-O1 \
	  SANFLAGS="-fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined" \
	  check-run

# Mutation run (slow, not part of test): each single mutation of
# tests/mutate/mutations on a copy of the tree, the named fast test
# programs run on it (MUTATE_ALL=1: every test program); prints the share
# caught and the survivors. MUTATE_TREE judges another tree's tests.
mutate: deps
	@sh tests/mutate/run.sh $(if $(MUTATE_ALL),--all-tests,) $(MUTATE_TREE)

# libFuzzer targets (tests/fuzz/) with ASan + UBSan, built with clang in
# build-fuzz/; each runs FUZZ_S seconds from seeds taken from fixtures/,
# tests/bad/, tests/data/ and demo/. A finding stops with its input saved
# as build-fuzz/fuzz/crash-* (or leak-*, timeout-*).
FUZZ_S   ?= 60
FUZZERS  := study units csv

fuzz-deps: deps
	@command -v clang >/dev/null && [ -f /usr/lib/llvm-$$(clang -dumpversion | cut -d. -f1)/lib/libomp.so ] || { \
	  echo "fuzz: installing clang"; apt-get update -qq && \
	  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq \
	    --no-install-recommends clang libomp-dev >/dev/null; }

fuzz: fuzz-deps
	@$(MAKE) --no-print-directory BUILD=build-fuzz CC=clang OPT=-O1 WERROR= \
	  SANFLAGS="-fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined" \
	  fuzz-run

$(BUILD)/fuzz/fuzz_%: tests/fuzz/fuzz_%.c $(LIBA)
	@mkdir -p $(dir $@)
	$(CC) $(CPPFLAGS) $(CFLAGS) -fsanitize=fuzzer -o $@ $< $(LIBA) \
	  $(LDFLAGS) -fsanitize=fuzzer $(LDLIBS)

fuzz-run: $(FUZZERS:%=$(BUILD)/fuzz/fuzz_%)
	@sh tests/fuzz/run.sh $(BUILD)/fuzz $(FUZZ_S) $(FUZZERS)

# valgrind on the command line: no invalid access, no definite leak.
VALGRIND := valgrind -q --leak-check=full --show-leak-kinds=definite \
            --errors-for-leak-kinds=definite \
            --error-exitcode=9
memcheck: deps
	@$(MAKE) --no-print-directory all
	$(VALGRIND) $(OPWIN) check demo/study-si.json >/dev/null
	$(VALGRIND) $(OPWIN) point demo/study-si.json --rpm 60 --json >/dev/null
	$(VALGRIND) $(OPWIN) map tests/data/map-fast.json -o build/memcheck-map \
	  --grid 4x4 --refine 1 --jobs 1 --quiet
	$(VALGRIND) $(OPWIN) map tests/data/map-fast.json -o build/memcheck-spread \
	  --grid 3x3 --jobs 1 --spread "viscosity_scale=0.9..1.1" --samples 4 --quiet
	$(VALGRIND) $(OPWIN) calibrate demo/study-si.json demo/line/line3-readings.csv \
	  --free viscosity_scale -o build/memcheck-calibrated.json --jobs 1 --quiet >/dev/null
	$(VALGRIND) $(OPWIN) report build/memcheck-map --units us --revision B \
	  --current 40,200 >/dev/null
	$(VALGRIND) $(OPWIN) compare tests/data/map-fast.json tests/data/map-fast.json \
	  -o build/memcheck-compare --grid 3x3 --jobs 1 --quiet
	@echo "memcheck: clean"

lint:
	cppcheck --quiet --enable=warning,performance,portability \
	  --error-exitcode=1 --inline-suppr -Ilib $(addprefix -I,$(LIB_DIRS)) \
	  lib cli

# No file of lib/ includes a header of a later folder of LAYERS.
layers:
	@sh tests/layers.sh $(LAYERS)

# clang-format with the repository's .clang-format over lib, cli and tests
# (installs clang-format when it is missing, like deps).
FORMAT_SRC = $(sort $(wildcard lib/*.h lib/*/*.[ch] cli/*.[ch] tests/*.c \
                               tests/*/*.[ch]))

format-deps:
	@command -v clang-format >/dev/null || { \
	  echo "format: installing clang-format"; apt-get update -qq && \
	  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq \
	    --no-install-recommends clang-format >/dev/null; }

format: format-deps
	clang-format -i $(FORMAT_SRC)

# Fails on any file clang-format would change (CI runs it).
format-check: format-deps
	@clang-format --dry-run -Werror $(FORMAT_SRC)
	@echo "format-check: $(words $(FORMAT_SRC)) files as clang-format writes them"

clean:
	rm -rf build build-san build-fuzz lib/libopwin.a

install: all
	install -d $(DESTDIR)$(PREFIX)/bin $(DESTDIR)$(PREFIX)/lib \
	  $(DESTDIR)$(PREFIX)/include/opwin
	install -m 755 $(OPWIN) $(DESTDIR)$(PREFIX)/bin/opwin
	install -m 644 $(LIBA) $(DESTDIR)$(PREFIX)/lib/libopwin.a
	install -m 644 lib/*/ow_*.h lib/opwin.h $(DESTDIR)$(PREFIX)/include/opwin
	install -d $(DESTDIR)$(PREFIX)/share/man/man1
	install -m 644 doc/opwin.1 $(DESTDIR)$(PREFIX)/share/man/man1/opwin.1

-include $(LIB_OBJ:.o=.d) $(CLI_OBJ:.o=.d) $(SUP_OBJ:.o=.d) \
         $(TESTS:=.d) $(BUILD)/tests/bench/bench.d
