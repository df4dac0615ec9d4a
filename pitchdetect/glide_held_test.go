package pitchdetect

import (
	"math"
	"testing"
)

// A quick note that holds its pitch and then rises into its release has
// no attack's glide to leave out: the track is the detector's frames of
// FluidR3's flute's F4 eighth at ♩ = 120, slurred from A4 to D4
// (fluidsynth, measured): 349.1 Hz held for 85 ms, a rise of 10 ¢ into its
// release, three frames of the slur, D4. aubio's yin over the key
// rendered alone as long puts the median of its sound at 349.19 Hz
// (cmd/fifthline's legato truth). Its held frames, most of them set
// aside as its onset's wobble, do not leave the rise an attack settling
// on 351.3 Hz (read so, 10 ¢ sharp: measured); it reads within 4 ¢ of
// that median (its frames' mean, the rise in it).
func TestQuickNoteHeldThenRisingHasNoGlide(t *testing.T) {
	var track []float64
	for i := range 25 { // A4
		track = append(track, 438+0.08*float64(i))
	}
	track = append(track, 0,
		349.12, 349.07, 349.05, 349.13, 349.13, 349.11, 349.07, 349.13, // F4
		349.38, 349.71, 350.11, 350.45, 350.78, 351.05, 351.24, 351.35, 351.39, 351.39, 351.34, 351.26, 351.08,
		58.53, 0)
	for i := range 20 { // D4
		track = append(track, 292.7+0.1*float64(i))
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want A4 F4 D4: %+v", len(notes), notes)
	}
	if c := 1200 * math.Log2(notes[1].Hz/349.19); math.Abs(c) > 4 {
		t.Errorf("the F4 reads %.2f Hz, %+.1f ¢ from its sound's median 349.19 Hz", notes[1].Hz, c)
	}
}
