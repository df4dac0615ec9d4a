package multipitch

import (
	"math"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
)

// loneTubaKeys are MIDI keys across the tuba's range (F1 B♭1 D2 F2 B♭2 D3
// F3; the tuba's written range from about D1 to F4 is common practice).
var loneTubaKeys = []int{29, 34, 38, 41, 46, 50, 53}

// oneVoiceHz is the median of the one-pitch detector's voiced readings of x
// over [from, to) seconds: the truth of a lone note.
func oneVoiceHz(t *testing.T, x []float64, from, to float64) float64 {
	t.Helper()
	d, err := pitchdetect.New(rate, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	var hz []float64
	for _, e := range d.Feed(testsignal.Float32(x), nil) {
		if e.Voiced && e.Time >= from && e.Time < to {
			hz = append(hz, e.Hz)
		}
	}
	if len(hz) == 0 {
		return math.NaN()
	}
	slices.Sort(hz)
	return hz[len(hz)/2]
}

// lowestOctaveLow counts the frames of x in [from, to) whose lowest voice
// lies within 50 ¢ of an octave under hz, and those marked doubled.
func lowestOctaveLow(t *testing.T, x []float64, from, to, hz float64) (frames, low, doubled int) {
	t.Helper()
	e, err := New(rate, 0, 0, Config{})
	if err != nil {
		t.Fatal(err)
	}
	half := float64(e.Window()) / 2 / rate
	e.Feed(testsignal.Float32(x), func(f Frame) {
		if f.Time-half < from || f.Time+half > to || len(f.Voices) == 0 {
			return
		}
		frames++
		v := f.Voices[0]
		for _, w := range f.Voices {
			if w.Hz < v.Hz {
				v = w
			}
		}
		if math.Abs(testsignal.Cents(v.Hz, hz/2)) < 50 {
			low++
		}
		if v.Doubled {
			doubled++
		}
	})
	return frames, low, doubled
}

// A lone tuba's every frame holds it at its own pitch, not an octave low:
// FluidR3's tuba (General MIDI program 59, 0-based 58: common practice)
// held 2 s on each of loneTubaKeys, white noise 40 dB under, its frames of
// the held tone (0.3 to 1.9 s) against the one-pitch detector's median
// reading (pitchdetect, the truth of a lone note). Its samples sound faint
// lines at the odd multiples of half the fundamental, 23 to 44 dB over the
// noise floor and together 36 to 43 dB under its own partials' power: an onset's
// half window read B♭2 and F3 an octave low, and the follow (follow.go)
// held that in all 13 frames of each before raiseSubOctaves, none after
// (measured). The frames marked doubled are logged (B♭1 in all 13, before
// and after: its even partials stand 5.5 to 6.1 dB over the envelope of
// its odd ones, measured, which doubled.go takes for a double).
func TestALoneTubaIsNotReadAnOctaveLow(t *testing.T) {
	for _, key := range loneTubaKeys {
		x := fluidRaw(t, testsignal.MIDIPart{Program: 58, Notes: []testsignal.TimedNote{{Key: key, Seconds: 2}}})
		testsignal.AddNoise(x, testsignal.White(newRand(uint64(key)), len(x)), 40)
		one := oneVoiceHz(t, x, 0.3, 1.9)
		n, low, dbl := lowestOctaveLow(t, x, 0.3, 1.9, one)
		t.Logf("tuba key %d (%.2f Hz): one voice %.2f Hz; voices: %d frames, octave low %d, doubled %d", key, keyHz(key), one, n, low, dbl)
		if math.Abs(testsignal.Cents(one, keyHz(key))) > 20 || n < 10 || low > 0 {
			t.Errorf("tuba key %d: the one-pitch detector reads %.2f Hz; %d of %d frames read it an octave low", key, one, low, n)
		}
	}
}
