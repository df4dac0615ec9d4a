package vmic

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// Server is a PulseAudio daemon of one test's own, with the virtual
// microphone's null sink, so the test can make the whole sound server
// vanish (Kill) without disturbing anyone else's.
type Server struct {
	Dir string // runtime folder: socket, pid file, log
	t   testing.TB
	pid int
}

// StartServer starts a private daemon and points this process at it
// (PULSE_SERVER, PULSE_SINK, PULSE_SOURCE) until the test ends, when the
// daemon is stopped. Not for parallel tests: it sets the environment.
func StartServer(t testing.TB) *Server {
	t.Helper()
	// A short folder: socket paths are limited to 108 bytes.
	dir, err := os.MkdirTemp("", "fifthline-pa-")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(dir) })
	s := &Server{Dir: dir, t: t}
	socket := filepath.Join(dir, "native")
	cmd := exec.Command("pulseaudio", "--daemonize=yes", "-n", "--exit-idle-time=-1", "--use-pid-file=yes",
		"--log-target=file:"+filepath.Join(dir, "log"),
		"--load=module-null-sink sink_name="+Sink+" rate=48000",
		"--load=module-native-protocol-unix socket="+socket)
	cmd.Env = append(os.Environ(), "PULSE_RUNTIME_PATH="+filepath.Join(dir, "run"), "PULSE_STATE_PATH="+filepath.Join(dir, "state"))
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("private pulseaudio: %v: %s", err, out)
	}
	b, err := os.ReadFile(filepath.Join(dir, "run", "pid"))
	if s.pid, _ = strconv.Atoi(strings.TrimSpace(string(b))); err != nil || s.pid <= 0 {
		t.Fatalf("private pulseaudio left no pid file: %v", err)
	}
	t.Cleanup(s.Kill)
	t.Setenv("PULSE_SERVER", "unix:"+socket)
	t.Setenv("PULSE_SINK", Sink)
	t.Setenv("PULSE_SOURCE", Source)
	for tries := 0; exec.Command("pactl", "info").Run() != nil; tries++ {
		if tries == 50 {
			t.Fatalf("private pulseaudio does not answer on %s", socket)
		}
		time.Sleep(100 * time.Millisecond)
	}
	return s
}

// Kill ends the daemon at once, as a crash would; its clients lose their
// streams. Killing twice is harmless.
func (s *Server) Kill() {
	if s.pid == 0 {
		return
	}
	pid := s.pid
	s.pid = 0
	if err := syscall.Kill(pid, syscall.SIGKILL); err != nil {
		s.t.Logf("private pulseaudio %d: %v", pid, err)
		return
	}
	for range 50 {
		if !running(pid) {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	s.t.Errorf("private pulseaudio %d still running after SIGKILL", pid)
}

// running tells a live process from a gone one; a killed daemon stays a
// zombie until its adoptive parent reaps it, which counts as gone.
func running(pid int) bool {
	stat, err := os.ReadFile(fmt.Sprintf("/proc/%d/stat", pid))
	if err != nil {
		return false
	}
	// The state follows the parenthesised command name.
	i := strings.LastIndexByte(string(stat), ')')
	return i < 0 || i+2 >= len(stat) || stat[i+2] != 'Z'
}

func (s *Server) String() string { return fmt.Sprintf("pulseaudio %d at %s", s.pid, s.Dir) }
