package ensemble

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A bass entering under a chord that has not yet settled on its
// harmonics, before any bleed is weighed: the tenor 40 ¢ above the bass's
// third harmonic, the alto 20 ¢ above its fourth, the soprano 25 ¢ above
// its fifth (the rendered choir's F major chord in its first 0.2 s,
// measured), all entering together, the bass a third of their level and
// swelling over 0.3 s. Each microphone hears the others 15–25 dB down and
// 1–6 ms late (the ensemble issue's figures; the rendered takes' matrix).
// The bass channel then repeats at the chord's period and its detector
// reads no pitch; below the tenor it holds the bass alone. Truth: the
// bass's pitch as synthesised, F2 in equal temperament at A4 = 440 Hz
// (ISO 16), and where its note starts read alone. The same bass resting
// while the chord sounds, then entering, is silent until it enters.
func TestABassEnteringUnderUnweighedBleedIsReadBelowIt(t *testing.T) {
	for _, enters := range []float64{0.2, 0.7} {
		readEnteringBass(t, enters)
	}
}

// readEnteringBass reads the bass of the test above entering at enters
// seconds, the others at 0.2 s.
func readEnteringBass(t *testing.T, enters float64) {
	f2 := 440 * math.Exp2(-28.0/12)
	cents := func(hz, c float64) float64 { return hz * math.Exp2(c/1200) }
	hz := []float64{f2, cents(3*f2, 40), cents(4*f2, 20), cents(5*f2, 25)}
	dB := [4][4]float64{{0, 18, 22, 25}, {17, 0, 16, 21}, {21, 15, 0, 19}, {24, 20, 16, 0}}
	ms := [4][4]float64{{0, 1.4, 3.1, 5.6}, {1.2, 0, 2.3, 4.1}, {3.4, 2.1, 0, 1.7}, {5.8, 3.9, 1.6, 0}}
	n := int(1.5 * rate)
	dry := make([][]float64, 4)
	for i, f := range hz {
		at, level, swell := int(0.2*rate), 0.15, 0.02
		if i == 0 {
			at, level, swell = int(enters*rate), 0.05, 0.3
		}
		x := testsignal.Tone(rate, n-at, testsignal.Saw, level, testsignal.Steady(f))
		testsignal.FadeIn(x, rate, swell)
		dry[i] = append(make([]float64, at), x...)
	}
	tk := &take{ch: make([][]float64, 4)}
	for c := range dry {
		tk.ch[c] = append([]float64(nil), dry[c]...)
		for o := range dry {
			if o == c {
				continue
			}
			g, d := math.Pow(10, -dB[c][o]/20), int(ms[c][o]/1000*rate)
			for i := d; i < n; i++ {
				tk.ch[c][i] += g * dry[o][i-d]
			}
		}
	}
	alone := read(t, &take{ch: dry[:1]}, []Player{{"b", 0}})
	if len(alone) != 1 {
		t.Fatalf("the bass alone: %d notes", len(alone))
	}
	var bass []Note
	for _, nt := range read(t, tk, []Player{{"b", 0}, {"t", 1}, {"a", 2}, {"s", 3}}) {
		if nt.Player.Name == "b" {
			bass = append(bass, nt)
		}
	}
	if len(bass) != 1 {
		t.Fatalf("the bass entering at %.1f s: %d notes, want 1", enters, len(bass))
	}
	b, a := bass[0].Held, alone[0].Held
	off := testsignal.Cents(b.Hz, f2)
	t.Logf("the bass entering at %.1f s: %s from %.3f s, %+.3f ¢; alone from %.3f s, %+.3f ¢", enters, bass[0].Reading.Note, b.Start, off, a.Start, testsignal.Cents(a.Hz, f2))
	if math.Abs(b.Start-a.Start) > 0.05 || math.Abs(off) > 0.5 {
		t.Errorf("the bass entering at %.1f s: %s from %.3f s at %+.3f ¢; alone from %.3f s, played at 0 ¢", enters, bass[0].Reading.Note, b.Start, off, a.Start)
	}
}

// The band's filter is a Butterworth low-pass of order 12: |H|² =
// 1/(1 + (f/fc)^24) (its definition, common practice), so 3.01 dB down at
// the cutoff, 42.3 dB down at the lowest neighbour (1.5 times it), flat an
// octave below. Measured on sines at 48 kHz, past the filter's settling.
func TestTheBandsFilterIsButterworths(t *testing.T) {
	const fc = 160.0
	for _, c := range []struct{ f, wantDB float64 }{{fc / 2, 0}, {fc, -3.01}, {fc * lowBelow, -42.27}} {
		x := testsignal.Tone(rate, int(rate), testsignal.Sine, 1, testsignal.Steady(c.f))
		in := testsignal.RMS(x[len(x)/2:])
		lowPass(x, fc/rate)
		got := 20 * math.Log10(testsignal.RMS(x[len(x)/2:])/in)
		if math.Abs(got-c.wantDB) > 0.1 {
			t.Errorf("%.0f Hz through the %.0f Hz low-pass: %.2f dB, want %.2f", c.f, fc, got, c.wantDB)
		}
	}
}

// The band ends lowBelow under the lowest pitch any neighbour was heard
// at within a window, and is read only while one of them has not had
// their bleed on the player weighed.
func TestTheBandEndsBelowTheLowestNeighbour(t *testing.T) {
	recent := []float64{0, 261.6, 349.2, 440}
	for _, c := range []struct {
		name      string
		recent    []float64
		unweighed map[int]bool
		want      float64
	}{
		{"one neighbour unweighed", recent, map[int]bool{3: true}, 261.6 / lowBelow},
		{"every neighbour weighed", recent, nil, 0},
		{"no neighbour heard", []float64{87.3, 0, 0, 0}, map[int]bool{1: true, 2: true, 3: true}, 0},
		{"the player's own pitch is no neighbour's", []float64{87.3, 261.6}, map[int]bool{1: true}, 261.6 / lowBelow},
	} {
		if got := lowCutoff(0, c.recent, func(d int) bool { return c.unweighed[d] }); got != c.want {
			t.Errorf("%s: the band ends at %.2f Hz, want %.2f", c.name, got, c.want)
		}
	}
}
