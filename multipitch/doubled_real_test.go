package multipitch

import (
	"encoding/binary"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
)

// soxRaw returns what sox makes from the input arguments (a file, or -n) and
// effects, summed to one channel at 44.1 kHz: sox writes it as raw 32-bit
// little-endian floats.
func soxRaw(t *testing.T, input string, effects ...string) []float64 {
	t.Helper()
	args := append([]string{"-R", input, "-r", "44100", "-L", "-t", "raw", "-e", "floating-point", "-b", "32", "-"}, effects...)
	out, err := exec.Command("sox", args...).Output()
	if err != nil {
		t.Fatalf("sox %s: %v", strings.Join(args, " "), err)
	}
	x := make([]float64, len(out)/4)
	for i := range x {
		x[i] = float64(math.Float32frombits(binary.LittleEndian.Uint32(out[4*i:])))
	}
	return x
}

// fluidRaw renders MIDI parts with fluidsynth and FluidR3 (reverb and
// chorus off), summed to one channel.
func fluidRaw(t *testing.T, parts ...testsignal.MIDIPart) []float64 {
	t.Helper()
	dir := t.TempDir()
	mid, wav := filepath.Join(dir, "take.mid"), filepath.Join(dir, "take.wav")
	if err := os.WriteFile(mid, testsignal.MIDIParts(parts), 0o644); err != nil {
		t.Fatal(err)
	}
	if out, err := exec.Command("fluidsynth", "-ni", "-q", "-R", "0", "-C", "0", "-g", "0.5", "-r", "44100", "-F", wav, fluidR3, mid).CombinedOutput(); err != nil {
		t.Fatalf("fluidsynth: %v\n%s", err, out)
	}
	return soxRaw(t, wav, "remix", "1v0.5,2v0.5")
}

