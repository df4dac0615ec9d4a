package capture

import (
	"errors"
	"io"
	"math"
	"testing"
	"time"
)

// render plays a whole score as fast as it goes.
func render(t *testing.T, rate float64, tones ...Tone) []float32 {
	t.Helper()
	return readAll(t, NewPerformance(rate, tones, false), 4096)
}

// dft is the windowed (Hann) amplitude of frequency hz in x; for a steady
// sinusoid of amplitude A it gives about A.
func dft(x []float32, rate, hz float64) float64 {
	var re, im, wsum float64
	for n, v := range x {
		w := 0.5 - 0.5*math.Cos(2*math.Pi*float64(n)/float64(len(x)))
		ph := 2 * math.Pi * hz * float64(n) / rate
		re += w * float64(v) * math.Cos(ph)
		im -= w * float64(v) * math.Sin(ph)
		wsum += w
	}
	return 2 * math.Hypot(re, im) / wsum
}

func rms(x []float32) float64 {
	s := 0.0
	for _, v := range x {
		s += float64(v) * float64(v)
	}
	return math.Sqrt(s / float64(len(x)))
}

// A 480 Hz tone at 48 kHz repeats every 100 samples (to within the breath
// noise), and its partials have the voice's colour.
func TestPerformanceHoldsPitchAndColour(t *testing.T) {
	x := render(t, 48000, Tone{Hz: 480, Seconds: 1, Gain: 1})
	steady := x[9600:38400] // 0.2 s to 0.8 s, clear of attack and release
	diff := func(shift int) float64 {
		d := make([]float32, len(steady)-shift)
		for i := range d {
			d[i] = steady[i+shift] - steady[i]
		}
		return rms(d) / rms(steady)
	}
	t.Logf("period repeat error %.4f, off-by-one-sample %.4f", diff(100), diff(101))
	if r := diff(100); r > 0.02 {
		t.Errorf("one period (100 samples) later the tone differs by %.3f of its RMS; want a repeat", r)
	}
	if r := diff(101); r < 0.05 {
		t.Errorf("101 samples later it differs by only %.3f; the periodicity check cannot see errors", r)
	}
	for k, a := range voiceHarmonics {
		got := dft(steady, 48000, 480*float64(k+1))
		if want := a * voiceScale; math.Abs(got-want) > 0.01*voiceScale {
			t.Errorf("partial %d: amplitude %.4f, want %.4f", k+1, got, want)
		}
	}
}

// Vibrato swings either side of Hz by VibratoCents; its centre is Hz.
func TestPerformanceVibratoCentresOnHz(t *testing.T) {
	const rate, hz, cents = 16000.0, 440.0, 40.0 // a low rate keeps the search cheap
	x := render(t, rate, Tone{Hz: hz, Seconds: 2.3, Gain: 1, VibratoCents: cents, VibratoHz: 5})
	// Track the fundamental with 30 ms windows every 10 ms from 0.4 s
	// (vibrato at full depth) over 1.6 s: eight whole vibrato cycles.
	win := int(0.030 * rate)
	var track []float64
	for start := int(0.4 * rate); start+win <= int(2.0*rate); start += int(0.010 * rate) {
		track = append(track, peakCents(x[start:start+win], rate, hz))
	}
	lo, hi, sum := math.Inf(1), math.Inf(-1), 0.0
	for _, c := range track {
		lo, hi, sum = min(lo, c), max(hi, c), sum+c
	}
	// A 30 ms window averages a 5 Hz swing down by about 4 % (sinc), hence 38.4.
	if want := cents * 0.96; math.Abs(hi-want) > 2 || math.Abs(-lo-want) > 2 {
		t.Errorf("vibrato swings %+.1f to %+.1f cents; want about ±%.1f", lo, hi, want)
	}
	t.Logf("vibrato track %+.2f to %+.2f cents, mean %+.3f", lo, hi, sum/float64(len(track)))
	if mean := sum / float64(len(track)); math.Abs(mean) > 1 {
		t.Errorf("vibrato centre %+.2f cents from %v Hz; want 0", mean, hz)
	}
}

// peakCents finds the strongest frequency within ±80 cents of hz, in cents
// from hz: a 4-cent grid, then a parabola through the best three points.
func peakCents(x []float32, rate, hz float64) float64 {
	const step = 4.0
	best, bestC := -1.0, 0.0
	at := func(c float64) float64 { return dft(x, rate, hz*math.Exp2(c/1200)) }
	for c := -80.0; c <= 80; c += step {
		if a := at(c); a > best {
			best, bestC = a, c
		}
	}
	l, r := at(bestC-step), at(bestC+step)
	return bestC + step*0.5*(l-r)/(l-2*best+r)
}

