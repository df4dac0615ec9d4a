package ui

import (
	"math"
	"slices"
	"testing"

	"fifthline/internal/voiceframes"
)

// openVoicingFrames reads testdata/open-voicing-frames.csv: the
// one-microphone voices' frames of a rendered scene (FluidR3's trombone,
// horn and flute holding C3 G4 E5 from 0 to 2.5 s, then E3 G4 B5; the
// open voicing of cmd/fifthline/voices_untuned_test.go), as listen
// --voices 3 hands them to the meter, written by cmd/fifthline's
// TestGroupMeterKeepsAVoiceOffALowerVoicesPartial (-write-meter-frames).
func openVoicingFrames(t *testing.T) []voiceframes.Frame {
	t.Helper()
	frames, err := voiceframes.Read("testdata/open-voicing-frames.csv")
	if err != nil {
		t.Fatal(err)
	}
	return frames
}

// meterOfFrames feeds the frames up to until to a three-row group meter in
// C major as cmd/fifthline's voicesMeter does, a row per voice shown
// (hidden says which are left out), lowest first. It gives the chord line
// after each frame and in how many frames from from a row holds E5.
func meterOfFrames(t *testing.T, frames []voiceframes.Frame, from, until float64, hidden func(voiceframes.Frame) []bool) (lines []string, e5 int) {
	g := newGroupModel(newModel(keyOf(t, "C major"), "test tones"), []string{"voice 1", "voice 2", "voice 3"}, 0)
	for _, fr := range frames {
		if fr.At > until {
			break
		}
		hz, levels := make([]float64, 3), []float64{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
		row := 0
		for v, h := range hidden(fr) {
			if !h && row < 3 {
				hz[row], levels[row] = fr.Hz[v], fr.DB[v]
				row++
			}
		}
		g.AddFrame(GroupFrame{Time: fr.At, Hz: hz, Levels: levels, Doubled: make([]bool, 3), Level: slices.Max(levels), Span: fr.Span})
		lines = append(lines, chordLine(g).Text())
		if fr.At >= from && slices.ContainsFunc(g.readings(), func(r rowReading) bool { return r.Holding && r.Note.Pretty() == "E5" }) {
			e5++
		}
	}
	return lines, e5
}

// changes is how often the line changes from one frame to the next.
func changes(lines []string) int {
	n := 0
	for i := 1; i < len(lines); i++ {
		if lines[i] != lines[i-1] {
			n++
		}
	}
	return n
}

// The flute's E5 lies 21 ¢ over the trombone's C3's 5th partial, most of
// its frames marked as that partial; the tracker keeps its note
// (partialNoteCents), and the meter now shows what the tracker keeps. Fed
// the chord's frames to 2.4 s (before its release), the meter names
// C major from its third frame (the first two hold C3 and G4, E5's first
// marked) and no other chord after; a row holds E5 from 0.5 s (the
// attacks over) in every frame but the two where the estimator read E4 in
// its place (0.56 and 0.65 s), the first of which leaves the chord's rows
// moving for a frame ("last chord C major"). Judging each frame's mark
// alone, E5 came and went: the line went off and on five times more and
// ended on C open fifth. Common practice: C E G is C major, C G an open
// fifth.
func TestAVoiceOffALowerVoicesPartialStaysOnTheMeter(t *testing.T) {
	frames := openVoicingFrames(t)
	before, e5Before := meterOfFrames(t, frames, 0.5, 2.4, func(fr voiceframes.Frame) []bool { return fr.Marked })
	after, e5After := meterOfFrames(t, frames, 0.5, 2.4, func(fr voiceframes.Frame) []bool { return fr.Partials })
	steady := 0
	for _, fr := range frames {
		if fr.At >= 0.5 && fr.At <= 2.4 {
			steady++
		}
	}
	t.Logf("frame by frame: E5 held in %d of %d frames, the chord line changed %d times: %q", e5Before, steady, changes(before), before)
	t.Logf("as the notes: E5 held in %d of %d frames, the chord line changed %d times: %q", e5After, steady, changes(after), after)
	named := slices.Index(after, "chord C major · root C3")
	if named != 2 {
		t.Errorf("C major named at frame %d, want the third", named+1)
	}
	dips := 0
	for _, line := range after[max(named, 0):] {
		switch line {
		case "last chord C major":
			dips++
		case "chord C major · root C3":
		default:
			t.Errorf("after C major, the chord line reads %q", line)
		}
	}
	if dips > 1 {
		t.Errorf("the chord line went off C major %d times: %q", dips, after)
	}
	if e5After != steady-2 {
		t.Errorf("E5 held in %d of %d frames; want all but the two where E4 was read", e5After, steady)
	}
}
