package capture

import (
	"errors"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"fifthline/internal/vmic"
)

// These tests use the real stack: PortAudio -> ALSA pulse plugin ->
// PulseAudio null sink (internal/vmic), a private sink per test so that
// other packages' tests playing at the same time are not heard. Nothing
// they play is audible.

// risingCrossingHz measures the frequency of a clean tone from the times of
// its upward zero crossings, interpolated between samples.
func risingCrossingHz(x []float32, rate float64) float64 {
	first, last, count := -1.0, -1.0, 0
	for i := 1; i < len(x); i++ {
		if x[i-1] < 0 && x[i] >= 0 {
			at := float64(i-1) + float64(-x[i-1]/(x[i]-x[i-1]))
			if first < 0 {
				first = at
			}
			last, count = at, count+1
		}
	}
	if count < 2 {
		return 0
	}
	return float64(count-1) * rate / (last - first)
}

// readHeard reads from in until the tone has arrived (a sample above
// -26 dBFS), then returns the next want samples.
func readHeard(t *testing.T, in *Input, want int) []float32 {
	t.Helper()
	buf := make([]float32, 1024)
	var heard []float32
	deadline := time.Now().Add(5 * time.Second)
	for len(heard) < want {
		if time.Now().After(deadline) {
			t.Fatalf("heard %d of %d samples within 5 s; stats %+v", len(heard), want, in.Stats())
		}
		n, err := in.Read(buf)
		if err != nil {
			t.Fatalf("Read: %v", err)
		}
		for _, v := range buf[:n] {
			if len(heard) > 0 || math.Abs(float64(v)) > 0.05 {
				heard = append(heard, v)
			}
		}
	}
	return heard[:want]
}

// soxTone makes a tone file for the virtual microphone; 0.25 amplitude is
// -12 dBFS, well clear of clipping.
func soxTone(t *testing.T, seconds string, synth ...string) string {
	t.Helper()
	return soxFile(t, t.TempDir(), "tone.wav", []string{"-r", "48000", "-b", "16", "-c", "2"},
		append(append([]string{seconds}, synth...), "vol", "0.25")...)
}

func TestInputHearsToneFromVirtualMicrophone(t *testing.T) {
	vmic.Isolate(t)
	cases := []struct {
		name    string
		channel int
		hz      float64 // what sox was told to synthesise on that channel
	}{
		// A4 = 440 Hz (ISO 16); E5 a just fifth above it, 660 Hz.
		{"default device, first channel", 0, 440},
		{"default device, second channel", 2, 660},
	}
	// Left 440 Hz, right 660 Hz. A one-channel stream of the stereo monitor
	// is its mix, so the first case plays 440 Hz on both sides.
	stereo := soxTone(t, "2", "sine", "440", "sine", "660")
	mono := soxTone(t, "2", "sine", "440", "sine", "440")
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in, err := OpenInput(InputOptions{Channel: c.channel})
			if err != nil {
				t.Fatal(err)
			}
			defer in.Close()
			if in.SampleRate() != PreferredRate {
				t.Errorf("SampleRate = %v, want the preferred %v", in.SampleRate(), PreferredRate)
			}
			tone := stereo
			if c.channel < 2 {
				tone = mono
			}
			vmic.Play(t, tone)
			x := readHeard(t, in, int(in.SampleRate())) // one second of tone
			hz := risingCrossingHz(x, in.SampleRate())
			t.Logf("heard %.3f Hz, peak %.2f dBFS, stats %+v", hz, in.Stats().PeakDBFS(), in.Stats())
			if math.Abs(hz-c.hz) > 0.05 { // 0.2 cents: the null sink runs on an exact 48 kHz clock
				t.Errorf("heard %.2f Hz, want %v Hz", hz, c.hz)
			}
			st := in.Stats()
			// vol 0.25 is 20·log10(0.25) = -12.04 dBFS (definition of dBFS); 16-bit and resampling change it by far less than 0.5 dB.
			if math.Abs(st.PeakDBFS()+12.04) > 0.5 || st.Clipped != 0 {
				t.Errorf("peak %.2f dBFS with %d clipped, want -12.04 and none", st.PeakDBFS(), st.Clipped)
			}
			if st.DroppedBlocks != 0 {
				t.Errorf("dropped %d blocks while reading steadily", st.DroppedBlocks)
			}
			if err := in.Close(); err != nil {
				t.Errorf("Close: %v", err)
			}
		})
	}
}

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

func TestInputChoosesDeviceByNameOrIndex(t *testing.T) {
	vmic.Isolate(t)
	devs, err := Devices()
	if err != nil {
		t.Fatal(err)
	}
	var def DeviceInfo
	for _, d := range devs {
		if d.DefaultInput {
			def = d
		}
	}
	for _, want := range []string{def.Name, strconv.Itoa(def.Index)} {
		in, err := OpenInput(InputOptions{Device: want})
		if err != nil {
			t.Errorf("OpenInput(%q): %v", want, err)
			continue
		}
		if in.Device().Name != def.Name || !in.Device().DefaultInput {
			t.Errorf("OpenInput(%q) opened %+v, want the default input %q", want, in.Device(), def.Name)
		}
		in.Close()
	}
	for _, bad := range []InputOptions{{Device: "no such interface anywhere"}, {Channel: 999}} {
		if in, err := OpenInput(bad); err == nil {
			in.Close()
			t.Errorf("OpenInput(%+v) succeeded; want an error", bad)
		} else {
			t.Logf("OpenInput(%+v): %v", bad, err)
		}
	}
}

// waitForBlocks waits until the device is delivering: an idle null sink
// can take 2 s to start.
func waitForBlocks(t *testing.T, in *Input) {
	t.Helper()
	for deadline := time.Now().Add(startGrace); in.Stats().Blocks == 0; time.Sleep(20 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatalf("no audio blocks within %v", startGrace)
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

// A source that vanishes mid-session ends Read with ErrDeviceLost: the
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
			if !errors.Is(err, ErrDeviceLost) || !strings.Contains(err.Error(), in.Device().Name) {
				t.Errorf("Read after the source vanished: %v; want ErrDeviceLost naming %q", err, in.Device().Name)
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

// A sound server that dies mid-session ends Read with ErrDeviceLost, and
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
			if !errors.Is(err, ErrDeviceLost) {
				t.Errorf("Read after the server died: %v; want ErrDeviceLost", err)
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
