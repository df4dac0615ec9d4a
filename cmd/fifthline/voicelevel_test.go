package main

import (
	"fmt"
	"math"
	"testing"
)

// A pitch reading must not hang on the take's level, short of clipping:
// the chord E3 B3 E4 G♯4 (equal temperament, A4 = 440 Hz, ISO 16; four
// equal sine partials each, sox synth, 24-bit) normalized by sox to peaks
// from -40 to -2 dBFS reads as the same notes at every level, each within
// 0.05 ¢ of the frequency sox was given: E3 (doubled: E4 lies on its even
// partials), B3, G♯4. A 24-bit take's dither lies about 140 dB under such
// a chord; the estimator once whitened by it, so that at -6 dBFS the chord
// split into B2 and two E3s and at -2 dBFS nothing was read.
func TestAnalyzeVoicesReadsAChordAlikeAtEveryLevel(t *testing.T) {
	t.Parallel()
	want := []struct {
		note    string
		hz      float64
		doubled string
	}{{"E3", e3Hz, "true"}, {"B3", b3Hz, "false"}, {"G#4", gs4Hz, "false"}}
	for _, peak := range []int{-40, -30, -20, -12, -6, -2} {
		wav := soxChordAt(t, fmt.Sprintf("gain -n %d", peak), e3Hz, b3Hz, e4Hz, gs4Hz)
		code, out, stderr := runLong(t, "analyze", "--voices", "auto", wav)
		if code != 0 {
			t.Fatalf("%d dBFS: exit %d: %s", peak, code, stderr)
		}
		_, rows := readCSV(t, out)
		if len(rows) != len(want) {
			t.Errorf("%d dBFS: %d notes, want %d:\n%s", peak, len(rows), len(want), out)
			continue
		}
		for i, w := range want {
			r := rows[i]
			if c := 1200 * math.Log2(num(r, "hz")/w.hz); r["note"] != w.note || r["doubled"] != w.doubled || math.Abs(c) > 0.05 {
				t.Errorf("%d dBFS: %s at %s Hz (%+.3f ¢ from sox's %.4f), doubled %s; want %s within 0.05 ¢, doubled %s",
					peak, r["note"], r["hz"], c, w.hz, r["doubled"], w.note, w.doubled)
			}
		}
	}
}