// excessRange is the least and the largest envelopeExcess, in dB, of the
// voice within 50 ¢ of hz over the windows of x (half a window apart)
// wholly in [from, to) seconds: the margins on either side of doubleGain.
func excessRange(t *testing.T, x []float64, from, to, hz float64) (lo, hi float64) {
	t.Helper()
	e, err := New(rate, 0, 0, Config{})
	if err != nil {
		t.Fatal(err)
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	n := e.Window()
	var vs []Voice
	for at := int(from * rate); at+n <= min(len(x), int(to*rate)); at += n / 2 {
		vs = e.Analyze(x[at:at+n], vs[:0])
		for v, f := range e.f0 {
			if math.Abs(cents(f, hz)) < 50 {
				db := 10 * math.Log10(e.envelopeExcess(v))
				lo, hi = min(lo, db), max(hi, db)
			}
		}
	}
	return lo, hi
}

// keyHz is MIDI key k in equal temperament from A4 = 440 Hz (ISO 16; key
// 69 is A4: MIDI 1.0, common practice).
func keyHz(k int) float64 { return 440 * math.Exp2(float64(k-69)/12) }

// A lone voice is never marked doubled: FluidR3's clarinet (General MIDI
// program 72, 0-based 71), whose even partials are weak, and sox's
// sawtooth, whose even partials lie on the smooth 1/k envelope of its odd
// ones, held 2 s on D3 to E5, with white noise 40 dB under. No frame is
// marked; the largest envelopeExcess is logged (measured: the clarinet at
// most 0.4 dB, the sawtooth 0 dB, against doubleGain's 3 dB).
func TestALoneClarinetOrSawtoothIsNotDoubled(t *testing.T) {
	for _, key := range []int{50, 55, 60, 64, 67, 72, 76} {
		hz := keyHz(key)
		for _, tc := range []struct {
			name string
			x    []float64
		}{
			{"FluidR3 clarinet", fluidRaw(t, testsignal.MIDIPart{Program: 71, Notes: []testsignal.TimedNote{{Key: key, Seconds: 2}}})},
			{"sox sawtooth", soxRaw(t, "-n", "synth", "2", "sawtooth", strconv.FormatFloat(hz, 'f', 4, 64), "gain", "-8")},
		} {
			testsignal.AddNoise(tc.x, testsignal.White(newRand(uint64(key)), len(tc.x)), 40)
			s := hear(t, tc.x, Config{}, 0.1, 1.9, hz)
			if s.doubled[0] > 0 || s.frames < 2 {
				t.Errorf("%s, key %d: marked doubled in %d of %d frames", tc.name, key, s.doubled[0], s.frames)
			}
			_, hi := excessRange(t, tc.x, 0.1, 1.9, hz)
			t.Logf("%s, key %d: %d frames, largest envelope excess %.1f dB", tc.name, key, s.frames, hi)
		}
	}
}

// The chord: G3 B♭3 D4 with G4 over it, just above G3 (ratios 1,
// 6/5, 3/2, 2: common practice), every even partial of G3 beside one of
// D4's or B♭3's; the same as G major (5/4 for the third), and both in
// equal temperament (ISO 16), each voice a sox sawtooth or square (odd partials only),
// summed to one channel with white noise 40 dB under. With G4, G3 is
// marked doubled in at least three frames in four; without it, in none;
// no other voice is ever marked, and no voice is invented (G4 is not
// reported on its own).
func TestADoubledRootIsMarkedWhereItsNeighboursAreShared(t *testing.T) {
	g3 := keyHz(55)
	for _, chord := range []struct {
		name string
		hz   []float64 // the chord, its octave double last
	}{
		{"just G minor", []float64{g3, g3 * 6 / 5, g3 * 3 / 2, 2 * g3}},
		{"just G major", []float64{g3, g3 * 5 / 4, g3 * 3 / 2, 2 * g3}},
		{"tempered G minor", []float64{g3, keyHz(58), keyHz(62), keyHz(67)}},
		{"tempered G major", []float64{g3, keyHz(59), keyHz(62), keyHz(67)}},
	} {
		for _, wave := range []string{"sawtooth", "square"} {
			for _, doubled := range []bool{true, false} {
				hz := chord.hz
				if !doubled {
					hz = hz[:3]
				}
				args := []string{"synth", "2"}
				for _, f := range hz {
					args = append(args, wave, strconv.FormatFloat(f, 'f', 4, 64))
				}
				x := soxRaw(t, "-n", append(args, "remix", "-", "gain", "-8")...)
				testsignal.AddNoise(x, testsignal.White(newRand(3), len(x)), 40)
				name := chord.name + " " + wave
				if doubled {
					name += " with G4"
				}
				s := hear(t, x, Config{}, 0.1, 1.9, hz[:3]...)
				s.meets(t, name, 2)
				if marked := s.doubled[0]; doubled && 4*marked < 3*s.frames || !doubled && marked > 0 {
					t.Errorf("%s: G3 marked doubled in %d of %d frames", name, marked, s.frames)
				}
				if s.doubled[1] > 0 || s.doubled[2] > 0 || s.phantoms > 0 {
					t.Errorf("%s: upper voices marked doubled %v, %d voices invented", name, s.doubled[1:], s.phantoms)
				}
				lo, hi := excessRange(t, x, 0.1, 1.9, g3)
				t.Logf("%s: G3's envelope excess %.1f to %.1f dB", name, lo, hi)
			}
		}
	}
}

// FluidR3's clarinets (General MIDI program 72, 0-based 71), a real
// spectrum whose even partials are weak, as G minor in equal temperament (MIDI
// keys 55, 58, 62 and 67, ISO 16), with white noise 40 dB under: with the
// G4, G3 is marked doubled in at least three frames in four of the held
// chord (its attack over), and G4 is never read as a voice there; without
// it, G3 is never marked.
func TestADoubledClarinetIsMarked(t *testing.T) {
	keys := []int{55, 58, 62, 67}
	for _, double := range []bool{true, false} {
		var parts []testsignal.MIDIPart
		for _, k := range keys[:3] {
			parts = append(parts, testsignal.MIDIPart{Program: 71, Notes: []testsignal.TimedNote{{Key: k, Seconds: 2.5}}})
		}
		if double {
			parts = append(parts, testsignal.MIDIPart{Program: 71, Notes: []testsignal.TimedNote{{Key: keys[3], Seconds: 2.5}}})
		}
		x := fluidRaw(t, parts...)
		testsignal.AddNoise(x, testsignal.White(newRand(1), len(x)), 40)
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		half := float64(e.Window()) / 2 / rate
		frames, marked, octave := 0, 0, 0
		e.Feed(testsignal.Float32(x), func(f Frame) {
			if f.Time-half < 0.4 || f.Time+half > 2.4 {
				return
			}
			frames++
			for _, v := range f.Voices {
				if math.Abs(cents(v.Hz, keyHz(55))) < 50 && v.Doubled {
					marked++
				}
				if math.Abs(cents(v.Hz, keyHz(67))) < 50 {
					octave++
				}
			}
		})
		t.Logf("G4 %v: G3 marked doubled in %d of %d frames, G4 read as a voice in %d", double, marked, frames, octave)
		if frames < 4 || double && 4*marked < 3*frames || !double && marked > 0 || octave > 0 {
			t.Errorf("G4 %v: G3 marked doubled in %d of %d frames, G4 read as a voice in %d", double, marked, frames, octave)
		}
	}
}
