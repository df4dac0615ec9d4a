package multipitch

import (
	"strconv"
	"testing"

	"fifthline/internal/testsignal"
)

// Lone and self-doubled voices side by side: FluidR3's bassoon, trombone,
// French horn and clarinet (General MIDI programs 71, 58, 61 and 72,
// 0-based 70, 57, 60 and 71: common practice) held 2 s alone and with the
// same instrument an octave above (MIDI key k and k+12, equal temperament
// from A4 = 440 Hz, ISO 16), and sox's sawtooth and square alone and with
// the same wave an octave above, with white noise 40 dB under. Logged: the
// frames of the held tone (0.3 to 1.9 s) in which the lower voice is marked
// doubled. Asserted only that every take is read (at least four frames);
// what the marks say is logged, since a formant's strong even partials (a
// bassoon's) still read as a double in some frames: issue #14.
func TestLoneAndSelfDoubledVoicesMarked(t *testing.T) {
	fluid := func(prog int, keys ...int) []float64 {
		var parts []testsignal.MIDIPart
		for _, k := range keys {
			parts = append(parts, testsignal.MIDIPart{Program: prog, Notes: []testsignal.TimedNote{{Key: k, Seconds: 2}}})
		}
		return fluidRaw(t, parts...)
	}
	sox := func(wave string, hz ...float64) []float64 {
		args := []string{"synth", "2"}
		for _, f := range hz {
			args = append(args, wave, strconv.FormatFloat(f, 'f', 4, 64))
		}
		return soxRaw(t, "-n", append(args, "remix", "-", "gain", "-8")...)
	}
	type take struct {
		name string
		key  int
		lone func() []float64
		dbl  func() []float64
	}
	var takes []take
	for _, c := range []struct {
		name string
		prog int
		keys []int
	}{
		{"bassoon", 70, []int{48, 53}}, {"trombone", 57, []int{48, 53}}, {"French horn", 60, []int{50, 57}}, {"clarinet", 71, []int{55}},
	} {
		for _, k := range c.keys {
			takes = append(takes, take{"FluidR3 " + c.name, k,
				func() []float64 { return fluid(c.prog, k) }, func() []float64 { return fluid(c.prog, k, k+12) }})
		}
	}
	for _, w := range []string{"sawtooth", "square"} {
		hz := keyHz(55)
		takes = append(takes, take{"sox " + w, 55, func() []float64 { return sox(w, hz) }, func() []float64 { return sox(w, hz, 2*hz) }})
	}
	for _, tk := range takes {
		var marks [2]int
		frames := 0
		for i, x := range [][]float64{tk.lone(), tk.dbl()} {
			testsignal.AddNoise(x, testsignal.White(newRand(uint64(tk.key)), len(x)), 40)
			s := hear(t, x, Config{}, 0.3, 1.9, keyHz(tk.key))
			if s.frames < 4 {
				t.Errorf("%s, key %d: %d frames", tk.name, tk.key, s.frames)
			}
			marks[i], frames = s.doubled[0], s.frames
		}
		t.Logf("%-20s key %d: marked doubled in %2d of %d frames alone, %2d doubled", tk.name, tk.key, marks[0], frames, marks[1])
	}
}
