package target

import (
	"math"
	"testing"
)

const tol = 0.001 // cents; the issue asks for agreement with definitions to 0.01 ¢

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.Abs(got-want) > tol {
		t.Errorf("%s = %.4f, want %.4f (±%g)", what, got, want, tol)
	}
}

// Handbook values of the commas and pure intervals (e.g. Barbour, Tuning and
// Temperament, 1951; any acoustics handbook): syntonic 81/80 = 21.506 ¢,
// Pythagorean 3^12/2^19 = 23.460 ¢, schisma 1.954 ¢, pure fifth 3/2 =
// 701.955 ¢, pure major third 5/4 = 386.314 ¢.
func TestCommas(t *testing.T) {
	near(t, "syntonic comma", SyntonicComma, 21.506, 0.0005)
	near(t, "Pythagorean comma", PythagoreanComma, 23.460, 0.0005)
	near(t, "schisma", Schisma, 1.954, 0.0005)
	near(t, "pure fifth", PureFifth, 701.955, 0.0005)
	near(t, "pure major third", PureThird, 386.314, 0.0005)
}

func mustTemperament(t *testing.T, spec string) Temperament {
	t.Helper()
	tm, err := ParseTemperament(spec)
	if err != nil {
		t.Fatalf("ParseTemperament(%q): %v", spec, err)
	}
	return tm
}

// The sizes of the fifth in regular temperaments, from their definitions.
// Values: ¼-comma 696.578 and 31-EDO 696.774 as the issue states them (and
// Barbour 1951 for the meantones); the other EDO fifths are k·1200/N for the
// step count nearest 3/2 (from memory, as tabulated in EDO lists).
func TestRegularFifths(t *testing.T) {
	for _, tc := range []struct {
		spec  string
		fifth float64
	}{
		{"equal", 700},
		{"pythagorean", 701.955},
		{"meantone:1/4", 696.578},
		{"meantone:1/3", 694.786},
		{"meantone:2/7", 695.810},
		{"meantone:1/5", 697.654},
		{"meantone:1/6", 698.371},
		{"meantone:0/1", 701.955},
		{"fifth:697", 697},
		{"edo:12", 700},
		{"edo:19", 694.737},
		{"edo:31", 696.774},
		{"edo:43", 697.674},
		{"edo:50", 696.000},
		{"edo:53", 701.887},
		{"edo:55", 698.182},
	} {
		tm := mustTemperament(t, tc.spec)
		r, ok := tm.(Regular)
		if !ok {
			t.Fatalf("%s is %T, want Regular", tc.spec, tm)
		}
		near(t, tc.spec+" fifth", r.Fifth, tc.fifth, 0.0005)
	}
}

// interval is the distance in cents from note a up to note b in tuning tu.
func interval(tu Tuning, a, b string) float64 {
	na, _ := ParseNote(a)
	nb, _ := ParseNote(b)
	return tu.TargetPitch(nb) - tu.TargetPitch(na)
}

func tuning(t *testing.T, key, spec string, a4 float64) Tuning {
	t.Helper()
	k, err := ParseKey(key)
	if err != nil {
		t.Fatal(err)
	}
	return Tuning{Key: k, Temperament: mustTemperament(t, spec), A4: a4}
}

// Enharmonic gaps: in ¼-comma meantone G♭ sits 41.059 ¢ above F♯, the lesser
// diesis 128/125 (the issue; Barbour 1951). With a 700 ¢ fifth the chain
// closes and F♯ = G♭; with a 695 ¢ fifth G♭ sits 60 ¢ above F♯ (common
// practice). Pythagorean G♭ sits a Pythagorean comma below F♯.
func TestEnharmonicGaps(t *testing.T) {
	for _, tc := range []struct {
		spec string
		gap  float64 // Gb4 minus F#4
	}{
		{"meantone:1/4", Cents(128.0 / 125)},
		{"meantone:1/4", 41.059},
		{"equal", 0},
		{"fifth:700", 0},
		{"fifth:695", 60},
		{"pythagorean", -23.460},
		{"edo:31", 1200.0 / 31}, // one step of 31 (common practice: F#, Gb a diesis apart)
		{"werckmeister3", 0},
		{"just", Cents(36.0/25) - Cents(45.0/32)}, // 5-limit: F# a pure third above D, 9/8·5/4 = 45/32; Gb a pure minor third above Eb, 6/5·6/5 = 36/25 (common practice)
	} {
		tu := tuning(t, "C major", tc.spec, 440)
		near(t, tc.spec+" F#4→Gb4", interval(tu, "F#4", "Gb4"), tc.gap, 0.0005)
	}
}

// ¼-comma meantone: pure major thirds 5/4 and fifths 696.578 ¢ (definition).
func TestQuarterCommaThirdsArePure(t *testing.T) {
	tu := tuning(t, "C major", "meantone:1/4", 415)
	for _, pair := range [][2]string{{"C4", "E4"}, {"D4", "F#4"}, {"Eb4", "G4"}, {"E4", "G#4"}, {"Bb3", "D4"}} {
		near(t, pair[0]+"→"+pair[1], interval(tu, pair[0], pair[1]), 386.314, 0.0005)
	}
	// ⅓-comma meantone has pure minor thirds 6/5 = 315.641 ¢ (definition).
	tu = tuning(t, "C major", "meantone:1/3", 440)
	near(t, "1/3-comma A→C", interval(tu, "A3", "C4"), Cents(6.0/5), tol)
	// ⅙-comma meantone's tritone C-F♯ is within 0.01 ¢ of 45/32 = 590.224 ¢
	// (Barbour 1951 notes the near-pure tritone).
	tu = tuning(t, "C major", "meantone:1/6", 440)
	near(t, "1/6-comma C→F#", interval(tu, "C4", "F#4"), 590.224, 0.01)
}

