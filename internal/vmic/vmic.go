// Package vmic gives tests a virtual microphone on the real audio stack: a
// PulseAudio null sink whose monitor is the default input, reached by
// PortAudio through ALSA's pulse plugin. Sound played into the sink comes
// back out of the default input and never reaches a loudspeaker.
//
// It is test support only: it runs scripts/vmic-start and the pulseaudio
// utilities, and fails (never skips) the test when they cannot run,
// because `make test` installs them.
package vmic

import (
	"bytes"
	"errors"
	"fmt"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"syscall"
	"testing"
)

// Sink is the null sink sound is played into; Source is its monitor, the
// default input while the virtual microphone is up.
const (
	Sink   = "fifthline_vmic"
	Source = Sink + ".monitor"
)

var started struct {
	sync.Mutex
	line string // vmic-start's report once it has succeeded
}

// Script is the path of a script in the repository's scripts folder.
func Script(name string) string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "..", "scripts", name)
}

// Ensure makes the virtual microphone the default input and speaker,
// starting PulseAudio if needed; it fails the test if it cannot. It runs
// scripts/vmic-start once per test binary and returns its one-line report.
func Ensure(t testing.TB) string {
	t.Helper()
	started.Lock()
	defer started.Unlock()
	if started.line == "" {
		var stderr bytes.Buffer
		cmd := exec.Command(Script("vmic-start"))
		cmd.Stderr = &stderr
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("virtual microphone: %s: %v: %s", Script("vmic-start"), err, strings.TrimSpace(stderr.String()))
		}
		started.line = strings.TrimSpace(string(out))
	}
	return started.line
}

// Play plays a sound file into the null sink in the background, where
// nothing can hear it; wait blocks until playback ends. The player is
// killed if the test ends first.
func Play(t testing.TB, path string) (wait func() error) {
	t.Helper()
	_, wait = background(t, "paplay", "--device="+Sink, path)
	return wait
}

// Record records the null sink's monitor (what is played into it, or what
// a drone sends to the default output) into a WAV file until stop is called.
func Record(t testing.TB, path string) (stop func() error) {
	t.Helper()
	cmd, wait := background(t, "parecord", "--device="+Source, "--file-format=wav", path)
	return func() error {
		// An interrupt lets parecord finish the WAV header, as Ctrl-C does.
		_ = cmd.Process.Signal(syscall.SIGINT)
		err := wait()
		var ee *exec.ExitError
		if errors.As(err, &ee) && !ee.Exited() {
			return nil // ended by our interrupt, as asked
		}
		return err
	}
}

// background starts a pulseaudio utility and kills it when the test ends.
func background(t testing.TB, name string, args ...string) (*exec.Cmd, func() error) {
	t.Helper()
	cmd := exec.Command(name, args...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatalf("virtual microphone: %s: %v (apt-get install pulseaudio-utils)", name, err)
	}
	var once sync.Once
	var werr error
	wait := func() error {
		once.Do(func() {
			if werr = cmd.Wait(); werr != nil && stderr.Len() > 0 {
				werr = fmt.Errorf("%s: %w: %s", name, werr, strings.TrimSpace(stderr.String()))
			}
		})
		return werr
	}
	t.Cleanup(func() {
		_ = cmd.Process.Kill()
		_ = wait()
	})
	return cmd, wait
}
