package device

import (
	"errors"
	"os"
	"strings"
	"testing"
	"time"

	"fifthline/internal/vmic"
)

// The input stream's life on the real stack: PortAudio -> ALSA pulse
// plugin -> PulseAudio null sink (internal/vmic), a private sink per test
// so that other packages' tests playing at the same time are not heard.

func TestDevicesMarkDefaults(t *testing.T) {
	vmic.Isolate(t)
	devs, err := Devices()
	if err != nil {
		t.Fatal(err)
	}
	var inputs, outputs int
	for _, d := range devs {
		t.Logf("%+v", d)
		if d.DefaultInput {
			inputs++
			if d.InputChannels < 1 || d.DefaultRate <= 0 || d.HostAPI == "" {
				t.Errorf("default input %+v lacks channels, rate or host API", d)
			}
		}
		if d.DefaultOutput {
			outputs++
			if d.OutputChannels < 1 {
				t.Errorf("default output %+v has no output channels", d)
			}
		}
	}
	if inputs != 1 || outputs != 1 {
		t.Errorf("%d default inputs and %d default outputs marked, want one each", inputs, outputs)
	}
}

// waitForBlocks waits until the device is delivering: an idle null sink
// can take 2 s to start.
func waitForBlocks(t *testing.T, in *Input) {
	t.Helper()
	for deadline := time.Now().Add(StartGrace); in.Stats().Blocks == 0; time.Sleep(20 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatalf("no audio blocks within %v", StartGrace)
		}
	}
}

// A reader that stalls loses whole blocks, and they are counted.
func TestInputCountsDroppedBlocksWhenReaderStalls(t *testing.T) {
	vmic.Isolate(t)
	in, err := OpenInput(InputOptions{Buffer: 50 * time.Millisecond})
	if err != nil {
		t.Fatal(err)
	}
	defer in.Close()
	waitForBlocks(t, in)
	time.Sleep(600 * time.Millisecond) // the ring holds 50 ms
	st := in.Stats()
	if st.DroppedBlocks == 0 || st.DroppedSamples < st.DroppedBlocks {
		t.Errorf("after a 600 ms stall with a 50 ms buffer: %+v, want dropped blocks counted", st)
	}
	buf := make([]float32, 4096)
	if n, err := in.Read(buf); err != nil || n == 0 {
		t.Errorf("Read after the stall = %d, %v; want the buffered audio", n, err)
	}
}

// Close wakes a waiting reader, and later Reads and Closes are harmless.
func TestInputCloseIsClean(t *testing.T) {
	vmic.Isolate(t)
	in, err := OpenInput(InputOptions{})
	if err != nil {
		t.Fatal(err)
	}
	errc := make(chan error, 1)
	go func() {
		buf := make([]float32, 256)
		for {
			if _, err := in.Read(buf); err != nil {
				errc <- err
				return
			}
		}
	}()
	time.Sleep(200 * time.Millisecond)
	if err := in.Close(); err != nil {
		t.Errorf("Close: %v", err)
	}
	select {
	case err := <-errc:
		if !errors.Is(err, os.ErrClosed) {
			t.Errorf("Read during Close returned %v, want os.ErrClosed", err)
		}
	case <-time.After(2 * time.Second):
		t.Fatal("Read still blocked 2 s after Close")
	}
	if err := in.Close(); err != nil {
		t.Errorf("second Close: %v", err)
	}
}

// A source that vanishes mid-session ends Read with ErrInputLost: the
// test's private null sink is suspended while the input reads its monitor.
func TestInputReportsLostDevice(t *testing.T) {
	mic := vmic.Isolate(t)
	in, err := OpenInput(InputOptions{StallTimeout: 500 * time.Millisecond})
	if err != nil {
		t.Fatal(err)
	}
	defer in.Close()
	waitForBlocks(t, in)
	buf := make([]float32, 1024)
	// Control: while the sink runs, a second of reading never stalls.
	for got := 0; got < int(in.SampleRate()); {
		n, err := in.Read(buf)
		if err != nil {
			t.Fatalf("Read before the suspend: %v", err)
		}
		got += n
	}
	mic.Suspend()
	deadline := time.Now().Add(5 * time.Second)
	for {
		_, err := in.Read(buf)
		if err != nil {
			if !errors.Is(err, ErrInputLost) || !strings.Contains(err.Error(), in.Device().Name) {
				t.Errorf("Read after the source vanished: %v; want ErrInputLost naming %q", err, in.Device().Name)
			}
			t.Logf("Read: %v; stats %+v", err, in.Stats())
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("Read still delivering 5 s after the source vanished")
		}
	}
	if err := in.Close(); err != nil {
		t.Logf("Close after loss: %v", err) // an error is allowed, a hang or panic is not
	}
}

// A sound server that dies mid-session ends Read with ErrInputLost, and
// Close still returns promptly. The test's own PulseAudio daemon is killed.
// PortAudio complains on descriptor 2 when that happens; a session holding
// MuteStderr, as listen does, shows none of it.
func TestInputReportsVanishedSoundServer(t *testing.T) {
	server := vmic.StartServer(t)
	t.Setenv("FIFTHLINE_AUDIO_DEBUG", "")
	collect := stderrTo(t)
	restore, err := MuteStderr()
	if err != nil {
		collect()
		t.Fatal(err)
	}
	defer func() {
		restore()
		if got := collect(); got != "" {
			t.Errorf("a muted session still wrote to descriptor 2: %q", got)
		}
	}()
	in, err := OpenInput(InputOptions{StallTimeout: 500 * time.Millisecond})
	if err != nil {
		t.Fatal(err)
	}
	defer in.Close()
	waitForBlocks(t, in)
	server.Kill()
	buf := make([]float32, 1024)
	for deadline := time.Now().Add(5 * time.Second); ; {
		if _, err := in.Read(buf); err != nil {
			if !errors.Is(err, ErrInputLost) {
				t.Errorf("Read after the server died: %v; want ErrInputLost", err)
			}
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("Read still delivering 5 s after the server died")
		}
	}
	done := make(chan error, 1)
	go func() { done <- in.Close() }()
	select {
	case err := <-done:
		t.Logf("Close after the server died: %v", err)
	case <-time.After(5 * time.Second):
		t.Fatal("Close hangs after the server died")
	}
}