// Whatever the score, no sample exceeds -6 dBFS.
func TestPerformanceStaysUnderMinus6dBFS(t *testing.T) {
	x := render(t, 48000,
		Tone{Hz: 55, Seconds: 0.3, Gain: 1},
		Tone{Hz: 2093, Seconds: 0.3, Gain: 1, VibratoCents: 50, VibratoHz: 6},
		Tone{Hz: 4186, Seconds: 0.2, Gain: 5}, // gain above 1 is held at 1
		Tone{Hz: 110, Seconds: 0.3, Gain: 1, VibratoCents: 30, VibratoHz: 5},
		Tone{Hz: 220, Seconds: 0.1, Gain: math.NaN()},
		Tone{Hz: 220, Seconds: 0.1, Gain: math.Inf(1)},
	)
	peak := 0.0
	for _, v := range x {
		if math.IsNaN(float64(v)) {
			t.Fatal("NaN sample")
		}
		peak = max(peak, math.Abs(float64(v)))
	}
	t.Logf("peak %.4f (%.2f dBFS)", peak, 20*math.Log10(peak))
	// -6 dBFS = 10^(-6/20) = 0.50119 (definition of dBFS).
	if peak > 0.50119 {
		t.Errorf("peak %.4f (%.2f dBFS), want at most -6 dBFS", peak, 20*math.Log10(peak))
	}
}

// Notes join without clicks: no step between samples is steeper than the
// voice itself makes at the highest pitch of the score, even across
// abrupt changes of pitch, gain and very short notes.
func TestPerformanceJoinsNotesWithoutClicks(t *testing.T) {
	const rate, top = 48000.0, 660.0
	x := render(t, rate,
		Tone{Hz: 220, Seconds: 0.2, Gain: 1},
		Tone{Hz: 330, Seconds: 0.05, Gain: 0.3},
		Tone{Hz: 261.63, Seconds: 0.2, Gain: 1, VibratoCents: 20, VibratoHz: 5},
		Tone{Rest: true, Seconds: 0.1},
		Tone{Hz: 440, Seconds: 0.004, Gain: 1}, // ramps a quarter of 4 ms each
		Tone{Hz: top, Seconds: 0.2, Gain: 1},
	)
	step := 0.0
	for i := 1; i < len(x); i++ {
		step = max(step, math.Abs(float64(x[i]-x[i-1])))
	}
	// Every partial's slope at the top pitch, the noise's, and the fastest ramp.
	slope, amp := 0.0, breathLevel
	for k, a := range voiceHarmonics {
		slope += a * 2 * math.Pi * float64(k+1) * top / rate
		amp += a
	}
	limit := voiceScale * (slope + breathLevel*0.5 + amp*math.Pi/2/(0.001*rate))
	t.Logf("largest step %.4f, limit %.4f", step, limit)
	if step > limit {
		t.Errorf("largest step between samples %.4f exceeds what the voice makes (%.4f): a click", step, limit)
	}
}

// Lengths are exact, rests (and tones of no usable frequency) are silent,
// and the same score always gives the same samples.
func TestPerformanceLengthsRestsAndRepeatability(t *testing.T) {
	score := []Tone{
		{Hz: 440, Seconds: 0.1}, {Rest: true, Seconds: 0.02}, {Hz: math.NaN(), Seconds: 0.01},
		{Hz: -5, Seconds: 0.01}, {Hz: 1e9, Seconds: 0.01}, {Hz: 660, Seconds: 0.1}, {Hz: 1, Seconds: 0},
	}
	x := render(t, 48000, score...)
	if len(x) != 12000 {
		t.Errorf("rendered %d samples, want 12000 (0.25 s at 48 kHz)", len(x))
	}
	if d := NewPerformance(48000, score, false).Duration(); d != 0.25 {
		t.Errorf("Duration = %v, want 0.25", d)
	}
	if r := rms(x[4800:7200]); r != 0 {
		t.Errorf("rest has RMS %g, want silence", r)
	}
	if maxDiff(x, render(t, 48000, score...)) != 0 {
		t.Error("two renders of one score differ")
	}
	if rms(x[:4800]) == 0 || rms(x[7200:]) == 0 {
		t.Error("a tone came out silent")
	}
}

// In real time, audio comes out no faster than it is played, in device-
// sized blocks, and it is the same audio as the fast render.
func TestPerformancePacesToTheWallClock(t *testing.T) {
	score := []Tone{{Hz: 440, Seconds: 0.25}, {Hz: 550, Seconds: 0.05}}
	p := NewPerformance(8000, score, true)
	var got []float32
	buf := make([]float32, 4096)
	start := time.Now()
	for {
		n, err := p.Read(buf)
		got = append(got, buf[:n]...)
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		if least := int(pacedBlockSec * 8000); n < least && len(got) < 2400 {
			t.Errorf("paced Read returned %d samples; want at least %g s (%d)", n, pacedBlockSec, least)
		}
		if ahead := float64(len(got))/8000 - time.Since(start).Seconds(); ahead > 0.001 {
			t.Fatalf("%.3f s of audio delivered ahead of the clock", ahead)
		}
	}
	if maxDiff(got, render(t, 8000, score...)) != 0 || len(got) != 2400 {
		t.Errorf("paced audio (%d samples) differs from the fast render", len(got))
	}
}
