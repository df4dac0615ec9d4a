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
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"sync/atomic"
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
		// The machine's daemon, even if a test has pointed this process elsewhere.
		for _, kv := range os.Environ() {
			if !strings.HasPrefix(kv, "PULSE_SERVER=") && !strings.HasPrefix(kv, "PULSE_SINK=") && !strings.HasPrefix(kv, "PULSE_SOURCE=") {
				cmd.Env = append(cmd.Env, kv)
			}
		}
		cmd.Stderr = &stderr
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("virtual microphone: %s: %v: %s", Script("vmic-start"), err, strings.TrimSpace(stderr.String()))
		}
		started.line = strings.TrimSpace(string(out))
	}
	return started.line
}

// Private is a null sink of one test's own, so test binaries running at
// the same time do not hear each other.
type Private struct {
	Sink, Source string
	ChannelMap   []string // IsolateChannels' channels; nil for PulseAudio's default stereo
	t            testing.TB
	module       string
	removed      bool
}

var privateCount atomic.Int64

// Isolate gives the test a null sink of its own and makes it this
// process's default sink and source (PULSE_SINK and PULSE_SOURCE, which
// libpulse and so the ALSA pulse plugin honour) until the test ends; Play
// and Record follow it. Not for parallel tests: it sets the environment.
func Isolate(t testing.TB) *Private {
	t.Helper()
	return isolate(t, private(t))
}

// IsolateChannels is Isolate with a sink of several channels, named in
// PulseAudio's channel map (front-left, front-right, rear-left, ...), so a
// test can play one sound per channel (PlayChannels) and read them back as
// a multichannel interface's inputs.
func IsolateChannels(t testing.TB, channelMap ...string) *Private {
	t.Helper()
	return isolate(t, PrivateChannels(t, channelMap...))
}

// isolate makes p this process's default sink and source until the test
// ends.
func isolate(t testing.TB, p *Private) *Private {
	t.Setenv("PULSE_SINK", p.Sink)
	t.Setenv("PULSE_SOURCE", p.Source)
	return p
}

// PrivateChannels is IsolateChannels for parallel tests: it leaves this
// process's environment alone, and the test hands Env to the processes
// that are to use the sink.
func PrivateChannels(t testing.TB, channelMap ...string) *Private {
	t.Helper()
	p := private(t, fmt.Sprintf("channels=%d", len(channelMap)), "channel_map="+strings.Join(channelMap, ","))
	p.ChannelMap = channelMap
	return p
}

// Env makes a process's default sink and source the private sink and its
// monitor (for exec.Cmd.Env, after os.Environ()).
func (p *Private) Env() []string {
	return []string{"PULSE_SINK=" + p.Sink, "PULSE_SOURCE=" + p.Source}
}

func private(t testing.TB, args ...string) *Private {
	t.Helper()
	Ensure(t)
	p := &Private{t: t, Sink: fmt.Sprintf("%s_%d_%d", Sink, os.Getpid(), privateCount.Add(1))}
	p.Source = p.Sink + ".monitor"
	load := append([]string{"load-module", "module-null-sink", "sink_name=" + p.Sink, "rate=48000"}, args...)
	p.module = strings.TrimSpace(pactl(t, load...))
	t.Cleanup(p.Remove)
	return p
}

// Remove unloads the sink now. Removing twice is harmless. (Streams
// reading its monitor are moved to the default source by PulseAudio; to
// take a device away from a reader, use Disconnect.)
func (p *Private) Remove() {
	if !p.removed {
		p.removed = true
		pactl(p.t, "unload-module", p.module)
	}
}

// Suspend stops the private sink and so its monitor: a stream reading it
// gets no more audio, as from a device that has gone away.
func (p *Private) Suspend() {
	p.t.Helper()
	pactl(p.t, "suspend-sink", p.Sink, "1")
}

func pactl(t testing.TB, args ...string) string {
	t.Helper()
	out, err := exec.Command("pactl", args...).CombinedOutput()
	if err != nil {
		t.Fatalf("virtual microphone: pactl %s: %v: %s", strings.Join(args, " "), err, out)
	}
	return string(out)
}

// current is the sink in use: the test's private one, else the shared one.
func current() (sink, source string) {
	if s := os.Getenv("PULSE_SINK"); strings.HasPrefix(s, Sink) {
		return s, s + ".monitor"
	}
	return Sink, Source
}

// Play plays a sound file into the current null sink in the background,
// where nothing can hear it; wait blocks until playback ends. The player
// is killed if the test ends first.
func Play(t testing.TB, path string) (wait func() error) {
	t.Helper()
	sink, _ := current()
	_, wait = background(t, "paplay", "--device="+sink, path)
	return wait
}

// PlayChannels plays a file of len(p.ChannelMap) channels into the private
// sink with the sink's own channel map, so that PulseAudio, whose streams
// are remixed whenever their map differs from the sink's, puts channel k
// of the file on channel k of the sink.
func (p *Private) PlayChannels(path string) (wait func() error) {
	p.t.Helper()
	_, wait = background(p.t, "paplay", "--device="+p.Sink, "--channel-map="+strings.Join(p.ChannelMap, ","), path)
	return wait
}

// Record records the current null sink's monitor (what is played into it,
// or what a drone sends to the default output) into a WAV file until stop
// is called.
func Record(t testing.TB, path string) (stop func() error) {
	t.Helper()
	_, source := current()
	cmd, wait := background(t, "parecord", "--device="+source, "--latency-msec=20", "--file-format=wav", path)
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
