package target

import (
	"math"
	"strings"
	"testing"
)

// equalHz is equal temperament by its definition: each semitone 2^(1/12),
// A4 at the reference. semis counts from A4.
func equalHz(a4 float64, semis ...int) []float64 {
	var hz []float64
	for _, s := range semis {
		hz = append(hz, a4*math.Exp2(float64(s)/12))
	}
	return hz
}

// A G major scale, G4 up to G5, from A4: -2, 0, 2, 3, 5, 7, 9, 10 semitones.
var gMajorScale = []int{-2, 0, 2, 3, 5, 7, 9, 10}

// A scale played at A4 = 415 Hz (Baroque pitch, common practice) but read at
// the default 440 Hz reads a semitone low, a steady 1 ¢ off: the notes fall
// outside G major, and G major at 415 Hz fits them all.
func TestAForgottenReferenceIsFound(t *testing.T) {
	declared := tuning(t, "G major", "equal", 440)
	c := declared.CheckTake(equalHz(415, gMajorScale...))
	// At 440, G4..G5 at 415 read as F#4 G#4 Bb4 B4 C#5 D#5 F5 F#5: only the
	// F#s and B are in G major (5 of 8 outside).
	if c.Notes != 8 || c.OutOfScale != 5 {
		t.Errorf("%d notes, %d outside the scale; want 8 and 5", c.Notes, c.OutOfScale)
	}
	if c.Best.Key != declared.Key || math.Abs(c.Best.A4-415) > 0.01 || c.BestFits != 8 {
		t.Errorf("best fit %v with %d notes, want G major at A4 = 415 Hz with 8", c.Best, c.BestFits)
	}
}

// With nothing declared (C major at 440 Hz, the defaults), the same notes
// fit G major at 415 Hz and F♯ major near 440 Hz equally well; the key with
// fewer accidentals is named.
func TestWithNothingDeclaredTheSimplerKeyIsNamed(t *testing.T) {
	c := Default().CheckTake(equalHz(415, gMajorScale...))
	if c.Best.Key.String() != "G major" || math.Abs(c.Best.A4-415) > 0.01 {
		t.Errorf("best fit %v, want G major at 415 Hz", c.Best)
	}
}

// Where the fit named moves the reference, the key that fits as many notes
// at the declared reference is named beside it: A♭ major's notes at 440 Hz
// (equal temperament by definition) fit G major at 466 Hz (a semitone up,
// one accidental against four) as well, and a player who left --key out
// more likely forgot the key. The G major scale at 415 Hz fits F♯ (or G♭)
// major near 440. A fit that keeps the reference has no second.
func TestTheKeyThatKeepsTheReferenceIsNamedToo(t *testing.T) {
	aFlat := []int{-1, 1, 3, 4, 6, 8, 10, 11} // A♭4 B♭4 C5 D♭5 E♭5 F5 G5 A♭5
	c := Default().CheckTake(equalHz(440, aFlat...))
	if c.Best.Key.String() != "G major" || math.Abs(c.Best.A4-466.16) > 0.01 || !c.HasAtA4 ||
		c.AtA4.Key.String() != "Ab major" || math.Abs(c.AtA4.A4-440) > 0.01 || c.AtA4.fits(equalHz(440, aFlat...)) != 8 {
		t.Errorf("best %v, at the reference %v (%v)", c.Best, c.AtA4, c.HasAtA4)
	}
	c = Default().CheckTake(equalHz(415, gMajorScale...))
	if k := c.AtA4.Key.String(); !c.HasAtA4 || k != "F# major" && k != "Gb major" || math.Abs(c.AtA4.A4-440) > 0.5 {
		t.Errorf("G major at 415: at the reference %v (%v), want F# or Gb major", c.AtA4, c.HasAtA4)
	}
	declared := tuning(t, "G major", "equal", 440)
	if c := declared.CheckTake(equalHz(440, 10, 12, 14, 15)); c.HasAtA4 {
		t.Errorf("a take in tune: a second fit %v", c.AtA4)
	}
}

// Notes a steady 20 ¢ sharp at A4 = 440 (so at A4 = 445.1 Hz: 440·2^(20/1200))
// are in the key but off their targets by the same amount.
func TestASteadyOffsetIsMeasured(t *testing.T) {
	a4 := 440 * math.Exp2(20.0/1200)
	declared := tuning(t, "G major", "equal", 440)
	c := declared.CheckTake(equalHz(a4, gMajorScale...))
	if c.OutOfScale != 0 || math.Abs(c.Offset-20) > 1e-6 || c.Steady != 8 || c.Fits != 0 {
		t.Errorf("%+v: want all in scale, a steady +20 ¢, none fitting", c)
	}
	if c.Best.Key != declared.Key || math.Abs(c.Best.A4-a4) > 0.01 {
		t.Errorf("best fit %v, want G major at %.2f Hz", c.Best, a4)
	}
}

// In ¼-comma meantone the fit keeps the temperament: a D major scale at
// A4 = 415 (targets from the definition, every fifth 5^(1/4), A4 fixed)
// declared at 440 is found at 415.
func TestTheFitKeepsTheTemperament(t *testing.T) {
	at415 := tuning(t, "D major", "meantone:1/4", 415)
	var hz []float64
	for _, n := range at415.Key.Scale() {
		hz = append(hz, at415.Target(n))
	}
	declared := at415
	declared.A4 = 440
	c := declared.CheckTake(hz)
	if c.Best.Key != at415.Key || math.Abs(c.Best.A4-415) > 0.01 || c.BestFits != 7 {
		t.Errorf("best fit %v (%d notes), want D major at 415 Hz (7)", c.Best, c.BestFits)
	}
}

// A take in tune gives no better fit than the declared tuning.
func TestATakeInTuneFitsAsDeclared(t *testing.T) {
	declared := tuning(t, "G major", "equal", 440)
	c := declared.CheckTake(equalHz(440, gMajorScale...))
	if c.OutOfScale != 0 || c.Fits != 8 || c.BestFits != 8 || c.Best.Key != declared.Key || math.Abs(c.Best.A4-440) > 1e-9 {
		t.Errorf("%+v", c)
	}
}

// The notes a take is judged "in the key" by are the key's seven: those of
// the key-signature table (scales, in key_test.go), none of the window's other five.
func TestInScaleIsTheKeysSevenNotes(t *testing.T) {
	for _, tc := range scales {
		k, err := ParseKey(tc.key)
		if err != nil {
			t.Fatal(err)
		}
		in := map[string]bool{}
		for _, name := range strings.Fields(tc.notes) {
			in[name] = true
		}
		for _, n := range k.Window() {
			if k.inScale(n) != in[n.Name()] {
				t.Errorf("%s: %s in scale = %v", tc.key, n.Name(), k.inScale(n))
			}
		}
	}
}
