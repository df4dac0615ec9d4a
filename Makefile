# fifthline — `make demo` and `make test` do all the set-up on a fresh Debian
# machine: they install the missing Debian packages first.

GO     ?= $(shell command -v go || echo /usr/local/go/bin/go)
BIN    := bin/fifthline
export PATH := $(PATH):/usr/local/go/bin

# Where 'make install' puts the program: PREFIX/bin/fifthline. The default,
# ~/.local/bin, needs no root; 'sudo make install PREFIX=/usr/local' puts it
# in /usr/local/bin for everyone.
PREFIX  ?= $(HOME)/.local
VERSION := $(shell git describe --tags --always --dirty 2>/dev/null || echo unknown)

.PHONY: all deps build install uninstall demo test vet fuzz bench clean

all: build

deps:
	@scripts/install-deps

build: deps
	$(GO) build -ldflags "-X main.version=$(VERSION)" -o $(BIN) ./cmd/fifthline

install: build
	install -D -m 755 $(BIN) $(DESTDIR)$(PREFIX)/bin/fifthline
	@echo "installed $(DESTDIR)$(PREFIX)/bin/fifthline ($(VERSION))"
	@case ":$$PATH:" in *":$(PREFIX)/bin:"*) ;; *) echo "note: $(PREFIX)/bin is not on your PATH; add it, e.g. in ~/.profile: PATH=\"$(PREFIX)/bin:\$$PATH\"";; esac

uninstall:
	rm -f $(DESTDIR)$(PREFIX)/bin/fifthline

# The meter on the embedded demo performance; q quits.
demo: build
	@$(BIN) demo

# Everything CI checks: formatting, vet, the virtual microphone, the race-
# enabled test suite (with its real PortAudio, PulseAudio, sox, aubio and
# tmux paths). Under -race, cmd/fifthline's long analyses of rendered takes
# (runLong in render_test.go: the fluidsynth scales and keyboard, legato
# runs, ensemble takes, voices mixes, the sagging quartet, the chord
# reports) run the command built without the race detector, which made them
# eight to ten times slower (analyze --players on a 16 s quartet: 30 s, not
# 2.9 s) and finds nothing there: an analysis is one goroutine.
# Its one concurrent path, the journal's background fsync (--log), stays
# raced by journal's own tests and the in-process analyze tests
# (TestAnalyzePlayersReadsEachFromTheirOwnChannel, recorded_test,
# report_test), as do --players, --voices and --chords on short sox takes.
# The checks are the same either way. fluidsynth renders each take once per
# test binary, and the tests that wait on those analyses or on sound playing
# in real time run in parallel, four at a time (-parallel 4; only
# cmd/fifthline has parallel tests): most of the live ones wait on playback,
# not the two cores.
# The packages in RACEFREE start no goroutine, in their code or their
# tests (an estimator is one loop over one channel), so the race detector
# has nothing to watch there; it only made their accuracy scenes ten
# times slower (multipitch: 593 s, 215 s of CPU, under -race; 69 s, 21 s
# of CPU, without; load average 11 on the two cores). They run without it,
# beside the raced run of the rest, and either run's failure fails make
# test. A package that starts a goroutine leaves RACEFREE (multipitch's
# TestThePackageStartsNoGoroutine says so). go test -race ./... still
# races them all. cmd/fifthline's run took 1047 s with both cores kept busy
# by two other processes (measured), so its timeout leaves room above 20 min.
RACEFREE := fifthline/multipitch
test: deps vet
	@scripts/vmic-start
	$(GO) test -count=1 -timeout 20m $(RACEFREE) & racefree=$$!; \
	$(GO) test -race -count=1 -parallel 4 -timeout 30m $$($(GO) list ./... | grep -vxF $(foreach p,$(RACEFREE),-e '$(p)')); \
	raced=$$?; wait $$racefree && exit $$raced

# The pure core builds without cgo (and so without PortAudio's headers).
CORE := ./source/ ./target/ ./pitchdetect/ ./session/ ./journal/ ./report/ ./drone/ ./ui/ ./harmony/

vet:
	@out=$$(gofmt -l $$(git ls-files '*.go' 2>/dev/null || find . -name '*.go')); \
		if [ -n "$$out" ]; then echo "gofmt would change: $$out"; exit 1; fi
	CGO_ENABLED=0 $(GO) build $(CORE)
	$(GO) vet ./...

# Short runs of every fuzz target (FUZZTIME each).
FUZZTIME ?= 20s
fuzz:
	@for pkg in $$($(GO) list ./...); do \
		for f in $$($(GO) test -list '^Fuzz' $$pkg | grep '^Fuzz'); do \
			echo "fuzz $$pkg $$f"; $(GO) test -run XXX -fuzz "^$$f$$" -fuzztime $(FUZZTIME) $$pkg || exit 1; \
		done; \
	done

# Speed, memory and accuracy, side by side with aubio on the same files; then
# the live path's CPU, memory and onset-to-reading time through the virtual
# microphone, and the meter's cost on screen; four players offline on one
# core, live on a 4-channel virtual interface, and a soak of continuous
# 4-channel input lasting SOAK (make bench SOAK=1h for the full one), and
# the memory --chords keeps over CHORDS_SOAK of 4-channel input read from memory.
SOAK ?= 3m
CHORDS_SOAK ?= 10m
bench: deps
	$(GO) test -run XXX -bench . -benchmem ./pitchdetect/
	$(GO) test -run XXX -bench RecordingRead ./capture/
	$(GO) run ./cmd/fifthbench
	$(GO) test -run XXX -bench . ./multipitch/
	$(GO) run ./cmd/chordbench
	GOMAXPROCS=1 $(GO) test -run XXX -bench ReadQuartet ./ensemble/
	@scripts/vmic-start
	$(GO) test -run XXX -bench 'ListenPlainLive|ListenVoices|ListenMeter|DemoMeterInTmux|AnalyzePlayers|ListenPlayers' -benchtime 1x -timeout 0 ./cmd/fifthline/ -soak $(SOAK)
	$(GO) test -run XXX -bench 'PlayerDroneUnderMicrophone' -benchtime 1x ./playback/
	$(GO) test -run XXX -bench 'LiveChordsMemory' -benchtime 1x -timeout 0 ./cmd/fifthline/ -chords-soak $(CHORDS_SOAK)

clean:
	rm -rf bin
