# Lixiv build and test entry points. `make serve` and `make test` are the two
# commands the README promises; both set up what they need themselves.

GO      ?= go
GOROOT  := $(shell $(GO) env GOROOT)
WASMEXEC := $(GOROOT)/lib/wasm/go_js_wasm_exec
ADDR    ?= 127.0.0.1:8080
DIST    := web/dist
ENGINE_PKGS = $$($(GO) list ./engine/... | grep -v /cmd/)

.PHONY: all build serve test vet unit wasmtest fuzz browser browser-timing browser-profile shots chromium bench deps-check validation clean

all: build

# build: the page (vugu components, wasm bundle, static assets) into web/dist.
build:
	bash scripts/build.sh $(DIST)

serve: build
	$(GO) run ./engine/cmd/lixiv serve -addr $(ADDR) -dir $(DIST)

# test: the gate. Deterministic: every test, and every fuzz target's seed
# corpus and committed findings (testdata/fuzz/, replayed by plain go test),
# with no random exploration; that is `make fuzz`.
test: vet deps-check unit wasmtest browser

vet:
	$(GO) vet ./...

# deps-check: the engine never imports syscall/js, vugu or the page.
deps-check:
	@bad=$$($(GO) list -deps ./engine/... | grep -E '^(syscall/js|github.com/vugu/|lixiv/web|lixiv/wasm)' || true); \
	if [ -n "$$bad" ]; then echo "engine/ must stay pure Go, but imports: $$bad"; exit 1; fi; echo "deps-check: engine is pure Go"

# The -timeout of unit, wasmtest and browser is a hang guard only, far above
# their usual minutes, so that a machine busy with other work never ends a
# run that would pass.
unit:
	$(GO) test -count=1 -timeout 60m ./...

# wasmtest: the engine tests again (and the plots' DOM-free tests), compiled to
# WebAssembly and run in Node, with the soft memory limit the page sets
# (wasm/main_wasm.go): without it the heap of a WebAssembly test process grows
# towards the 4 GB a 32-bit memory holds. Left to the native run: the
# simulation-based calibrations (TestValidation*), whose check is a property
# of the method, and TestStoredResultsReproduce, whose check of the stored
# results TestQuickPassRefinesToTheSameResults makes here for every budget
# file too; the page's own package runs in WebAssembly in the browser tests.
# A WebAssembly test process has one thread, so the notebook package's
# slowest tests (WASM_HALF) run in a process of their own beside the rest.
WASM_HALF = ^(TestQuickPassRefinesToTheSameResults|TestUnapportionedSamplesAreNamed|TestQuickPassRuns|TestMineralsCellSaysWhy|TestUncertaintyBySource)$$
WASMTEST = GOMEMLIMIT=1GiB GOOS=js GOARCH=wasm $(GO) test -count=1 -timeout 60m -exec="$(WASMEXEC)"

wasmtest:
	{ $(WASMTEST) -run '$(WASM_HALF)' ./engine/notebook & a=$$!; \
		$(WASMTEST) -skip '^TestValidation|^TestStoredResultsReproduce$$|$(WASM_HALF)' $(ENGINE_PKGS) ./web/plot; b=$$?; wait $$a; a=$$?; \
		echo "wasm tests: halves exited $$a and $$b"; exit $$((a | b)); }

# fuzz: random exploration of every fuzz target, FUZZ_TOTAL (default 10m)
# shared among them; new failing inputs land in testdata/fuzz/ and are
# listed at the end. Not part of `make test`.
fuzz:
	bash scripts/fuzz.sh

chromium:
	@command -v chromium >/dev/null 2>&1 || (apt-get update && DEBIAN_FRONTEND=noninteractive apt-get install -y chromium)

# browser: chromedp tests against Debian's Chromium and the built page.
# The browser tests run in two halves at once, one browser each, which on two
# cores finishes in about two thirds of the time one after the other takes;
# BROWSER_HALF names the slower tests that make one half.
BROWSERTEST = /tmp/lixiv-browsertest.test
BROWSER_HALF = ^(TestAwkwardFilesOpenAndPaste|TestUndoInTableField|TestNoFalseDifference|TestLongRunStaysResponsive|TestFileOverTheDemoAsks|TestSavedBudgetReopens|TestOfflineReload|TestUndoRedoKeys|TestEveryExampleOpens)$$

browser: chromium build
	$(GO) vet -tags browser ./web/browsertest/
	GOOS=js GOARCH=wasm $(GO) vet ./web/... ./wasm/...
	$(GO) test -c -tags browser -o $(BROWSERTEST) ./web/browsertest/
	cd web/browsertest && { $(BROWSERTEST) -test.count=1 -test.timeout 60m -test.run '$(BROWSER_HALF)' & a=$$!; \
		$(BROWSERTEST) -test.count=1 -test.timeout 60m -test.skip '$(BROWSER_HALF)'; b=$$?; wait $$a; a=$$?; \
		echo "browser tests: halves exited $$a and $$b"; exit $$((a | b)); }

# browser-timing: first render of the demo, edit-to-repaint times and the time to
# compute the costliest budget the limits allow, printed (no assertion).
# The page is built with -tags timing, whose probes write the figures to window;
# the page users get (make build) carries none of them.
browser-timing: chromium
	LIXIV_TAGS=timing bash scripts/build.sh $(DIST)
	LIXIV_TIMING=1 $(GO) test -count=1 -tags browser -timeout 40m -run Timing -v ./web/browsertest/ | grep -E 'timing|ok|FAIL'

# shots: screenshots of the page and of each cell into $(SHOTS).
SHOTS ?= /tmp/lixiv/shots
shots: chromium build
	LIXIV_SHOTS=$(SHOTS) $(GO) test -count=1 -tags browser -timeout 5m -run Shots -v ./web/browsertest/ | grep -E 'wrote|ok|FAIL'

# validation: rerun the simulations with a known truth and rewrite the tables of
# docs/validation.md (the same tests check their thresholds in `make test`).
validation:
	@LIXIV_VALIDATION=docs/validation.md $(GO) test -count=1 -timeout 30m -run 'Validation' -v ./engine/... >/tmp/lixiv-validation.log 2>&1; \
	status=$$?; grep -E 'validation:|^(ok|FAIL|--- FAIL)' /tmp/lixiv-validation.log; exit $$status

bench:
	$(GO) test -run '^$$' -bench . -benchmem ./engine/...

clean:
	rm -rf $(DIST)

# browser-profile: a CPU profile of the page's own thread while the demo
# loads and computes, its heaviest functions printed; the page is built with
# its function names kept (heavier than the page users get).
browser-profile: chromium
	LIXIV_NAMES=1 LIXIV_TAGS=timing bash scripts/build.sh $(DIST)
	LIXIV_PROFILE=/tmp/lixiv-page.cpuprofile $(GO) test -count=1 -tags browser -timeout 20m -run TestProfileDemo -v ./web/browsertest/ | grep -E 'profile:|ok|FAIL'
	bash scripts/build.sh $(DIST)
