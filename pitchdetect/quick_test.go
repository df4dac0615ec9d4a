package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// pushTrack feeds a frame track (Hz a hop apart at 48 kHz, 0 where
// unvoiced, all at one level) through a Segmenter matched to the default
// detector and returns the held notes.
func pushTrack(track []float64) []Held {
	s := NewSegmenter(512.0 / 48000)
	s.Window = 4608.0 / 48000
	var notes []Held
	for i, hz := range track {
		if h, ok := s.Push(Estimate{Time: float64(i) * 512 / 48000, Hz: hz, Voiced: hz > 0, Level: -30}); ok {
			notes = append(notes, h)
		}
	}
	if h, ok := s.Flush(); ok {
		notes = append(notes, h)
	}
	return notes
}

// A quick note slurred between two others may be voiced in only three
// frames, the first alone between frames the detector missed at the note's
// level: the frames around both slurs hold two notes. The track is the
// detector's frames of FluidR3's violin C♯6 sixteenth (♩ = 100) slurred
// from B5 to D6 (fluidsynth, measured). It is a note: from the middle of one
// slur to the next it lasts 0.18 s, and its frames agree.
func TestSparselyVoicedSlurredNoteIsANote(t *testing.T) {
	var track []float64
	for range 20 {
		track = append(track, 966.2) // B5
	}
	track = append(track, 972.54, 976.35, 0, 0, 0, 0, 0, 1114.36, 0, 0, 1117.83, 1116.27, 0, 0, 0, 0, 0, 0, 0, 0, 0)
	for i := range 20 {
		track = append(track, 1179.1+float64(i%3)) // D6
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want B5 C♯6 D6: %+v", len(notes), notes)
	}
	if notes[1].Hz < 1110 || notes[1].Hz > 1120 {
		t.Errorf("the middle note reads %.2f Hz, want C♯6's frames", notes[1].Hz)
	}
}

// A quick note slurred from another may be read an octave low for most
// of its frames, passing straight into its own pitch at the very octave
// above: the track is the detector's frames of FluidR3's violin C5
// sixteenth (♩ = 100) slurred from E5 to A4, delayed 192 samples
// (fluidsynth, measured): E5, three frames read as neither, a stray, C4
// for seven frames, C5 for two, and strays in the slur to A4. It is one
// note, C5, read from all its frames: within 2 ¢ of the pitch its own
// frames hold (it was given out as C4, and at two other phases of the hop
// lost: measured). A note of its own an octave below would be slurred into
// C5 through frames read as neither.
func TestAttackReadAnOctaveLowIsTheNotesOwn(t *testing.T) {
	var track []float64
	for range 20 {
		track = append(track, 660.4) // E5
	}
	track = append(track, 0, 0, 0, 47.4, 260.5, 260.7, 260.9, 261.2, 261.3, 261.5, 261.7, 523.5, 523.6, 0, 87.3, 87.3)
	for range 20 {
		track = append(track, 441.2) // A4
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want E5 C5 A4: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[1].Hz, 2*261.3); math.Abs(c) > 2 {
		t.Errorf("the middle note reads %.2f Hz, %+.1f ¢ from C5's frames", notes[1].Hz, c)
	}
}

// A slurred sixteenth (0.15 s, ♩ = 100) whose pitch rises 20 ¢ through its
// whole length toward the next note, from 10 ¢ flat to 10 ¢ sharp of F4
// slurred on up to A4, or falls as much slurred on down to C4, has no
// settled part: what it sounds is its whole movement, whose median is F4
// itself. It reads within 1 ¢ of F4, from its own frames up to half a
// Window before the next note's first, as they begin half a Window after
// the last note's last. (Read to half a Window before its own last frame,
// as a note that moves both ways is, it read its earlier frames: 1.4 ¢
// flat rising, 1.4 ¢ sharp falling; measured.) It follows a held D4.
// Equal temperament from A4 = 440 Hz (ISO 16).
func TestSlurredNoteDriftingThroughItsLengthReadsItsMiddle(t *testing.T) {
	rate := 48000.0
	c4, d4, f4, a4 := 261.6256, 293.6648, 349.2282, 440.0
	for _, c := range []struct{ way, next float64 }{{1, a4}, {-1, c4}} {
		pitch := func(s float64) float64 {
			switch {
			case s < 0.3:
				return d4
			case s < 0.45:
				return f4 * math.Exp2(c.way*(-10+20*(s-0.3)/0.15)/1200)
			}
			return c.next
		}
		x := make([]float64, int(rate*1.1))
		copy(x[int(rate*0.1):], testsignal.Tone(rate, int(rate*0.75), testsignal.Saw, 0.3, pitch))
		notes := segment(run(t, rate, x), rate)
		if len(notes) != 3 {
			t.Fatalf("%d notes, want D4 F4 and the next: %+v", len(notes), notes)
		}
		if got := testsignal.Cents(notes[1].Hz, f4); math.Abs(got) > 1 {
			t.Errorf("the sixteenth moving %+.0f ¢ reads %+.2f ¢ from F4, the middle of its movement", 20*c.way, got)
		}
	}
}
