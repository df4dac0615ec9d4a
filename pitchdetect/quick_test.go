package pitchdetect

import "testing"

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
