package pitchdetect

import (
	"math"
	"testing"
)

// The stepped phasor agrees with a direct Sincos at every point of a track
// a hop apart (48 kHz, 512 samples) with frames missing here and there, over
// the whole vibrato range, to far below anything the fit could notice.
func TestPhasorMatchesDirectSincos(t *testing.T) {
	var times []float64
	for k := range 600 {
		if k%97 == 13 || k%41 == 7 { // dropped frames: the spacing changes
			continue
		}
		times = append(times, 0.0533+float64(k)*512/48000)
	}
	for _, r := range []float64{vibratoMinRate, 5.5, 6.37, vibratoMaxRate} {
		var p phasor
		for i := range times {
			cos, sin := p.at(times, i, r)
			wantSin, wantCos := math.Sincos(2 * math.Pi * r * (times[i] - times[0]))
			if math.Abs(cos-wantCos) > 1e-9 || math.Abs(sin-wantSin) > 1e-9 {
				t.Fatalf("rate %g, point %d: (%v, %v), want (%v, %v)", r, i, cos, sin, wantCos, wantSin)
			}
		}
	}
}