// ISO 16: A4 = 440 Hz; equal temperament then puts C4 at 261.626 Hz, A0 at
// 27.5 Hz and C8 at 4186.009 Hz (standard frequency tables).
func TestEqualTemperamentAtISO16(t *testing.T) {
	tu := Default()
	for note, hz := range map[string]float64{"A4": 440, "C4": 261.626, "A0": 27.5, "C8": 4186.009, "B#3": 261.626, "F#4": 369.994} {
		n, _ := ParseNote(note)
		near(t, note+" Hz", tu.Target(n), hz, 0.0005)
	}
}

// Published well-temperament tables, cents above C for C, C♯ … B (from
// memory, as tabulated in Barbour, Tuning and Temperament, 1951, and in
// organ-builders' tables). Each temperament here is built from its definition
// (which fifths are narrowed by what part of which comma), not typed in.
func TestWellTemperamentsMatchPublishedTables(t *testing.T) {
	for spec, want := range map[string][12]float64{
		"werckmeister3": {0, 90.225, 192.180, 294.135, 390.225, 498.045, 588.270, 696.090, 792.180, 888.270, 996.090, 1092.180},
		"kirnberger3":   {0, 90.225, 193.157, 294.135, 386.314, 498.045, 590.224, 696.578, 792.180, 889.735, 996.090, 1088.269},
		"vallotti":      {0, 94.135, 196.090, 298.045, 392.180, 501.955, 592.180, 698.045, 796.090, 894.135, 1000.000, 1090.225},
		"young":         {0, 90.225, 196.090, 294.135, 392.180, 498.045, 588.270, 698.045, 792.180, 894.135, 996.090, 1090.225},
	} {
		c := mustTemperament(t, spec).(Circulating)
		got := c.Classes()
		tu := tuning(t, "C major", spec, 440)
		for i := range 12 {
			near(t, spec+" class "+chromaticNames[i], got[i], want[i], 0.001)
			// The same value through a tuning, via both spellings.
			n := noteAt(mod(7*i+6, 12)-6, 4) // the spelling between Gb and F
			near(t, spec+" "+n.String(), interval(tu, "C4", n.String())-1200*float64(floorDiv(n.Semitones(), 12)), want[i], 0.001)
		}
	}
}

// 5-limit just intonation from the tonic: the ratios documented on Just
// (Ellis's duodene and its extension), checked in two keys.
func TestJustRatiosFromTheTonic(t *testing.T) {
	for _, tc := range []struct {
		key   string
		note  string
		ratio float64
	}{
		{"C major", "D4", 9.0 / 8}, {"C major", "E4", 5.0 / 4}, {"C major", "F4", 4.0 / 3},
		{"C major", "G4", 3.0 / 2}, {"C major", "A4", 5.0 / 3}, {"C major", "B4", 15.0 / 8},
		{"C major", "Eb4", 6.0 / 5}, {"C major", "Bb4", 9.0 / 5}, {"C major", "F#4", 45.0 / 32},
		{"C major", "C#4", 25.0 / 24}, {"C major", "G#4", 25.0 / 16}, {"C major", "Db4", 16.0 / 15},
		{"G major", "B4", 5.0 / 4}, {"G major", "E5", 5.0 / 3}, {"G major", "C5", 4.0 / 3},
		{"A minor", "C5", 6.0 / 5}, {"A minor", "F5", 8.0 / 5}, {"A minor", "G5", 9.0 / 5},
	} {
		tu := tuning(t, tc.key, "just", 440)
		k, _ := ParseKey(tc.key)
		tonic := k.Tonic.String()
		near(t, tc.key+" "+tonic+"→"+tc.note, interval(tu, tonic, tc.note), Cents(tc.ratio), tol)
	}
	// With A4 held at 440 Hz, just C major puts C4 at 440·3/5 = 264 Hz
	// (common practice: the "scientific" just C of 264 Hz).
	tu := tuning(t, "C major", "just", 440)
	tu.Anchor = AnchorA4
	near(t, "just C4 Hz", tu.Target(Note{Letter: C, Octave: 4}), 264, 1e-9)
	if got := JustRatio(6); got != "45/32" {
		t.Errorf("JustRatio(6) = %s, want 45/32", got)
	}
}

func TestParseTemperamentRejectsBadSpecs(t *testing.T) {
	// The contract's examples of usage errors, and more.
	for _, spec := range []string{"meantone:1/0", "edo:0", "fifth:2000", "fifth:abc", "meantone:x", "edo:-3",
		"edo:7.5", "fifth:NaN", "fifth:Inf", "bogus", "meantone:1/-4", "fifth:600", "edo:6", "",
		"edo:7", "fifth:720", "fifth:685.714285714", "meantone:1/1", "edo:25", "edo:35"} {
		if tm, err := ParseTemperament(spec); err == nil {
			t.Errorf("ParseTemperament(%q) = %v, want an error", spec, tm.Spec())
		}
	}
}

func TestEveryBuiltinParsesAndNamesItself(t *testing.T) {
	for _, spec := range Builtin {
		tm := mustTemperament(t, spec)
		if tm.Spec() != spec || tm.Name() == "" {
			t.Errorf("%s: Spec %q, Name %q", spec, tm.Spec(), tm.Name())
		}
	}
}
