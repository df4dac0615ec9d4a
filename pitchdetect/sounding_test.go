package pitchdetect

import (
	"math/rand/v2"
	"testing"
)

// A note the segmenter says is sounding is given, when it ends, as a note
// beginning where it said and lasting at least through the frame it
// said, whatever follows: the shapes of TestWhatIsAHeldNote (echoes,
// blips, slurs, an attack read an octave low, dropouts) and random tracks
// of notes, subharmonics and silences at random levels (our own
// scenarios). The pedal under a run of chords is one long such note, and
// its chords are read while it sounds on this promise.
func TestASoundingNoteIsGivenWhereItBegan(t *testing.T) {
	shapes := [][][3]float64{
		{{20, 440, -20}, {8, 0, -21}, {20, 440, -20}},
		{{30, 440, -20}, {4, 0, -40}, {12, 440, -32}, {20, 0, -60}},
		{{30, 440, -20}, {4, 0, -40}, {3, 440, -34}, {12, 440, -28}, {20, 0, -60}},
		{{30, 349.23, -20}, {7, 987.77, -22}, {30, 392, -20}},
		{{20, 440, -20}, {4, 0, -20}, {8, 493.88, -20}, {3, 0, -20}, {20, 523.25, -20}},
		{{20, 392, -20}, {9, 196, -20}, {20, 587.33, -20}},
		{{5, 220, -20}, {40, 440, -20}, {3, 0, -50}},
	}
	rng := rand.New(rand.NewPCG(7, 13))
	for range 300 {
		var parts [][3]float64
		for range 8 {
			hz := []float64{0, 220, 440, 330, 110, 441}[rng.IntN(6)]
			parts = append(parts, [3]float64{float64(1 + rng.IntN(25)), hz, -20 - 30*rng.Float64()})
		}
		shapes = append(shapes, parts)
	}
	promised := 0
	for k, parts := range shapes {
		hz, level := track(parts...)
		s := NewSegmenter(0.01)
		type promise struct{ start, through float64 }
		var open []promise
		var notes []Held
		for i := range hz {
			e := Estimate{Time: float64(i) * 0.01, Hz: hz[i], Voiced: hz[i] > 0, Confidence: 1, Level: level[i]}
			if h, ok := s.Push(e); ok {
				notes = append(notes, h)
			}
			if start, through, ok := s.Sounding(); ok {
				open = append(open, promise{start, through})
			}
		}
		if h, ok := s.Flush(); ok {
			notes = append(notes, h)
		}
		for _, p := range open {
			kept := false
			for _, n := range notes {
				kept = kept || n.Start == p.start && n.End >= p.through
			}
			if !kept {
				t.Fatalf("track %d %v: sounding from %.2f s through %.2f s, but the notes are %+v", k, parts, p.start, p.through, notes)
			}
		}
		promised += len(open)
	}
	if promised < 1000 {
		t.Errorf("only %d promises made over the tracks", promised)
	}
}

// The first note of a stream is no echo: a steady A4 heard from 0.1 s on,
// as a microphone hears a held note that began as listening did, is
// sounding once it is long enough to count, not only when it ends (our own
// scenario).
func TestTheFirstNoteOfAStreamIsSounding(t *testing.T) {
	hz, level := track([3]float64{10, 0, -60}, [3]float64{100, 440, -20})
	s := NewSegmenter(0.01)
	for i := range hz {
		s.Push(Estimate{Time: float64(i) * 0.01, Hz: hz[i], Voiced: hz[i] > 0, Confidence: 1, Level: level[i]})
	}
	if start, through, ok := s.Sounding(); !ok || start != 0.1 || through < 1.0 {
		t.Errorf("sounding from %.2f s through %.2f s (%v), want from 0.10 s through 1.09 s", start, through, ok)
	}
}
