package multipitch

import (
	"cmp"
	"math"
	"slices"
)

// Twins of a vibrato. A vibrato wide against the long window spreads each
// partial's power towards the ends of its swing, where a frequency
// modulation's spectrum piles up, and the long fit may put a voice at each
// end, further apart than the prune's twin test (twinCents, prune.go)
// joins: measured, an additive C5 with ±30 ¢ at 5.5 Hz read so in every
// frame, and FluidR3's violin C5 alone (±13 ¢) in one (−15 and +11 ¢).
// The sub-windows, each under half the vibrato's cycle, hold one voice,
// and the two read it within twinCents of each other on at least half of
// those that read both (not all: at its steepest a ±30 ¢ vibrato crosses
// 90 ¢ within one, room for two; a frame has two of them). They are one
// voice, as are any two the time average leaves that close: its pitch the
// mean of both's sub-window readings, its power theirs together, its
// marks the louder one's. Left as two, the tracker follows one end of the
// swing (the lower, where they are twins in every frame: the C5 read 15 ¢
// flat) and a note moves by the share of such frames.

// mergeTwins makes each run of voices within twinCents of the one below
// one voice, lowest first (voices' indices are those of ta.sum, ta.count
// and ta.longHz).
func (ta *timeAverager) mergeTwins(voices []Voice) []Voice {
	ta.order = ta.order[:0]
	for v := range voices {
		ta.order = append(ta.order, v)
	}
	slices.SortFunc(ta.order, func(a, b int) int { return cmp.Compare(voices[a].Hz, voices[b].Hz) })
	ta.merge = ta.merge[:0]
	for g := 0; g < len(ta.order); {
		first := ta.order[g]
		m, ref := voices[first], ta.longHz[first]
		power, sum, n := 0.0, 0.0, 0
		end := g
		for ; end < len(ta.order) && (end == g || ta.twins(voices, ta.order[end-1], ta.order[end])); end++ {
			v := ta.order[end]
			if voices[v].Amplitude > m.Amplitude {
				m = voices[v] // the louder's marks
			}
			power += voices[v].Amplitude * voices[v].Amplitude
			// Its readings in cents from the first's long reading.
			sum += ta.sum[v] + float64(ta.count[v])*cents(ta.longHz[v], ref)
			n += ta.count[v]
		}
		if end-g > 1 {
			m.Amplitude = math.Sqrt(power)
			if n > 0 {
				m.Hz = ref * math.Exp2(sum/float64(n)/1200)
			}
		}
		ta.merge = append(ta.merge, m)
		g = end
	}
	return append(voices[:0], ta.merge...)
}

// twins reports whether voices i and j are one: within twinCents after the
// time average, or so on at least half the sub-windows that read both.
func (ta *timeAverager) twins(voices []Voice, i, j int) bool {
	k := min(i, j)*len(voices) + max(i, j)
	return math.Abs(cents(voices[i].Hz, voices[j].Hz)) < twinCents || (ta.agree[k] > 0 && ta.agree[k] >= ta.parted[k])
}

// compare counts, for each pair of voices the last sub-window fit read,
// whether it read them within twinCents.
func (ta *timeAverager) compare(voices []Voice) {
	nv := len(voices)
	for i := range nv {
		for j := i + 1; j < nv; j++ {
			if !ta.fitter.steers(i) || !ta.fitter.steers(j) {
				continue
			}
			if math.Abs(cents(ta.f0[i], ta.f0[j])) < twinCents {
				ta.agree[i*nv+j]++
			} else {
				ta.parted[i*nv+j]++
			}
		}
	}
}
