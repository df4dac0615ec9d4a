package harmony

import (
	"math"
	"slices"
)

// Track is a player's or a voice's pitch frame by frame, for reading a
// note's pitch within each chord it belongs to: a held common tone moves
// when the chord around it changes.
type Track struct {
	Time, Hz []float64 // voiced frames only, in time order
}

// Add records a frame; unvoiced frames (hz 0) are not kept.
func (tr *Track) Add(t, hz float64) {
	if hz > 0 {
		tr.Time, tr.Hz = append(tr.Time, t), append(tr.Hz, hz)
	}
}

// Mean is the pitch over [from, to] (the mean of the frames' cents, so a
// vibrato's centre), 0 when no frame was voiced there.
func (tr *Track) Mean(from, to float64) float64 {
	i, _ := slices.BinarySearch(tr.Time, from)
	sum, n := 0.0, 0
	for ; i < len(tr.Time) && tr.Time[i] <= to; i++ {
		sum += math.Log2(tr.Hz[i])
		n++
	}
	if n == 0 {
		return 0
	}
	return math.Exp2(sum / float64(n))
}

// Forget drops the frames before a time, once no chord still to be read
// needs them. The frames are moved down only once they are half the
// track, so a long session's track stays as long as what it still needs
// at a cost that does not grow with it.
func (tr *Track) Forget(before float64) {
	i, _ := slices.BinarySearch(tr.Time, before)
	if i > 0 && 2*i >= len(tr.Time) {
		tr.Time, tr.Hz = slices.Delete(tr.Time, 0, i), slices.Delete(tr.Hz, 0, i)
	}
}
