package pitchdetect

import (
	"math"
	"testing"
)

// A reader whose frames (0.1 s apart, read on 0.4 s windows) begin at a
// note's onset and go on through its release: 2 s at 0 ¢ wavering by up
// to half a cent, then a release 7 to 31 dB down that reads 8 ¢ sharp (a
// chorused section's release does: the choir's E3 +3.9 ¢ after its
// note-off, aubio's yin, measured in cmd/fifthline/voices_truth_test.go).
// With Margin (0.25 s) the steady part keeps the note from 0.25 s after
// its first frame to 0.25 s before its last frame within 6 dB of its
// median level (a Hann window half past an offset holds half a partial's
// amplitude: computed), and the release is no part of its reading;
// without it, the whole window is set aside at both ends, from the last
// frame of the release.
func TestMarginSetsAsideTheRelease(t *testing.T) {
	frames := func() []Estimate {
		var fr []Estimate
		for i := range 26 {
			at := 0.1 * float64(i)
			c, level := waver(i), -20.0
			if at > 2.05 {
				c, level = 8, -27-6*float64(i-21)
			}
			fr = append(fr, Estimate{Time: at, Hz: 440 * math.Exp2(c/1200), Confidence: 1, Voiced: true, Level: level})
		}
		return fr
	}
	for _, tc := range []struct {
		name         string
		margin, want float64
	}{
		// Frames 0.3 .. 1.7 s: the last within 6 dB is the note's last,
		// at 2 s.
		{"margin about half the window", 0.25, meanCents(3, 17)},
		// 0.4 .. 2.1 s, which holds the first frame of the release.
		{"whole window", 0, (meanCents(4, 20)*17 + 8) / 18},
	} {
		s := NewSegmenter(0.1)
		s.Window, s.Margin = 0.4, tc.margin
		for _, e := range frames() {
			s.Push(e)
		}
		h, ok := s.Flush()
		if !ok {
			t.Fatalf("%s: no note", tc.name)
		}
		got := 1200 * math.Log2(h.Hz/440)
		t.Logf("%s: %+.3f ¢, want %+.3f", tc.name, got, tc.want)
		if math.Abs(got-tc.want) > 0.01 {
			t.Errorf("%s: reads %+.3f ¢; want %+.3f", tc.name, got, tc.want)
		}
	}
}

// waver is frame i's cents: up to half a cent, irregular (no vibrato,
// no glide).
func waver(i int) float64 { return 0.5 * math.Sin(7.3*float64(i*i)) }

// meanCents is the mean of frames i to j's waver.
func meanCents(i, j int) float64 {
	s := 0.0
	for k := i; k <= j; k++ {
		s += waver(k)
	}
	return s / float64(j-i+1)
}

// The last note of a quick legato run, ending in silence: the detector's
// frames (pitch, level) of FluidR3's trumpet's C4 sixteenth at ♩ = 100,
// slurred from F4 (fluidsynth, measured). It rises 18 ¢ through its sound
// and holds 261.6 Hz for its last frames at −33 to −38 dB, then fades to
// −62 dB, its last frames wandering 0.33 ¢ back. aubio's yin over the key
// rendered alone as long puts the median of its sound at 260.12 Hz
// (cmd/fifthline's legato truth); the note moved one way, so it is read
// by its frames' median, not by the last few it reached: within 3 ¢ of
// that (9.1 ¢ sharp before its release was left out of the judgement).
func TestLastNoteOfARunRisingIntoItsReleaseIsReadByItsMedian(t *testing.T) {
	track := [][2]float64{
		{349.09, -30.8}, {349.21, -30.9}, {349.22, -30.7}, {349.23, -30.2}, {349.37, -30.0}, // F4
		{0, -29.9}, {0, -29.5},
		{258.01, -29.2}, {258.71, -29.1}, {259.15, -28.9}, {259.39, -28.9}, {259.56, -29.3}, {259.80, -29.5}, // C4
		{260.10, -29.6}, {260.50, -30.0}, {260.87, -30.7}, {261.22, -31.3}, {261.50, -32.2}, {261.61, -33.3},
		{261.62, -34.5}, {261.61, -35.7}, {261.61, -37.8}, {261.62, -41.3}, {261.65, -44.7}, {261.76, -48.3},
		{261.89, -50.8}, {261.97, -54.3}, {261.97, -57.9}, {261.92, -61.6},
		{0, -65.2}, {0, -67.8}, {0, -71.4}, {0, -75.0}, {0, -78.6}, {0, -82.1},
	}
	s := NewSegmenter(512.0 / 48000)
	s.Window = 4608.0 / 48000
	var notes []Held
	for i := range 14 { // F4 held before: the C4 is slurred from it
		track = append([][2]float64{{349.1 + 0.01*float64(i), -30}}, track...)
	}
	for i, f := range track {
		if h, ok := s.Push(Estimate{Time: float64(i) * 512 / 48000, Hz: f[0], Voiced: f[0] > 0, Level: f[1]}); ok {
			notes = append(notes, h)
		}
	}
	if h, ok := s.Flush(); ok {
		notes = append(notes, h)
	}
	if len(notes) != 2 {
		t.Fatalf("%d notes, want F4 C4: %+v", len(notes), notes)
	}
	if c := 1200 * math.Log2(notes[1].Hz/260.12); math.Abs(c) > 3 {
		t.Errorf("the C4 reads %.2f Hz, %+.1f ¢ from its sound's median 260.12 Hz", notes[1].Hz, c)
	}
}
