package main

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

// The takes the tests render (fluidsynth, sox, aubio) are made once per
// test binary and shared by every test that uses the same take, in a
// folder of the binary's own that TestMain removes (removeShared). A shared
// file is read, never written, by the tests that share it.
var shared struct {
	mu   sync.Mutex
	dir  string
	made map[string]*sharedTake
}

type sharedTake struct {
	once  sync.Once
	dir   string
	value any
	ok    bool // made without failing
}

// sharedOnce returns what make returns for key, calling it only the first
// time key is asked for in this test binary; key must name everything the
// take depends on. make writes its files in the folder it is given, which
// outlives the test that made it (not in t.TempDir, which does not).
func sharedOnce[T any](t testing.TB, key string, make func(dir string) T) T {
	t.Helper()
	shared.mu.Lock()
	if shared.made == nil {
		shared.made = map[string]*sharedTake{}
	}
	if shared.dir == "" {
		dir, err := os.MkdirTemp("", "fifthline-takes-")
		if err != nil {
			shared.mu.Unlock()
			t.Fatal(err)
		}
		shared.dir = dir
	}
	take := shared.made[key]
	if take == nil {
		take = &sharedTake{dir: filepath.Join(shared.dir, fmt.Sprintf("%x", sha256.Sum256([]byte(key)))[:16])}
		shared.made[key] = take
	}
	shared.mu.Unlock()
	take.once.Do(func() {
		if err := os.Mkdir(take.dir, 0o755); err != nil {
			t.Fatal(err)
		}
		take.value = make(take.dir)
		take.ok = true
	})
	if !take.ok {
		// The test that made it has failed, saying why.
		t.Fatalf("the shared take %.60q could not be made", key)
	}
	return take.value.(T)
}

// removeShared removes the shared takes' folder (from TestMain, when every
// test is done).
func removeShared() {
	if shared.dir != "" {
		os.RemoveAll(shared.dir)
	}
}

// fluidWAV renders a Standard MIDI File with Debian's fluidsynth and the
// FluidR3 soundfont (fluid-soundfont-gm), given fluidsynth's options (gain,
// rate, reverb, ...), once per test binary for the same file and options,
// and returns the WAV's path.
func fluidWAV(t testing.TB, mid []byte, options ...string) string {
	t.Helper()
	key := fmt.Sprintf("fluidsynth %q %x", options, sha256.Sum256(mid))
	return sharedOnce(t, key, func(dir string) string {
		fluid, sf2 := fluidSynth(t)
		midPath, wav := filepath.Join(dir, "take.mid"), filepath.Join(dir, "take.wav")
		if err := os.WriteFile(midPath, mid, 0o644); err != nil {
			t.Fatal(err)
		}
		if out, err := exec.Command(fluid, append(options, "-F", wav, sf2, midPath)...).CombinedOutput(); err != nil {
			t.Fatalf("fluidsynth %s: %v\n%s", strings.Join(options, " "), err, out)
		}
		return wav
	})
}

// runLong is runCLI for the long analyses of rendered takes, whose checks
// are the same either way. Under the race detector it runs the built
// command (fifthlineBinary, built without it) instead, at full speed: an
// analysis is one goroutine, where the race detector finds nothing. Its one
// concurrent path, the journal's background fsync (--log), stays raced by
// the analyze tests that call runCLI and by journal's own tests (see the
// Makefile's test target).
func runLong(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	if !raceDetector {
		return runCLI(t, args...)
	}
	cmd := exec.Command(fifthlineBinary(t), args...)
	cmd.Stdin = strings.NewReader("")
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	var exit *exec.ExitError
	if err := cmd.Run(); errors.As(err, &exit) && exit.Exited() {
		code = exit.ExitCode()
	} else if err != nil {
		t.Fatalf("fifthline %s: %v", strings.Join(args, " "), err)
	}
	return code, out.String(), errb.String()
}
