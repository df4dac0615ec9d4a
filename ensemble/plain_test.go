package ensemble

import (
	"context"
	"math"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// counted is a take that tells how far it has been read.
type counted struct{ *take }

// A resting player's channel reads a neighbour's note as bleed from the
// first frame, before the bleed between the two is weighed. Those frames
// are plainly the neighbour's, given away at once: no moment waits for
// them, so the playing player's frames leave Run as soon as they are read
// (before, every moment of the first notes waited attackFrames hops). The
// resting player stays silent. The take: a cello's C3 (equal temperament,
// A4 = 440 Hz, ISO 16) alone on one close microphone, the other hearing it
// 20 dB down and 3 ms late (the ensemble issue's range).
func TestARestingChannelsBleedHoldsNoMomentBack(t *testing.T) {
	c3 := 440 * math.Exp2(-21.0/12)
	parts := []part{{"vc", testsignal.Saw, []tone{{c3, 0.2, 1.5, 0, 0}}}, {"vl", testsignal.Saw, nil}}
	src := counted{record(parts, 1.8, -20, 3)}
	lags := map[int]int{} // hops between a frame's reading and its leaving Run, counted by frame
	var notes []Note
	err := Run(context.Background(), src, Options{Players: []Player{{"vc", 0}, {"vl", 1}},
		Tunings: session.NewTunings(target.Default()),
		OnNote:  func(n Note) error { notes = append(notes, n); return nil },
		OnFrame: func(i int, e pitchdetect.Estimate) {
			if i == 0 {
				lags[int(math.Floor((float64(src.pos)/rate-e.Time)*rate/512))]++
			}
		}})
	if err != nil {
		t.Fatal(err)
	}
	least := math.MaxInt
	for l := range lags {
		least = min(least, l)
	}
	for l, n := range lags {
		if l > least {
			t.Errorf("%d of the cello's frames left Run %d hops later than the quickest", n, l-least)
		}
	}
	if len(notes) != 1 || notes[0].Player.Name != "vc" || notes[0].Reading.Note.String() != "C3" {
		t.Errorf("notes %+v; want the cello's C3 alone", notes)
	}
}
