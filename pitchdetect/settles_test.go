package pitchdetect

import (
	"math"
	"math/rand/v2"
	"testing"
)

// Where a held note's reading begins (Held.Settled) is known while it
// sounds: once its steady part has lasted 1.5 s, Settles tells exactly
// what the finished note will say, whatever the note does after. A pedal
// held under several chords is read in the chord it enters on from there,
// so that chord can be written as it ends, not as the pedal ends. Our own
// scenarios at a 10 ms hop: an attack rising 20 ¢ over 0.15 s into its
// pitch (a trumpet's rises some 20 ¢: common practice, from memory), the
// note then held 8 s and drifting 6 ¢ from 3 s on; the same with a 5.5 Hz
// vibrato of ±15 ¢ from 0.2 s in; and random long notes with and without
// such attacks, drifts and vibratos, also with Margin set (the voice
// tracker's segmenters).
func TestWhereALongNoteSettledIsKnownWhileItSounds(t *testing.T) {
	type shape struct {
		glide, vibrato, drift float64 // cents
		secs                  float64
	}
	shapes := []shape{{20, 0, 6, 8}, {20, 15, 6, 8}, {0, 0, 0, 8}}
	rng := rand.New(rand.NewPCG(3, 5))
	for range 40 {
		shapes = append(shapes, shape{[]float64{0, 8, -12, 25}[rng.IntN(4)], []float64{0, 10, 30}[rng.IntN(3)],
			8 * (rng.Float64() - 0.5), 1.5 + 6*rng.Float64()})
	}
	judged := 0
	for k, sh := range shapes {
		for _, margin := range []float64{0, 0.05} {
			s := NewSegmenter(0.01)
			s.Margin = margin
			jitter := rand.New(rand.NewPCG(uint64(k), 1))
			told, toldAt, known := 0.0, 0.0, false
			var notes []Held
			push := func(e Estimate) {
				if h, ok := s.Push(e); ok {
					notes = append(notes, h)
				}
				if at, ok := s.Settles(); ok && !known {
					told, toldAt, known = at, e.Time, true
				}
			}
			for i := range 20 {
				push(Estimate{Time: float64(i) * 0.01, Level: -60})
			}
			const start = 0.2
			for i := 0; float64(i)*0.01 < sh.secs; i++ {
				x := float64(i) * 0.01
				c := sh.glide * (min(x, 0.15)/0.15 - 1)
				if x > 0.2 {
					c += sh.vibrato * math.Sin(2*math.Pi*5.5*(x-0.2))
				}
				c += sh.drift * max(0, x-3) / 5
				c += 0.1 * jitter.NormFloat64()
				push(Estimate{Time: start + x, Hz: 220 * math.Exp2(c/1200), Voiced: true, Confidence: 1, Level: -20})
			}
			for i := range 30 {
				push(Estimate{Time: start + sh.secs + float64(i)*0.01, Level: -60})
			}
			if h, ok := s.Flush(); ok {
				notes = append(notes, h)
			}
			if len(notes) != 1 {
				t.Fatalf("shape %+v: %d notes, want 1", sh, len(notes))
			}
			if !known {
				continue // too short: its end says
			}
			judged++
			// Known 1.5 s into the steady part (a Window, or Margin, in),
			// once the frames past it reach as far as the steady part's
			// end lies before the note's (a Window, or Margin; at least
			// half a Window).
			if latest := start + s.margin() + settleSeconds + max(s.margin(), s.Window/2) + 0.015; toldAt > latest {
				t.Errorf("shape %+v, margin %.2f: where it settled told at %.2f s, want by %.2f s", sh, margin, toldAt, latest)
			}
			if told != notes[0].Settled {
				t.Errorf("shape %+v, margin %.2f: told it settled at %.3f s, the note says %.3f s", sh, margin, told, notes[0].Settled)
			}
			// The attack's glide is left out of the reading (glide.go: the
			// rest lies within a quarter of its movement from 0.12 s in),
			// though the note drifts later by more than that.
			if k == 0 && told < start+0.12 {
				t.Errorf("shape %+v: settled at %.3f s, in its glide (to %.2f s)", sh, told, start+0.15)
			}
		}
	}
	if judged < 40 {
		t.Errorf("only %d notes told where they settled", judged)
	}
}
