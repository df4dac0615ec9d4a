package harmony

import (
	"cmp"
	"math"
	"slices"

	"fifthline/target"
)

// One microphone hears a loud voice's strong partial now and then as a
// voice of its own (an oboe's A4's 3rd partial as E6), and a chord with such
// a note in it names no chord at all (F3 F4 A4 E6): the chord the others
// make, which is what sounds, would be lost with it. So for voices heard on
// one channel, a stretch whose notes name no chord is named without a note
// lying on a lower note's harmonic, the highest such note first, where the
// rest then name a chord; the note is no member of it. Players each on
// their own channel are not read so: a player's note is the player's.

// harmonics are the partials of a lower note a note may pass for: all but
// its octaves (2, 4, 8), whose pitch class is the lower note's and so
// changes no chord's name.
var harmonics = [...]float64{3, 5, 6, 7, 9, 10}

// harmonicCents: a note this near a lower note's partial lies on it, as
// the estimator judges a voice on another's partials (35 ¢,
// multipitch.OctaveAbove).
const harmonicCents = 35.0

// nameLeavingPartial names the chord of hz less one note lying on a lower
// one's harmonic, the highest such note first, and returns the indices into
// hz of the notes it kept (HeardChord's member indices count among those).
func nameLeavingPartial(tu target.Tuning, hz []float64, seventh float64) (target.HeardChord, []int, bool) {
	if len(hz) < 3 {
		return target.HeardChord{}, nil, false
	}
	order := make([]int, len(hz))
	for i := range order {
		order[i] = i
	}
	slices.SortFunc(order, func(a, b int) int { return cmp.Compare(hz[b], hz[a]) })
	for _, j := range order {
		if !onHarmonic(hz[j], hz) {
			continue
		}
		var kept []int
		var rest []float64
		for i, f := range hz {
			if i != j {
				kept, rest = append(kept, i), append(rest, f)
			}
		}
		if hc, ok := tu.NameChord(rest, seventh); ok {
			return hc, kept, true
		}
	}
	return target.HeardChord{}, nil, false
}

// onHarmonic: f lies on a harmonic of a lower pitch among hz.
func onHarmonic(f float64, hz []float64) bool {
	for _, lo := range hz {
		for _, k := range harmonics {
			if lo < f && math.Abs(1200*math.Log2(f/(k*lo))) < harmonicCents {
				return true
			}
		}
	}
	return false
}
