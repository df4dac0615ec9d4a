package session

import (
	"context"
	"math"
	"testing"

	"fifthline/target"
)

// A note's centre pitch leaves out the frames whose window still reaches
// into the note before it, however long the window is against the hop. A4
// (440 Hz, ISO 16) moves legato to B♭4, one equal-tempered semitone above
// (440·2^(1/12) = 466.164 Hz, definition of 12-TET); with a window of 32
// hops, frames up to 96 ms into B♭4 still hear A4, and a segmenter that
// assumed the default 9 hops averages them in (measured: A4 read 0.012 ¢
// sharp). With the right trim a clean sine's centre is exact to well
// under 0.005 ¢.
func TestRunTrimsEachNoteByTheDetectorsOwnWindow(t *testing.T) {
	bflat := 440 * math.Exp2(1.0/12)
	for _, c := range []struct{ window, hop int }{{4096, 128}, {4096, 512}, {2048, 1024}} {
		src := &tones{rate: 48000, parts: []tonePart{{440, 0.6}, {bflat, 0.6}}}
		var evs []Event
		err := Run(context.Background(), src, Options{Tunings: NewTunings(target.Default()),
			Window: c.window, Hop: c.hop,
			OnNote: func(e Event) error { evs = append(evs, e); return nil }})
		if err != nil {
			t.Fatal(err)
		}
		if len(evs) != 2 {
			t.Fatalf("window %d hop %d: %d notes, want A4 and B♭4", c.window, c.hop, len(evs))
		}
		for i, want := range []float64{440, bflat} {
			if cents := 1200 * math.Log2(evs[i].Hz/want); math.Abs(cents) > 0.005 {
				t.Errorf("window %d hop %d: note %d at %.3f Hz, %+.2f ¢ from %.3f Hz", c.window, c.hop, i+1, evs[i].Hz, cents, want)
			}
		}
	}
}
