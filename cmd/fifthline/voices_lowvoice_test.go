package main

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/multipitch"
)

// The woodwind quartet's low voice frame by frame (voices_untuned_test.go:
// FluidR3's bassoon G2 under the clarinet's D4, the oboe's B4 and the
// flute's G5, then A2 under E4, C5 and A5, 6 to 8 dB under them). Each of
// the estimator's frames over the note's steady part is set beside the same
// frame of the bassoon's lone render and the lone part's readers
// (voices_truth_test.go: our one-pitch detector and aubio's yin, averaged
// over the frame's window), with the mix's voices that lie on its
// harmonics: every upper voice lies a few cents sharp of one (D4 16 ¢ over
// G2's 3rd, 2.8 Hz: a bin of the whole window, half a bin of the half
// window; B4 22 ¢ over its 5th, G5 27 ¢ over its 8th), so their partials
// share its partials 3, 5, 6, 8, 9, 10, …
//
// Measured: the bassoon's own loop swings every third frame, the lone
// render reading +3.9 ¢ there (1.02, 1.30, 1.58 … s) and −1 ¢ between; the
// note reads where its steady frames' mean lies (alone +0.2 ¢ over them,
// the note +0.3). In the mix G2's steady frames read +1.92 ¢ on their mean
// (the note +2.22): the frames that pulled it were those taken from the
// half window, at 1.30 s (+8.7 ¢) and 1.86 s (+11.1 ¢), where its
// sub-windows agreed (multipitch/timeavg.go's movingCents), so the half
// window's reading stood, and its bins part none of those shared partials.
// The half window took them as the one that heard G2 without following it:
// at 1.30 s it heard the same four voices as the whole window; at 1.86 s
// the whole window had G5 read an octave low. Now the whole window keeps a
// frame whose half window hears only its voices (+8.7 → +4.6 ¢; alone
// +3.9), and a steady voice that the half window read over 4 ¢ off its
// sub-windows' mean reads as that mean (+11.1 → +5.6 ¢): the frames' mean
// +1.92 → +1.44 ¢, the note +2.22 → +1.73. What remains lies mostly in the
// loop's frames (1.58 and 2.14 s: +7.2, +7.9 ¢ where alone +3.9), whose
// sub-windows read G2's own partials sharper in the mix than alone. A2 is
// read in 11 of its 21 steady frames (the tracker holds its note through
// the others: voicelost.go), +0.04 ¢ on their mean, alone −1.47 over the
// same frames: its sample rises from 18 ¢ flat over its first half second
// and swings up to 16 ¢ sharp every third frame (alone), so which frames
// the mix reads moves that mean by cents.
func TestWoodwindQuartetsLowVoiceFrameByFrame(t *testing.T) {
	t.Parallel()
	sc := untunedScene(t, "woodwind quartet: bassoon, clarinet, oboe, flute")
	dir := t.TempDir()
	lone, truth, _, readers := loneTruth(t, dir, "bassoon", "the woodwind quartet's bassoon", sc.parts[0])
	mix := noisyMono(t, dir, renderMIDI(t, dir, "all", testsignal.MIDIParts(sc.parts)), sc.snr)
	inMix, alone := meterFrames(t, mix, heardVoices), meterFrames(t, lone, heardVoices)
	yin := aubioTrack(t, lone, "yin")
	// half the whole window: a note's steady part begins half a window in
	// from its first frame (voicetrack.go) and ends so far before its
	// release.
	half := 0.0
	for _, fr := range inMix {
		half = max(half, fr.span/2)
	}
	for i, n := range sc.parts[0].Notes {
		var table strings.Builder
		fmt.Fprintf(&table, "%s (truth %.4f Hz), ¢ from the truth:\ntime_s window mix alone detector yin | the mix's voices on its partials\n", sc.spell(n.Key), truth[i])
		var mix, lone mean
		for _, fr := range inMix {
			if fr.at < n.Start+2*half || fr.at > n.Start+n.Seconds-half {
				continue
			}
			m, a := lowReading(fr.voices, truth[i]), lowReading(voicesAt(alone, fr.at), truth[i])
			mix.add(m)
			if !math.IsNaN(m) {
				lone.add(a) // over the frames the mix reads
			}
			fmt.Fprintf(&table, "%.3f %s %+6.2f %+6.2f %+6.2f %+6.2f |%s\n", fr.at, map[bool]string{true: "whole", false: "half "}[fr.span/2 == half],
				m, a, trackCents(readers.detector, fr.at, fr.span/2, truth[i]), trackCents(yin, fr.at, fr.span/2, truth[i]), onPartials(fr.voices, truth[i]))
		}
		t.Logf("the woodwind quartet's %s, read in %d of %d frames, their mean %+.2f ¢ from its truth (alone over the same frames %+.2f):\n%s",
			sc.spell(n.Key), mix.n, mix.frames, mix.of(), lone.of(), table.String())
		// The bar for a voice (2 ¢) on its frames' mean, as its
		// note reads them, for G2, read in all but its release's frames;
		// A2's sample rises and swings by up to 34 ¢ (alone), so the mean
		// of the frames the mix reads is no reading of the note.
		if i == 0 && (mix.n == 0 || math.Abs(mix.of()) > 2) {
			t.Errorf("%s: its frames' mean lies %+.2f ¢ from its truth (%d of %d frames read), want within 2 ¢", sc.spell(n.Key), mix.of(), mix.n, mix.frames)
		}
	}
}

// mean is the mean of the readings added, NaNs (no reading) counted apart.
type mean struct {
	sum       float64
	n, frames int
}

func (m *mean) add(c float64) {
	m.frames++
	if !math.IsNaN(c) {
		m.sum += c
		m.n++
	}
}

func (m mean) of() float64 { return m.sum / float64(m.n) }

// lowReading is how far the voice of vs within 50 ¢ of hz lies from it in
// cents, NaN for none.
func lowReading(vs []multipitch.Voice, hz float64) float64 {
	for _, v := range vs {
		if c := testsignal.Cents(v.Hz, hz); math.Abs(c) < 50 {
			return c
		}
	}
	return math.NaN()
}

// voicesAt are the voices of the frame of frames centred at t (none: nil).
func voicesAt(frames []meterFrame, t float64) []multipitch.Voice {
	for _, f := range frames {
		if math.Abs(f.at-t) < 1e-6 {
			return f.voices
		}
	}
	return nil
}

// trackCents is a reader's mean over at ± half within 50 ¢ of hz, in cents
// from hz (NaN: no frame there).
func trackCents(track []pitchFrame, at, half, hz float64) float64 {
	if m, ok := meanNear(track, at-half, at+half, hz); ok {
		return testsignal.Cents(m, hz)
	}
	return math.NaN()
}

// onPartials names the voices of vs over the low voice at hz that lie
// within a semitone's half of one of its harmonics: which, and how far.
func onPartials(vs []multipitch.Voice, hz float64) string {
	var s string
	for _, v := range vs {
		k := math.Round(v.Hz / hz)
		if c := testsignal.Cents(v.Hz, k*hz); k >= 2 && math.Abs(c) < 50 {
			s += fmt.Sprintf(" %.1f Hz %+.0f ¢ off partial %.0f;", v.Hz, c, k)
		}
	}
	return s
}
