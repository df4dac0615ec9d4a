package pitchdetect

import (
	"fmt"
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A held note's reading must not depend on the phase of the hop: the same
// part after leads of silence an eighth of a hop apart reads each note
// within the ensemble issue's bar of itself (1 ¢, 1.5 ¢ with vibrato).
// The part is a viola's of our own (FluidR3, General MIDI 41, fluidsynth,
// bent 2 ¢ sharp): C4 for 2.9 s, D4 and G3 (with vibrato). FluidR3's D4 holds 15 ¢ sharp of
// where it then wavers for its first 0.3 s: left out whole or not at all
// as its reach beyond the range its later half spans fell either side of
// the scoop rule's line, it read +2.2 ¢ after leads of 0–2 eighths of a
// hop and −2.0 ¢ after 3–7, 4.27 ¢ apart; its reach measured in the held
// part's standard deviations and the attack left out in part between a
// drift's reach and a scoop's, 0.24 ¢ apart (measured).
func TestAHeldNoteReadsAlikeAtEveryPhaseOfTheHop(t *testing.T) {
	if testing.Short() {
		t.Skip("renders with fluidsynth")
	}
	viola := testsignal.MIDIPart{Program: 41, Cents: 2, Notes: []testsignal.TimedNote{
		{Key: 60, Start: 0, Seconds: 2.9}, {Key: 62, Start: 3, Seconds: 1.4}, {Key: 55, Start: 4.5, Seconds: 1.6, Cents: 1.955 - 2}}}
	// As the ensemble's takes make a part's channel: the render's two
	// channels mixed to one (FluidR3's viola differs between them), after
	// 0.3 s of silence.
	lr, _ := fluidMIDIStereo(t, testsignal.MIDIParts([]testsignal.MIDIPart{viola}))
	x := make([]float32, 14400, 14400+len(lr)/2)
	for i := 0; i+1 < len(lr); i += 2 {
		x = append(x, (lr[i]+lr[i+1])/2)
	}
	const hop = 512   // the default detector's at 48 kHz
	var read [][]Held // by lead
	for lead := 0; lead < hop; lead += hop / 8 {
		notes := readAsAnalyzeDoes(t, append(make([]float32, lead), x...))
		if len(notes) != len(viola.Notes) {
			t.Fatalf("after %d samples: %d notes, %d played: %+v", lead, len(notes), len(viola.Notes), notes)
		}
		read = append(read, notes)
	}
	for j, n := range viola.Notes {
		lo, hi, bar := math.Inf(1), math.Inf(-1), 1.0
		for _, notes := range read {
			lo, hi = min(lo, notes[j].Hz), max(hi, notes[j].Hz)
			if notes[j].VibratoWidth > 0 {
				bar = 1.5
			}
		}
		name := fmt.Sprintf("key %d at %.1f s", n.Key, n.Start)
		if spread := testsignal.Cents(hi, lo); spread > bar {
			t.Errorf("%s: %.4f–%.4f Hz over the hop's eight phases, %.2f ¢ apart; allowed %.1f ¢", name, lo, hi, spread, bar)
		} else {
			t.Logf("%s: %.4f–%.4f Hz over the hop's eight phases, %.2f ¢ apart", name, lo, hi, spread)
		}
	}
}

// readAsAnalyzeDoes reads x (48 kHz) as a recording's one channel is read:
// a default detector, its segmenter rereading the frames it asks for.
func readAsAnalyzeDoes(t *testing.T, x []float32) []Held {
	d, err := New(48000, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	s := d.NewSegmenter()
	s.Reread = d.Reread
	var notes []Held
	for _, e := range d.Feed(x, nil) {
		if h, ok := s.Push(e); ok {
			notes = append(notes, h)
		}
	}
	if h, ok := s.Flush(); ok {
		notes = append(notes, h)
	}
	return notes
}
