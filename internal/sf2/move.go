package sf2

import (
	"math"

	"fifthline/internal/testsignal"
)

// Nearest is the loop whose fundamental lies nearest hz (false when there
// are none).
func Nearest(loops []Loop, hz float64) (Loop, bool) {
	if len(loops) == 0 {
		return Loop{}, false
	}
	best := loops[0]
	for _, l := range loops {
		if math.Abs(math.Log(l.Hz/hz)) < math.Abs(math.Log(best.Hz/hz)) {
			best = l
		}
	}
	return best, true
}

// At plays the loop for n samples at rate with its fundamental moved to
// about hz, by re-periodising it (testsignal.Reperiod, band-limited: its k
// cycles in m samples sound at exactly k·rate/m, whatever rate the sample
// was recorded at). It returns the samples, peak-normalised to 0.2, and
// that exact fundamental.
func (l Loop) At(rate, hz float64, n int) ([]float64, float64) {
	m := int(math.Round(float64(l.Cycles) * rate / hz))
	x := testsignal.Repeat(testsignal.Reperiod(l.Frames, m), n)
	testsignal.Normalize(x, 0.2)
	return x, float64(l.Cycles) * rate / float64(m)
}
