package drone_test

import (
	"math"
	"testing"

	"fifthline/drone"
)

// Each partial of a voice is the sinusoid sin(2π·f·n/rate) to rounding:
// the frequency is exactly the one asked for, with no drift over time.
func TestPartialsAreExactSinusoids(t *testing.T) {
	for _, tc := range []struct {
		name string
		hz   float64
	}{
		{"A4 = 440 Hz (ISO 16)", 440},
		{"G3 in equal temperament", 440 * math.Exp2(-14.0/12)},
		{"a low C1 (32.703 Hz, common practice)", 32.703195662574829},
		{"a high partial near the 0.45·rate cut", 21000},
	} {
		t.Run(tc.name, func(t *testing.T) {
			v := drone.NewVoice(rate, []drone.Partial{{tc.hz, 0.5}}, 1, 1, 0)
			n := int(5 * rate)
			buf := make([]float64, n)
			v.AddTo(buf)
			worst := 0.0
			for i := 1; i < n; i++ { // sample 0 is under the one-sample fade
				want := 0.5 * math.Sin(2*math.Pi*math.Mod(tc.hz*float64(i)/rate, 1))
				worst = math.Max(worst, math.Abs(buf[i]-want))
			}
			// 1e-9 of full scale after 5 s is a phase error far below 1e-6 ¢.
			if worst > 1e-9 {
				t.Errorf("largest deviation from the exact sinusoid %.3g", worst)
			}
		})
	}
}

// Partials are the timbre's harmonics of each note, scaled so that all
// amplitudes add up to the level: a single pure note peaks exactly there.
func TestPartialsMakeTheTimbreAtTheLevel(t *testing.T) {
	for _, tc := range []struct {
		name  string
		notes []float64
		tb    drone.Timbre
		want  []float64 // frequencies
	}{
		{"pure A4", []float64{440}, drone.Pure, []float64{440}},
		{"string A3 has 8 harmonics", []float64{220}, drone.String, []float64{220, 440, 660, 880, 1100, 1320, 1540, 1760}},
		// A just fifth 2:3 (common practice): G3 = 196, D4 = 294; G3's 3rd
		// and D4's 2nd harmonic coincide at 588 Hz and are merged.
		{"just fifth merges the shared harmonic", []float64{196, 294}, drone.Timbre{"two", []float64{1, 1, 1}}, []float64{196, 294, 392, 588, 882}},
		{"harmonics past 0.45·rate are left out", []float64{8000}, drone.String, []float64{8000, 16000}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			level := drone.Linear(-18)
			ps := drone.Partials(tc.notes, tc.tb, level, rate)
			got := drone.Frequencies(ps)
			if len(got) != len(tc.want) {
				t.Fatalf("partials %v, want %v", got, tc.want)
			}
			sum := 0.0
			for i, p := range ps {
				if p.Hz != tc.want[i] {
					t.Errorf("partial %d at %v Hz, want %v", i, p.Hz, tc.want[i])
				}
				sum += p.Amp
			}
			if math.Abs(sum-level) > 1e-15 {
				t.Errorf("amplitudes add up to %v, want the level %v", sum, level)
			}
		})
	}
	// −18 dBFS is 10^(−18/20) = 0.125893 of full scale (definition of dBFS).
	if got := drone.Linear(-18); math.Abs(got-0.12589254117941673) > 1e-15 {
		t.Errorf("Linear(-18) = %v", got)
	}
}

// Through the mixer, a pure note's peak is the level to float32 precision
// and never above it; a chord stays at or below it.
func TestMixerPeakIsTheLevel(t *testing.T) {
	level := drone.Linear(-18)
	for _, tc := range []struct {
		name  string
		notes []float64
		tb    drone.Timbre
		reach bool // the peak reaches the level (to 0.01 dB)
	}{
		{"pure A4 reaches the level", []float64{440}, drone.Pure, true},
		{"reed G3+D4 stays below", []float64{196, 293.665}, drone.Reed, false},
		{"string chord stays below", []float64{130.81, 164.81, 196}, drone.String, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := drone.NewMixer(rate, level)
			m.Add(drone.NewVoice(rate, drone.Partials(tc.notes, tc.tb, level, rate), 100, 100, 0))
			out := make([]float32, int(3*rate))
			m.Render(out, 1)
			peak := 0.0
			for _, s := range out {
				peak = math.Max(peak, math.Abs(float64(s)))
			}
			if peak > level {
				t.Errorf("peak %.6f above the level %.6f", peak, level)
			}
			if tc.reach && drone.DBFS(peak) < -18.01 {
				t.Errorf("peak %.3f dBFS, want −18", drone.DBFS(peak))
			}
		})
	}
}

