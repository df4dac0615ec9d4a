package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A quick slurred note whose slurs are read as blips at a subharmonic: the
// track is the detector's frames of FluidR3's violin (fluidsynth, measured)
// over sixteenths at ♩ = 100, D4 B♭3 G3 E4 low on the G string: D4, three
// frames at B♭1 (D4's and B♭3's common period, read at phase 0), B♭3, seven
// frames at E♭2 (B♭3's third subharmonic), G3 for five frames, three at C2
// (G3's third subharmonic, E4's fifth), E4. The G3 is a note: it sounds
// 0.15 s, and from the middle of its slur in to the first frame after it
// lasts 0.096 s, so it was dropped as a blip (it was lost, and C2 given out
// in its place: measured). The blips are no notes: each is a subharmonic
// of the note before it.
func TestSlurredNoteBetweenSubharmonicBlipsIsANote(t *testing.T) {
	track := []float64{
		294.59, 294.40, 293.55, 292.94, 292.32, 291.69, 291.71, 292.20, 292.63, 292.82, 293.06, 293.59, 294.48, // D4
		58.74, 58.75, 58.74, // B♭1
		235.09, 234.93, 234.62, 234.30, 233.99, 233.91, 234.02, 234.33, 234.71, 235.02, 235.40, // B♭3
		78.58, 78.72, 78.86, 79.05, 79.10, 79.09, 79.03, // E♭2
		197.32, 197.09, 196.85, 196.72, 196.71, // G3
		65.61, 65.72, 65.91, // C2
		330.46, 329.90, 328.84, 328.10, 327.47, 327.51, 328.27, 328.55, 328.72, 329.28, 329.6, 329.7, 329.6, // E4
	}
	notes := pushTrack(track)
	want := []float64{293.66, 233.08, 196.00, 329.63} // D4 B♭3 G3 E4, equal temperament at A4 = 440 Hz
	if len(notes) != len(want) {
		t.Fatalf("%d notes, want D4 B♭3 G3 E4: %+v", len(notes), notes)
	}
	for i, n := range notes {
		if math.Abs(testsignal.Cents(n.Hz, want[i])) > 30 {
			t.Errorf("note %d reads %.2f Hz, want near %.2f", i+1, n.Hz, want[i])
		}
	}
}

// A quick note read straight on from the note before: the track is the
// detector's frames of FluidR3's trumpet (fluidsynth, measured) over
// sixteenths at ♩ = 100, B4 G4 G5 C5, at the phase of the hop (384 samples
// in) where G4's last frames run into G5's first with no frame between:
// B4, two frames at E3 (B4's third subharmonic), G4 with one frame
// unvoiced, G5 for 8 frames, C5. The G5 is a note: it sounds 0.15 s, but
// from the middle of its slur in to C5's first frame it lasts 0.091 s, under
// MinSeconds, and it was dropped (measured). Its frames are twice
// MinFrames: too many to be G4 misread.
func TestSlurredNoteStraightOnFromTheNoteBeforeIsANote(t *testing.T) {
	track := []float64{
		485.13, 486.96, 488.10, 488.65, 489.09, 489.78, 490.58, 491.26, 491.80, 492.30, 492.83, 493.31, 493.73, 493.86, // B4
		164.55, 164.90, // E3
		386.47, 387.33, 387.77, 387.93, 388.26, 388.76, 389.28, 389.73, 390.14, 390.53, 390.87, 390.17, 0, 387.91, 389.79, 391.23, // G4
		784.62, 785.81, 786.58, 786.83, 786.78, 786.35, 785.73, 785.23, // G5
		523.05, 521.64, 516.47, 518.27, 519.39, 520.32, 521.45, 522.28, 522.93, 523.48, 524.10, 524.82, 525.45, 525.77, // C5
	}
	notes := pushTrack(track)
	want := []float64{493.88, 392.00, 783.99, 523.25} // B4 G4 G5 C5, equal temperament at A4 = 440 Hz
	if len(notes) != len(want) {
		t.Fatalf("%d notes, want B4 G4 G5 C5: %+v", len(notes), notes)
	}
	for i, n := range notes {
		if math.Abs(testsignal.Cents(n.Hz, want[i])) > 30 {
			t.Errorf("note %d reads %.2f Hz, want near %.2f", i+1, n.Hz, want[i])
		}
	}
}
