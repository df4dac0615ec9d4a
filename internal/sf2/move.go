package sf2

import (
	"math"

	"fifthline/internal/testsignal"
)

// Nearest is the loop or timbre whose fundamental lies nearest hz (false
// when there are none).
func Nearest[T interface{ Fundamental() float64 }](xs []T, hz float64) (T, bool) {
	var best T
	if len(xs) == 0 {
		return best, false
	}
	best = xs[0]
	for _, x := range xs {
		if math.Abs(math.Log(x.Fundamental()/hz)) < math.Abs(math.Log(best.Fundamental()/hz)) {
			best = x
		}
	}
	return best, true
}

// Fundamental is the loop's exact fundamental, Hz.
func (l Loop) Fundamental() float64 { return l.Hz }

// Fundamental is the loop's mean fundamental, Hz.
func (t Timbre) Fundamental() float64 { return t.Hz }

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
