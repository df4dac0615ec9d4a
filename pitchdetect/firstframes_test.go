package pitchdetect

import (
	"math"
	"testing"
)

// Which of a note's first frames its reading weighs.

// An attack's first frames parted from the rest by a dropout do not keep a
// glide in: FluidR3's voice oohs (General MIDI 53) D4 entering after A3 in
// a four-voice take with bleed (fluidsynth, mixed by sox; the detector's
// frames, measured) read 294.1 and 302.4 Hz over its consonant at one
// phase of the hop in eight, then nothing for four frames, then fell from
// 300.6 Hz to the 293.6 Hz it held. The first frame, in the held range,
// is no wobble before the fall (glide finds none); after the dropout the
// fall is a glide, as at the phases where those two frames are unvoiced.
func TestGlideAfterAnAttackPartedByADropout(t *testing.T) {
	hops := []int{0, 1, 6, 7, 8, 12, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22, 23, 24, 25, 26, 27, 28, 29, 30, 31, 32, 33, 34, 35}
	hz := []float64{294.122, 302.393, 300.571, 297.609, 296.460, 294.835, 294.897, 294.498, 294.016, 293.665, 293.532, 293.467,
		293.346, 293.228, 293.148, 293.208, 293.168, 293.099, 292.999, 293.286, 293.617, 293.831, 293.857, 293.838, 293.915,
		293.983, 293.977, 293.916, 294.235}
	s := NewSegmenter(512.0 / 48000)
	fr := make([]Estimate, len(hz))
	c := make([]float64, len(hz))
	for i := range hz {
		fr[i] = Estimate{Time: float64(hops[i]) * s.Hop, Hz: hz[i], Voiced: true}
		c[i] = 1200 * math.Log2(hz[i]/hz[0])
	}
	const wobble = 3 // those within a Window of the note's first frame, two hops before these
	if got := s.glide(c, wobble); got != 0 {
		t.Errorf("glide: %d frames, want none (the first frame lies in the held range)", got)
	}
	if got, _ := s.glideAfter(fr, c, wobble); got != 7 {
		t.Errorf("glideAfter: %d frames, want 7 (the two before the dropout and the fall after it)", got)
	}
	if got, _ := s.glideAfter(fr[2:], c[2:], wobble-2); got != 5 {
		t.Errorf("without the two frames: %d, want 5", got)
	}
}

// A slurred note's steady part begins half a Window after the last note's
// last frame, but for a note held turningSeconds or more never at its own
// first frame, the first its window lets the detector voice. FluidR3's
// trumpet (General MIDI 56) 0.55 s C4 slurred from D4 scoops from 257.8 Hz
// on that frame; alone, D4's release is read for three frames after its
// note ends and the first frame falls outside; with a neighbour's bleed not
// yet weighed the release was lost for a fourth frame at one phase of the
// hop in eight, and the first frame, 25 ¢ flat, came into the note's mean
// (fluidsynth, four channels mixed by sox; measured: 1.04 ¢ flat of the
// part alone, 0.58 ¢ without it). A quicker note keeps it.
func TestASlursSteadyPartBeginsAfterItsFirstFrame(t *testing.T) {
	s := NewSegmenter(512.0 / 48000)
	for _, c := range []struct {
		name   string
		gap    int // unvoiced frames between the notes
		frames int // the note's, a hop apart
		want   int // the first frame of the steady part, counted in the note
	}{
		{"two frames lost: half a Window after the last note", 2, 48, 2},
		{"three", 3, 48, 1},
		{"four: not the first frame", 4, 48, 1},
		{"six", 6, 48, 1},
		{"four, a quick note: its first frame", 4, 30, 0},
	} {
		s.from = slurFrom{hz: 293.7, last: 0}
		fr := centsTrack(make([]float64, c.frames))
		for i := range fr {
			fr[i].Time += float64(c.gap+1) * s.Hop
		}
		lo, turning := s.slurredFrom(fr, Held{Start: fr[0].Time, End: fr[len(fr)-1].Time})
		got := 0
		for got < len(fr) && fr[got].Time < lo {
			got++
		}
		if got != c.want || turning {
			t.Errorf("%s: steady part from frame %d (turning %v), want %d", c.name, got, turning, c.want)
		}
	}
}
