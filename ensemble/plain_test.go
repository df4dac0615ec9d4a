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

// A violin entering in unison with another's held D5 (587.33 Hz, equal
// temperament at A4 = 440 Hz, ISO 16), before the bleed is weighed: its
// channel has heard that D5's bleed, plainly the other's, since the other
// began, and the entry rising out of it is its own, so its note starts and
// reads as in the same take without bleed. (A slower attack, rendered
// strings, is what the rising test is for: the strings-harder take of
// cmd/fifthline, whose first violin enters so on the second's D5.)
func TestAnAttackRisingOutOfTheBleedIsStillHeld(t *testing.T) {
	d5 := 440 * math.Exp2(5.0/12)
	parts := []part{{"vl2", testsignal.Saw, []tone{{d5, 0.2, 2, 0, 0}}}, {"vl1", testsignal.Saw, []tone{{d5, 0.9, 2, 0, 0}}}}
	players := []Player{{"vl2", 0}, {"vl1", 1}}
	entry := func(bleedDB float64) pitchdetect.Held {
		for _, n := range read(t, record(parts, 2.3, bleedDB, 3), players) {
			if n.Player.Name == "vl1" {
				return n.Held
			}
		}
		t.Fatalf("%g dB: the first violin's D5 not read", bleedDB)
		return pitchdetect.Held{}
	}
	wet, dry := entry(-20), entry(-200)
	if math.Abs(wet.Start-dry.Start) > 1e-9 || math.Abs(1200*math.Log2(wet.Hz/dry.Hz)) > 0.05 {
		t.Errorf("with bleed from %.4f s at %.3f Hz; without from %.4f s at %.3f Hz", wet.Start, wet.Hz, dry.Start, dry.Hz)
	}
}
