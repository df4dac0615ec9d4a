package capture

import (
	"math"
	"strconv"
	"testing"
	"time"

	"fifthline/device"
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

func TestInputChoosesDeviceByNameOrIndex(t *testing.T) {
	vmic.Isolate(t)
	devs, err := device.Devices()
	if err != nil {
		t.Fatal(err)
	}
	var def device.Info
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
