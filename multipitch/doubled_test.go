package multipitch

import (
	"testing"

	"fifthline/internal/testsignal"
)

// An octave doubling inside a chord is marked where the chord leaves its
// even partials few clean neighbours: four equal partials each on E3, B3,
// E4 and G♯4 (equal temperament from A4 = 440 Hz, ISO 16) read as E3,
// marked doubled, B3 and G♯4 — E4's partials are all E3's even ones, and
// B3's 2nd and 4th cover E3's 3rd and 6th. A note carries the mark when
// more than half its frames do; here three in four must. Without E4 nothing
// is marked.
func TestADoublingInAChordIsMarked(t *testing.T) {
	four := testsignal.Spectrum{Name: "four equal partials", Amps: []float64{1, 1, 1, 1}}
	e3, gs4 := et(-17), et(-1)
	for _, tc := range []struct {
		name    string
		parts   []part
		doubled int // frames (of all) in which E3 must be marked, in quarters
	}{
		{"E3 B3 E4 G♯4", []part{steady(four, e3), steady(four, b3), steady(four, e4), steady(four, gs4)}, 3},
		{"E3 B3 G♯4", []part{steady(four, e3), steady(four, b3), steady(four, gs4)}, 0},
	} {
		s := hear(t, chord(2, 45, 11, tc.parts...), Config{}, 0, 2, e3, b3, gs4)
		s.meets(t, tc.name, 2)
		if marked := s.doubled[0]; 4*marked < tc.doubled*s.frames || tc.doubled == 0 && marked > 0 {
			t.Errorf("%s: E3 marked doubled in %d of %d frames", tc.name, marked, s.frames)
		}
		if s.doubled[1] > 0 || s.doubled[2] > 0 {
			t.Errorf("%s: B3 or G♯4 marked doubled (%v)", tc.name, s.doubled)
		}
	}
}
