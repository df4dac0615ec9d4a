package pitchdetect

import (
	"math"
	"math/rand/v2"
	"testing"

	"fifthline/internal/testsignal"
)

func TestNewRejectsBadArguments(t *testing.T) {
	for _, c := range []struct {
		rate        float64
		window, hop int
	}{{0, 0, 0}, {-44100, 0, 0}, {math.NaN(), 0, 0}, {44100, -1, 0}, {44100, 0, -1}, {44100, 100, 0}, {44100, 1024, 2048}} {
		if _, err := New(c.rate, c.window, c.hop); err == nil {
			t.Errorf("New(%v, %d, %d) accepted", c.rate, c.window, c.hop)
		}
	}
}

func TestDefaultWindowHoldsTwoPeriodsOfA0(t *testing.T) {
	// A0 = 27.5 Hz (ISO 16: A4 = 440 Hz, four octaves down).
	for _, rate := range []float64{44100, 48000, 96000} {
		d, err := New(rate, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		if got := float64(d.Window()) / rate; got < 2/27.5 {
			t.Errorf("%g Hz: window %.3f s is shorter than two periods of A0", rate, got)
		}
	}
}

// Steady synthetic tones over A0..C8 (27.5..4186 Hz, equal temperament from
// ISO 16 A4 = 440 Hz) with the spectra of testsignal.All: clean signals, so
// the error is the method's own bias.
func TestSteadySyntheticTones(t *testing.T) {
	freqs := []float64{27.5, 41.2034, 65.4064, 110, 261.6256, 440, 987.7666, 2093.005, 4186.009}
	for _, rate := range []float64{44100, 48000, 96000} {
		for _, s := range testsignal.All {
			for _, hz := range freqs {
				x := testsignal.Tone(rate, int(rate*0.5), s, 0.5, testsignal.Steady(hz))
				m := measure(run(t, rate, x), hz)
				if m.voiced < m.frames*8/10 || m.gross > 0 || m.median > 0.02 || m.max > 0.2 {
					t.Errorf("%g Hz rate, %s at %.2f Hz: %d/%d voiced, %d gross, median %.4f ¢, max %.4f ¢",
						rate, s.Name, hz, m.voiced, m.frames, m.gross, m.median, m.max)
				}
			}
		}
	}
}

// Tones in white and pink noise: errors grow as the SNR falls but no frame
// may land on another note.
func TestTonesInNoise(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	rate := 48000.0
	for _, c := range []struct {
		snr, median float64 // dB; cents allowed
	}{{15, 3}, {30, 0.5}, {45, 0.1}} {
		for _, pink := range []bool{false, true} {
			for _, s := range testsignal.All[1:] {
				for _, hz := range []float64{82.4069, 440, 1760} {
					x := testsignal.Tone(rate, int(rate*0.5), s, 0.5, testsignal.Steady(hz))
					noise := testsignal.White(r, len(x))
					if pink {
						noise = testsignal.Pink(r, len(x))
					}
					testsignal.AddNoise(x, noise, c.snr)
					m := measure(run(t, rate, x), hz)
					if m.gross > 0 || m.voiced < m.frames/2 || m.median > c.median {
						t.Errorf("%s %.1f Hz, %g dB SNR (pink %v): %d/%d voiced, %d gross, median %.3f ¢",
							s.Name, hz, c.snr, pink, m.voiced, m.frames, m.gross, m.median)
					}
				}
			}
		}
	}
}

func TestNoPitchOnNoiseBreathOrSilence(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	rate := 44100.0
	n := int(rate * 2)
	for name, x := range map[string][]float64{
		"white":           testsignal.White(r, n),
		"pink":            testsignal.Pink(r, n),
		"breath 300 Hz":   testsignal.Breath(r, n, rate, 300, 4),
		"breath 1000 Hz":  testsignal.Breath(r, n, rate, 1000, 4),
		"breath 2500 Hz":  testsignal.Breath(r, n, rate, 2500, 4),
		"silence":         make([]float64, n),
		"quiet white -70": testsignal.White(r, n),
	} {
		level := 0.3
		if name == "quiet white -70" {
			level = math.Pow(10, -70.0/20)
		}
		testsignal.Normalize(x, level)
		for _, e := range run(t, rate, x) {
			if e.Voiced {
				t.Errorf("%s: pitch %.1f Hz (confidence %.2f) at %.2f s", name, e.Hz, e.Confidence, e.Time)
			}
		}
	}
}

// dBFS here is RMS relative to full scale 1.0, so a full-scale sine reads
// 20·log10(1/√2) = -3.01 dB (common practice).
func TestLevelIsWindowRMSInDBFS(t *testing.T) {
	x := testsignal.Tone(48000, 48000/2, testsignal.Sine, 1, testsignal.Steady(1000))
	est := run(t, 48000, x)
	if got := est[len(est)-1].Level; math.Abs(got+3.0103) > 0.01 {
		t.Errorf("full-scale sine level %.3f dBFS, want -3.01", got)
	}
}

func TestBlockSizeDoesNotChangeEstimates(t *testing.T) {
	rate := 44100.0
	x := testsignal.Float32(testsignal.Tone(rate, 20000, testsignal.Saw, 0.5, testsignal.Steady(196)))
	d, _ := New(rate, 0, 0)
	want := d.Feed(x, nil)
	for _, size := range []int{1, 7, 511, 4096} {
		d.Reset()
		var got []Estimate
		for i := 0; i < len(x); i += size {
			got = d.Feed(x[i:min(i+size, len(x))], got)
		}
		if len(got) != len(want) {
			t.Fatalf("block %d: %d estimates, want %d", size, len(got), len(want))
		}
		for i := range got {
			if got[i] != want[i] {
				t.Fatalf("block %d: estimate %d = %+v, want %+v", size, i, got[i], want[i])
			}
		}
	}
}

func TestEstimateTimeIsWindowCentre(t *testing.T) {
	d, _ := New(48000, 0, 0)
	est := d.Feed(make([]float32, d.Span()+d.Hop()), nil)
	if len(est) != 2 {
		t.Fatalf("%d estimates, want 2", len(est))
	}
	for i, e := range est {
		want := (float64(d.Span()+i*d.Hop()) - float64(d.Span())/2) / 48000
		if math.Abs(e.Time-want) > 1e-12 {
			t.Errorf("estimate %d at %.6f s, want %.6f", i, e.Time, want)
		}
	}
}

func BenchmarkFeed(b *testing.B) {
	rate := 48000.0
	benchFeed(b, rate, testsignal.Tone(rate, int(rate), testsignal.Saw, 0.5, testsignal.Steady(220)))
}

// BenchmarkFeedUnvoiced feeds white noise at -40 dBFS RMS: over the
// silence gate (silenceDBFS), with no pitch, as a resting player's channel
// or the room between notes.
func BenchmarkFeedUnvoiced(b *testing.B) {
	rate := 48000.0
	x := testsignal.White(rand.New(rand.NewPCG(1, 2)), int(rate))
	for i := range x {
		x[i] *= 0.01
	}
	benchFeed(b, rate, x)
}

// benchFeed feeds x hop by hop, over and over; x must be longer than the span.
func benchFeed(b *testing.B, rate float64, signal []float64) {
	x := testsignal.Float32(signal)
	d, _ := New(rate, 0, 0)
	out := make([]Estimate, 0, 16)
	hop := d.Hop()
	d.Feed(x[:d.Span()], out[:0])
	b.ReportAllocs()
	b.SetBytes(int64(hop * 4))
	i := 0
	for b.Loop() {
		if i+hop > len(x) {
			i = 0
		}
		out = d.Feed(x[i:i+hop], out[:0])
		i += hop
	}
	b.ReportMetric(float64(hop)/rate, "audio-s/op")
}

// A hop other than the default (which equals the lag between the two
// spectral frames) takes the path that transforms both frames.
func TestNonDefaultWindowAndHop(t *testing.T) {
	for _, c := range []struct{ window, hop int }{{4096, 256}, {8192, 1024}, {2048, 512}} {
		d, err := New(48000, c.window, c.hop)
		if err != nil {
			t.Fatal(err)
		}
		x := testsignal.Tone(48000, 48000/2, testsignal.Saw, 0.5, testsignal.Steady(440))
		m := measure(d.Feed(testsignal.Float32(x), nil), 440)
		if m.voiced < m.frames*9/10 || m.median > 0.02 || m.max > 0.2 {
			t.Errorf("window %d hop %d: %d/%d voiced, median %.4f ¢, max %.4f ¢", c.window, c.hop, m.voiced, m.frames, m.median, m.max)
		}
	}
}
