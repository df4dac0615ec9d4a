package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// An attack that glides into its pitch is left out of a note's pitch when
// the note settles after it; a vibrato is no glide. The tracks are cents a
// hop apart, shaped like the FluidR3 samples the quick legato runs test in
// cmd/fifthline measures (a trumpet's attack rising 15–20 ¢ over its first
// 0.1 s, an oboe's falling 10 ¢, a clarinet's easing into a 9 ¢ rise; a
// violin's vibrato of about ±12 ¢ at 6 Hz from the start).
func TestGlideRule(t *testing.T) {
	for _, c := range []struct {
		name  string
		track []float64
		glide int
	}{
		{"rise, then steady", []float64{-17, -15, -12, -9, -6, -3.5, -2.3, -1.9, -1.9, -1.7, -1.0, -0.2, 0.2, 0}, 5},
		{"fall, then steady", []float64{6, 5, 4, 3, 2, 1.1, 0.5, 0.1, -0.1, -0.3, -0.5, -0.5, -0.4, -0.2, 0}, 6},
		{"steady", []float64{0.1, 0, -0.1, 0, 0.1, 0, -0.1, 0}, 0},
		{"movement below glideCents", []float64{-2.5, -2, -1.5, -1, -0.5, 0, 0, 0, 0}, 0},
		{"vibrato, swinging back", []float64{-12, -9, -4, 2, 7, 11, 12, 10, 6, 0, -6, -10, -12}, 0},
		{"vibrato, ending on its crest", []float64{-17.9, -14.1, -12.5, -11.6, -7.5, -1.7, 5.4, 7.2, 7.4, 5.1, 0}, 0},
		{"easing in, then steady", []float64{-8.9, -8.7, -8.5, -8.3, -7.9, -7.1, -5.9, -4.3, -2.8, -1.9, -1.5, -1.3, -0.9, -0.5, 0}, 9},
		{"too little after it", []float64{-10, -7, -4, -1, 0}, 0},
		{"a steady drift", []float64{-12, -11, -10, -9, -8, -7, -6, -5, -4, -3, -2, -1, 0}, 0},
	} {
		if got := new(Segmenter).glide(c.track); got != c.glide {
			t.Errorf("%s: glide of %d frames, want %d", c.name, got, c.glide)
		}
	}
}

// A 0.3 s note whose pitch rises 18 ¢ linearly over its first 0.12 s and
// then holds reads as the pitch it holds, within 0.5 ¢ (with the glide in
// its mean it read 1.6 ¢ flat: measured).
func TestQuickNoteReadsThePitchItSettlesOn(t *testing.T) {
	rate := 48000.0
	hz := 349.2282 // F4, equal temperament from A4 = 440 Hz (ISO 16)
	pitch := func(s float64) float64 {
		return hz * math.Exp2(-18*max(0, 1-s/0.12)/1200)
	}
	x := make([]float64, int(rate*0.6))
	copy(x[int(rate*0.1):], testsignal.Tone(rate, int(rate*0.3), testsignal.Saw, 0.3, pitch))
	notes := segment(run(t, rate, x), rate)
	if len(notes) != 1 {
		t.Fatalf("%d notes, want 1: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[0].Hz, hz); math.Abs(c) > 0.5 {
		t.Errorf("read %+.2f ¢ from the pitch the note settles on", c)
	}
}

// A slurred 0.3 s note whose wide vibrato its steady part cuts in a trough
// is no glide: half a cycle there looks like a glide that settled, but the
// note's frames after its steady part rise again. The track is the
// detector's frames of FluidR3's violin C6 slurred from B5 to D6 in a run of
// eighths at ♩ = 100 (fluidsynth, measured; 0 where unvoiced). The note
// reads within 8 ¢ of the mean of its frames (+7.8 ¢ from C6), not in the
// trough (it read −10.0 ¢, 18 ¢ from their mean, with that half cycle taken
// for a glide).
func TestQuickVibratoIsNoGlide(t *testing.T) {
	c6 := 1046.502 // equal temperament from A4 = 440 Hz (ISO 16)
	var track []float64
	for range 24 {
		track = append(track, 966.2) // B5
	}
	track = append(track, 968.39, 970.67, 973.19, 978.17, 0, 0, 0, 0, 0,
		1066.30, 1064.53, 1055.85, 1053.77, 0, 1043.92, 1040.77, 1039.73, 1038.82, 1038.17, 1038.69,
		1040.74, 1043.11, 1047.17, 1050.29, 1054.26, 1060.58, 1063.32, 1063.81, 1062.61, 1057.58, 1053.19,
		0, 0, 0, 0, 0)
	for i := range 24 {
		track = append(track, 1196.6-float64(i)) // D6
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want 3: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[1].Hz, c6); math.Abs(c-7.8) > 8 {
		t.Errorf("read %+.2f ¢ from C6; its frames' mean is +7.8 ¢", c)
	}
}
