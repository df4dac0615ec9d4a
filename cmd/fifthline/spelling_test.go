package main

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

// The window of a minor key (interface contract, "Spelling window"; common
// meantone keyboard practice): G minor spells A♭ … C♯, one fifth sharper than
// B♭ major's E♭ … G♯.
func TestTargetsOfAMinorKey(t *testing.T) {
	code, out, stderr := runCLI(t, "targets", "--key", "G minor", "--temperament", "meantone:1/4", "--a4", "415", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	if got := strings.Join(column(rows, "note"), " "); got != "Ab4 Eb4 Bb4 F4 C4 G4 D4 A4 E4 B4 F#4 C#4" {
		t.Errorf("G minor's window: %s", got)
	}
	// C♯4 in ¼-comma is a pure major third (5/4, the temperament's
	// definition) above A3 = 415/2 Hz: 259.375 Hz.
	if c := rows[11]; c["hz"] != "259.3750" || c["alt_note"] != "Db4" {
		t.Errorf("C#4 row %v", c)
	}
}

// Just intonation keeps the tonic where equal temperament at the given A4
// puts it (contract, the --a4 row; the choir with a piano at 442):
// C4 = 442·2^(−9/12) Hz, 0 ¢ from equal, and A4 a just major sixth (5/3)
// above it. With --anchor a4, A4 sits at 442 Hz and C4 at 442·3/5 = 265.2 Hz,
// +15.641 ¢ (the figure).
func TestTargetsJustKeepsTheTonicOfEqualTemperament(t *testing.T) {
	for _, tc := range []struct {
		anchor       []string
		c4Hz, c4From string
		a4Hz         string
	}{
		{nil, strconv.FormatFloat(442*math.Exp2(-9.0/12), 'f', 4, 64), "0.000", "438.0246"},
		{[]string{"--anchor", "tonic"}, strconv.FormatFloat(442*math.Exp2(-9.0/12), 'f', 4, 64), "0.000", "438.0246"},
		{[]string{"--anchor", "a4"}, "265.2000", "15.641", "442.0000"},
	} {
		args := append([]string{"targets", "--key", "C minor", "--temperament", "just", "--a4", "442", "--format", "csv"}, tc.anchor...)
		code, out, stderr := runCLI(t, args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.anchor, code, stderr)
		}
		_, rows := readCSV(t, out)
		byNote := map[string]map[string]string{}
		for _, r := range rows {
			byNote[r["note"]] = r
		}
		// A in C minor just: 5/3 above C (3^-1·5, Ellis's duodene).
		c4, a4 := byNote["C4"], byNote["A4"]
		if c4["hz"] != tc.c4Hz || c4["cents_from_equal"] != tc.c4From || a4["hz"] != tc.a4Hz {
			t.Errorf("%v: C4 %v, A4 %v; want C4 %s Hz %s ¢, A4 %s Hz", tc.anchor, c4, a4, tc.c4Hz, tc.c4From, tc.a4Hz)
		}
	}
}

// Keys and temperaments as musicians name them, and the one-line usage errors
// (exit 2) for what no musician can use, each with its hint.
func TestKeyAndTemperamentWords(t *testing.T) {
	for _, spec := range []string{"Werckmeister III", "¼-comma meantone", "quarter-comma", "1/4-comma meantone", "edo31", "31-EDO"} {
		if code, _, stderr := runCLI(t, "targets", "--temperament", spec); code != 0 {
			t.Errorf("--temperament %q: exit %d, %s", spec, code, stderr)
		}
	}
	for _, tc := range []struct {
		args []string
		hint string
	}{
		{[]string{"--key", "g"}, `say "G major" or "G minor"`},
		{[]string{"--temperament", "werkmeister"}, "did you mean werckmeister3?"},
		{[]string{"--temperament", "wobbly"}, "try equal, meantone:1/4"},
		{[]string{"--temperament", "organ/chapel.tmp"}, `temperament file "organ/chapel.tmp": no such file`},
		{[]string{"--temperament", "chapel.txt"}, "no such file"},
		// The comma's part alone is a meantone's, not a file's name.
		{[]string{"--temperament", "1/4"}, "meantone:1/4"},
		{[]string{"--key", "E flat mjr"}, `unknown mode "mjr"`},
		{[]string{"--temperament", "edo:7"}, "divisions that work: 12, 17, 19, 22"},
		{[]string{"--temperament", "fifth:720"}, "fifths between 685.714 and 720 ¢ work"},
		{[]string{"--anchor", "middle"}, "use a4 or tonic"},
	} {
		code, _, stderr := runCLI(t, append([]string{"targets"}, tc.args...)...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, tc.hint) {
			t.Errorf("%v: %q lacks %q", tc.args, stderr, tc.hint)
		}
	}
}

