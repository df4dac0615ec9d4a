package pitchdetect

import (
	"math"
	"testing"
)

// The tracks below are the detector's frames (cents against the note's
// middle frame, a hop of 512 samples at 48 kHz apart) over the steady
// parts of FluidR3 notes slurred in a brass quartet of our own, each part
// rendered alone (fluidsynth, fluid-soundfont-gm) and read at two phases
// of the hop (measured). The horn's A3 (General MIDI 60), slurred from G3,
// scoops 39 ¢, overshoots, swings back 14 ¢ under and holds wavering −1 to
// +9 ¢; at the first phase glide takes all that for a glide, its held
// range just within a quarter of the movement from the first frame, at the
// second, whose first frame reads 1 ¢ less low, not.
var (
	hornA3Phase0 = []float64{-36.55, -33.96, -19.93, -13.80, -14.69, -11.00, -6.73, -5.93, 2.04, 5.21, 2.67, -2.34, -6.42, -12.05, -13.87, -11.78, -8.35, -6.99, -6.66, -6.22, -5.69, -4.54, -2.90, -1.78, -0.51, -0.21, 0.00, 0.12, 1.11, 0.93, 1.97, 1.65, 1.20, 1.61, 2.59, 3.06, 3.82, 5.42, 6.10, 7.11, 9.13, 9.35, 5.11, 2.60, 0.89, -0.18, -0.51, -0.44, -0.75}
	hornA3Phase1 = []float64{-35.41, -21.27, -13.95, -14.40, -11.17, -6.25, -5.96, 2.01, 5.49, 4.21, -1.75, -5.98, -11.70, -13.71, -11.71, -8.41, -6.96, -6.59, -6.20, -5.76, -4.63, -3.26, -1.98, -0.52, -0.22, 0.00, 0.17, 1.16, 1.01, 2.10, 1.71, 1.24, 1.65, 2.64, 3.06, 3.82, 5.41, 6.03, 7.03, 9.15, 10.18, 5.43, 2.91, 1.14, -0.05, -0.45, -0.36, -0.65}
	// The second trumpet's C4 (56), slurred from D4: a scoop of 25 ¢ over
	// 0.1 s, then held within ±1.5 ¢ but for a dip of 7 ¢ late in the
	// note. With a neighbour's bleed hiding D4's last frame, the steady
	// part let in one frame more of the scoop (the first here).
	trumpetC4 = []float64{-25.90, -21.70, -18.28, -16.28, -14.83, -13.55, -11.70, -9.04, -6.51, -3.70, -1.73, -0.87, -0.87, -0.96, -0.96, -0.92, -0.55, 0.26, 1.05, 1.42, 1.32, 0.96, 0.64, 0.54, 0.57, 0.42, 0.00, -0.47, -0.79, -0.96, -1.17, -1.58, -2.19, -2.98, -3.93, -4.97, -5.95, -6.58, -6.69, -6.31, -5.60, -4.67, -3.59, -2.38, -1.33, -0.77, -0.53, 0.04}
)

// hopFrames is the track c as frames a hop apart from t0, at hz·2^(c/1200).
func hopFrames(c []float64, t0, hz float64) []Estimate {
	fr := make([]Estimate, len(c))
	for i, x := range c {
		fr[i] = Estimate{Time: t0 + float64(i)*512/48000, Hz: hz * math.Exp2(x/1200), Voiced: true}
	}
	return fr
}

// What a player calls a note that scoops or swings into its pitch is the
// part held after: glideAfter leaves out the horn's scoop and swing,
// whole, at both phases, its held part beginning at the same time within
// a hop and reading within 0.5 ¢ (at the second it read the whole note,
// 5 ¢ flat of the first, before scoop); the trumpet's scoop is left out,
// whole, whether its first frame came in or not, the two reading within
// 0.1 ¢ (0.4–0.9 ¢ apart before).
func TestAScoopIsLeftOutAtEveryPhase(t *testing.T) {
	s := NewSegmenter(512.0 / 48000)
	const wobble = 8 // the frames within a Window of a note's first frame
	for _, c := range []struct {
		name  string
		a, b  []float64
		t0a   float64 // the first frame's time, s, of a; b's is 0
		cents float64
	}{
		{"horn's A3", hornA3Phase0, hornA3Phase1, -0.0107, 0.5},
		{"trumpet's C4", trumpetC4, trumpetC4[1:], -0.0107, 0.1},
	} {
		ga, outA := s.glideAfter(hopFrames(c.a, c.t0a, 220), c.a, wobble)
		gb, outB := s.glideAfter(hopFrames(c.b, 0, 220), c.b, wobble-1)
		if outA < 1 || outB < 1 {
			t.Errorf("%s: %.2f and %.2f of the attack left out; want all of it at both phases", c.name, outA, outB)
		}
		ta, tb := c.t0a+float64(ga)*512/48000, float64(gb)*512/48000
		if ga == 0 || gb == 0 || math.Abs(ta-tb) > 1.01*512/48000 {
			t.Errorf("%s: held from %.3f s and %.3f s (frames %d, %d); want both, within a hop", c.name, ta, tb, ga, gb)
			continue
		}
		ma, _ := meanStd(c.a[ga:])
		mb, _ := meanStd(c.b[gb:])
		if math.Abs(ma-mb) > c.cents {
			t.Errorf("%s: held parts read %+.2f and %+.2f ¢; want within %.1f ¢", c.name, ma, mb, c.cents)
		}
	}
}

// What is no scoop: a steady drift lies no farther beyond its later half
// than that half spans; a vibrato's trough early in the note is met again
// later; one misread frame is not an attack; a held part shorter than a
// cycle of a usual vibrato may be half of one.
func TestWhatIsNoScoop(t *testing.T) {
	vibrato := make([]float64, 48) // ±12 ¢ at 6 Hz
	for i := range vibrato {
		vibrato[i] = 12 * math.Sin(2*math.Pi*6*float64(i)*512/48000)
	}
	misread := make([]float64, 40)
	for i := range misread {
		misread[i] = 0.3 * math.Sin(float64(i))
	}
	misread[2] = -20
	drift := make([]float64, 40)
	for i := range drift {
		drift[i] = -20 + float64(i)/2
	}
	for _, c := range []struct {
		name  string
		track []float64
	}{
		{"a steady drift", drift},
		{"a vibrato", vibrato},
		{"one misread frame", misread},
		{"a held part under a vibrato's cycle", hornA3Phase1[:34]},
	} {
		if g, _ := new(Segmenter).scoop(hopFrames(c.track, 0, 220), c.track); g != 0 {
			t.Errorf("%s: a scoop of %d frames, want none", c.name, g)
		}
	}
}
