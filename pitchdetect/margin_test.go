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
