package drone

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// Timbre is a drone's tone colour: the relative amplitudes of harmonics 1, 2, 3…
type Timbre struct {
	Name string
	Amps []float64
}

// The timbres are our own. Pure is one sinusoid per note. Reed has a strong
// odd-harmonic series over weaker even ones, the way a cylindrical reed pipe
// sounds; String falls off as 1/k, like a bowed string's sawtooth-like
// spectrum (Fletcher & Rossing, "The Physics of Musical Instruments", from
// memory). Both keep to a few harmonics so beats with a player stay easy to hear.
var (
	Pure   = Timbre{"pure", []float64{1}}
	Reed   = Timbre{"reed", []float64{1, 0.2, 0.5, 0.12, 0.3, 0.08, 0.18}}
	String = Timbre{"string", []float64{1, 1.0 / 2, 1.0 / 3, 1.0 / 4, 1.0 / 5, 1.0 / 6, 1.0 / 7, 1.0 / 8}}

	Timbres = []Timbre{Pure, Reed, String}
)

// ParseTimbre finds a timbre by name (case does not matter).
func ParseTimbre(s string) (Timbre, error) {
	var names []string
	for _, t := range Timbres {
		if strings.EqualFold(strings.TrimSpace(s), t.Name) {
			return t, nil
		}
		names = append(names, t.Name)
	}
	return Timbre{}, fmt.Errorf("timbre %q: use %s", s, strings.Join(names, ", "))
}

// Partial is one sinusoid of a drone: frequency in hertz, peak amplitude
// (linear, 1 = full scale).
type Partial struct {
	Hz, Amp float64
}

// Nyquist margin: partials at or above this fraction of the sample rate are
// left out, so nothing folds back below it.
const maxPartialShare = 0.45

// Partials are the sinusoids of the notes (fundamentals in hertz) in the
// timbre at the sample rate, scaled so that their amplitudes add up to peak
// (linear). The sum of amplitudes bounds the summed signal's peak, so peak is
// never exceeded; a single pure note reaches it exactly. Partials that
// coincide (a just fifth's 3rd and 2nd harmonics) are merged; the result is
// sorted by frequency.
func Partials(notes []float64, t Timbre, peak, rate float64) []Partial {
	var ps []Partial
	for _, f := range notes {
		for k, a := range t.Amps {
			hz := f * float64(k+1)
			if a <= 0 || hz >= maxPartialShare*rate || hz <= 0 {
				continue
			}
			ps = append(ps, Partial{hz, a})
		}
	}
	slices.SortFunc(ps, func(a, b Partial) int { return cmpFloat(a.Hz, b.Hz) })
	merged := ps[:0]
	for _, p := range ps {
		if n := len(merged); n > 0 && sameHz(merged[n-1].Hz, p.Hz) {
			merged[n-1].Amp += p.Amp
			continue
		}
		merged = append(merged, p)
	}
	sum := 0.0
	for _, p := range merged {
		sum += p.Amp
	}
	for i := range merged {
		merged[i].Amp *= peak / sum
	}
	return merged
}

// Frequencies lists the partials' frequencies.
func Frequencies(ps []Partial) []float64 {
	hz := make([]float64, len(ps))
	for i, p := range ps {
		hz[i] = p.Hz
	}
	return hz
}

// sameHz: within a part in 10⁹, closer than any two distinct partials a
// tuning makes (a schisma is 1.95 ¢, about a part in 10³).
func sameHz(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(a, b) }

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// Linear is a level in dBFS as a linear amplitude (0 dBFS = 1).
func Linear(dbfs float64) float64 { return math.Pow(10, dbfs/20) }

// DBFS is a linear amplitude in dBFS.
func DBFS(linear float64) float64 { return 20 * math.Log10(linear) }