// The limiter holds any input to its ceiling, however loud.
func TestLimiterNeverExceedsTheCeiling(t *testing.T) {
	ceiling := drone.Linear(-18)
	for _, over := range []float64{1, 2, 10, 1e6} {
		m := drone.NewMixer(rate, ceiling)
		// Voices that together would be `over` times the ceiling.
		for _, f := range []float64{110, 220 * 1.01, 331} {
			m.Add(drone.NewVoice(rate, drone.Partials([]float64{f}, drone.Reed, over*ceiling, rate), 10, 10, 0))
		}
		out := make([]float32, int(rate))
		m.Render(out, 2)
		for i, s := range out {
			if math.Abs(float64(s)) > ceiling {
				t.Fatalf("×%g: sample %d is %v, above the ceiling %v", over, i, s, ceiling)
			}
		}
	}
}

// Rendering in blocks of any size gives the same samples as one long block:
// no discontinuity at block edges.
func TestBlocksJoinWithoutDiscontinuity(t *testing.T) {
	ps := drone.Partials([]float64{196, 293.665}, drone.String, drone.Linear(-18), rate)
	render := func(sizes []int) []float32 {
		m := drone.NewMixer(rate, drone.Linear(-18))
		m.Add(drone.NewVoice(rate, ps, 4800, 4800, 30000))
		out := make([]float32, 48000)
		for i, k := 0, 0; i < len(out); k++ {
			n := min(sizes[k%len(sizes)], len(out)-i)
			m.Render(out[i:i+n], 1)
			i += n
		}
		return out
	}
	whole := render([]int{48000})
	for _, sizes := range [][]int{{512}, {1}, {7, 1000, 3, 4096}, {2047}} {
		got := render(sizes)
		for i := range whole {
			if got[i] != whole[i] {
				t.Fatalf("blocks %v: sample %d is %v, one block gives %v", sizes, i, got[i], whole[i])
			}
		}
	}
}

// Fades are raised cosines, ½ − ½·cos(π·n/N), in and out: they start and end
// with zero slope, so neither the start, the end nor a release in mid-fade
// clicks.
func TestFadesAreRaisedCosines(t *testing.T) {
	const fadeIn, fadeOut, hold = 1000, 600, 3000
	// A 0 Hz partial at phase ¼ (a constant 1 would be ideal, but sin(0)=0):
	// use rate/4 Hz, whose samples are 0, 1, 0, −1 …, and read every odd one.
	v := drone.NewVoice(rate, []drone.Partial{{rate / 4, 1}}, fadeIn, fadeOut, hold)
	buf := make([]float64, hold+fadeOut+100)
	v.AddTo(buf)
	env := func(n int) float64 {
		switch {
		case n < fadeIn:
			return 0.5 - 0.5*math.Cos(math.Pi*float64(n)/fadeIn)
		case n < hold:
			return 1
		case n < hold+fadeOut:
			return 0.5 + 0.5*math.Cos(math.Pi*float64(n-hold)/fadeOut)
		}
		return 0
	}
	for n := 1; n < len(buf); n += 2 {
		want := env(n) * math.Sin(math.Pi/2*float64(n))
		if math.Abs(buf[n]-want) > 1e-12 {
			t.Fatalf("sample %d: %v, want %v", n, buf[n], want)
		}
	}
	if !v.Done() {
		t.Error("voice not done after its fade out")
	}

	// Released in mid-fade-in, it falls from where it had got to.
	v = drone.NewVoice(rate, []drone.Partial{{rate / 4, 1}}, fadeIn, fadeOut, 0)
	buf = make([]float64, fadeIn/2)
	v.AddTo(buf)
	v.Release()
	tail := make([]float64, fadeOut+2)
	v.AddTo(tail)
	from := 0.5 - 0.5*math.Cos(math.Pi*float64(fadeIn/2)/fadeIn)
	for m := 1; m < fadeOut; m += 2 {
		n := fadeIn/2 + m
		want := from * (0.5 + 0.5*math.Cos(math.Pi*float64(m)/fadeOut)) * math.Sin(math.Pi/2*float64(n))
		if math.Abs(tail[m]-want) > 1e-12 {
			t.Fatalf("release sample %d: %v, want %v", m, tail[m], want)
		}
	}
}

func TestParseTimbre(t *testing.T) {
	for _, s := range []string{"pure", "REED", " string "} {
		if _, err := drone.ParseTimbre(s); err != nil {
			t.Errorf("%q: %v", s, err)
		}
	}
	if _, err := drone.ParseTimbre("organ"); err == nil {
		t.Error("organ accepted")
	}
}