// End to end through analyze, sox tones at known pitches (Debian's sox as
// the reference generator), each target from its temperament's definition:
//   - G minor, ¼-comma, A4 = 415: C♯4 at 259.375 Hz (pure third above A3)
//     reads C♯4 on target, not D♭4 −41 ¢ (the viol player);
//   - G major, ⅙-comma, A4 = 440: F♯4 = 440·f³/4 with f = 3/2·(80/81)^(1/6),
//     pushed 11 ¢ up, leans toward G♭ but is not on it (quarter-gap rule:
//     8.6 ¢ away, the limit 4.9 ¢);
//   - C major, ¼-comma, A4 = 415: G♭4 = 415·32/5^(9/4) = 355.2349 Hz is on
//     the other spelling of F♯4.
func TestAnalyzeSpellsSoxTonesByTheContractsRules(t *testing.T) {
	sixth := 1.5 * math.Pow(80.0/81, 1.0/6)
	fs := 440 * sixth * sixth * sixth / 4 * math.Exp2(11.0/1200)
	for _, tc := range []struct {
		args            []string
		hz              float64
		note, alt, on   string
		cents, altCents float64
	}{
		{[]string{"--key", "G minor", "--temperament", "meantone:1/4", "--a4", "415"}, 259.375, "C#4", "Db4", "false", 0, -41.06},
		{[]string{"--key", "G major", "--temperament", "meantone:1/6"}, fs, "F#4", "Gb4", "false", 11, -8.55},
		{[]string{"--temperament", "meantone:1/4", "--a4", "415"}, 355.2349, "F#4", "Gb4", "true", 41.06, 0},
		{nil, 392, "G4", "", "false", -0.02, 0}, // ISO 16 G4 = 391.995 Hz; G has no other spelling
	} {
		wav := sox(t, "tone.wav", "-r", "48000", "-b", "24", "synth 1.5 sine "+strconv.FormatFloat(tc.hz, 'f', 4, 64)+" gain -6")
		code, out, stderr := runCLI(t, append(append([]string{"analyze"}, tc.args...), wav)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.args, code, stderr)
		}
		_, rows := readCSV(t, out)
		if len(rows) != 1 {
			t.Fatalf("%v: %d notes:\n%s", tc.args, len(rows), out)
		}
		r := rows[0]
		altOK := r["alt_cents"] == "" && tc.alt == "" || closeTo(r["alt_cents"], strconv.FormatFloat(tc.altCents, 'f', 2, 64), 0.05)
		if r["note"] != tc.note || r["alt_note"] != tc.alt || r["on_other_spelling"] != tc.on ||
			!closeTo(r["cents"], strconv.FormatFloat(tc.cents, 'f', 2, 64), 0.05) || !altOK {
			t.Errorf("%v, %.4f Hz: %v; want %s (%+.2f ¢), alt %q (%+.2f ¢), on other %s", tc.args, tc.hz, r, tc.note, tc.cents, tc.alt, tc.altCents, tc.on)
		}
	}
}
