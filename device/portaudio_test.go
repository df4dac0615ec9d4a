package device

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"golang.org/x/sys/unix"

	"fifthline/internal/vmic"
)

// stderrTo points descriptor 2 at a file for the test and returns a func
// that restores it and says what arrived.
func stderrTo(t *testing.T) (collect func() string) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "stderr")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	saved, err := unix.Dup(2)
	if err != nil {
		t.Fatal(err)
	}
	if err := unix.Dup2(int(f.Fd()), 2); err != nil {
		t.Fatal(err)
	}
	return func() string {
		unix.Dup2(saved, 2)
		unix.Close(saved)
		f.Close()
		b, _ := os.ReadFile(path)
		return string(b)
	}
}

func TestMuteStderrNestsAndRestores(t *testing.T) {
	t.Setenv("FIFTHLINE_AUDIO_DEBUG", "")
	collect := stderrTo(t)
	unix.Write(2, []byte("before\n"))
	outer, err := MuteStderr()
	if err != nil {
		collect()
		t.Fatal(err)
	}
	inner, _ := MuteStderr()
	unix.Write(2, []byte("hidden 1\n"))
	inner()
	inner() // releasing twice counts once
	unix.Write(2, []byte("hidden 2\n"))
	outer()
	unix.Write(2, []byte("after\n"))
	if got := collect(); got != "before\nafter\n" {
		t.Errorf("descriptor 2 received %q, want only before and after", got)
	}
}

// PortAudio's start-up and device listing reach descriptor 2 only with
// FIFTHLINE_AUDIO_DEBUG. With libjack installed (portaudio19-dev pulls it
// in) there is always chatter: it complains that no JACK server runs.
func TestPortAudioStartsQuietly(t *testing.T) {
	vmic.Ensure(t)
	for _, debug := range []string{"", "1"} {
		t.Setenv("FIFTHLINE_AUDIO_DEBUG", debug)
		collect := stderrTo(t)
		_, err := Devices()
		got := collect()
		if err != nil {
			t.Fatal(err)
		}
		if debug == "" && got != "" {
			t.Errorf("muted start-up still wrote %q", got)
		}
		// Without chatter to hide the muted run would prove nothing.
		if debug != "" && !strings.Contains(strings.ToLower(got), "jack") {
			t.Errorf("with FIFTHLINE_AUDIO_DEBUG the libraries wrote %q; expected libjack's complaint", got)
		}
	}
}
