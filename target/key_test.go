package target

import (
	"strings"
	"testing"
)

// The 15 major and 15 natural minor scales with their key signatures
// (common practice; any theory primer's table of key signatures).
var scales = []struct {
	key   string
	sig   int
	notes string
}{
	{"C major", 0, "C D E F G A B"},
	{"G major", 1, "G A B C D E F#"},
	{"D major", 2, "D E F# G A B C#"},
	{"A major", 3, "A B C# D E F# G#"},
	{"E major", 4, "E F# G# A B C# D#"},
	{"B major", 5, "B C# D# E F# G# A#"},
	{"F# major", 6, "F# G# A# B C# D# E#"},
	{"C# major", 7, "C# D# E# F# G# A# B#"},
	{"F major", -1, "F G A Bb C D E"},
	{"Bb major", -2, "Bb C D Eb F G A"},
	{"Eb major", -3, "Eb F G Ab Bb C D"},
	{"Ab major", -4, "Ab Bb C Db Eb F G"},
	{"Db major", -5, "Db Eb F Gb Ab Bb C"},
	{"Gb major", -6, "Gb Ab Bb Cb Db Eb F"},
	{"Cb major", -7, "Cb Db Eb Fb Gb Ab Bb"},
	{"A minor", 0, "A B C D E F G"},
	{"E minor", 1, "E F# G A B C D"},
	{"B minor", 2, "B C# D E F# G A"},
	{"F# minor", 3, "F# G# A B C# D E"},
	{"C# minor", 4, "C# D# E F# G# A B"},
	{"G# minor", 5, "G# A# B C# D# E F#"},
	{"D# minor", 6, "D# E# F# G# A# B C#"},
	{"A# minor", 7, "A# B# C# D# E# F# G#"},
	{"D minor", -1, "D E F G A Bb C"},
	{"G minor", -2, "G A Bb C D Eb F"},
	{"C minor", -3, "C D Eb F G Ab Bb"},
	{"F minor", -4, "F G Ab Bb C Db Eb"},
	{"Bb minor", -5, "Bb C Db Eb F Gb Ab"},
	{"Eb minor", -6, "Eb F Gb Ab Bb Cb Db"},
	{"Ab minor", -7, "Ab Bb Cb Db Eb Fb Gb"},
}

func TestScalesAndSignaturesOfAllThirtyKeys(t *testing.T) {
	for _, tc := range scales {
		k, err := ParseKey(tc.key)
		if err != nil {
			t.Fatalf("ParseKey(%q): %v", tc.key, err)
		}
		if got := k.Signature(); got != tc.sig {
			t.Errorf("%s: signature %d, want %d", tc.key, got, tc.sig)
		}
		var names []string
		for _, n := range k.Scale() {
			names = append(names, n.Name())
		}
		if got := strings.Join(names, " "); got != tc.notes {
			t.Errorf("%s: scale %q, want %q", tc.key, got, tc.notes)
		}
	}
}

// Church modes share their key signature with a major key (common practice):
// D dorian and E phrygian have C major's, F lydian and G mixolydian too.
func TestModesShareSignatures(t *testing.T) {
	for key, sig := range map[string]int{
		"D dorian": 0, "E phrygian": 0, "F lydian": 0, "G mixolydian": 0, "B locrian": 0,
		"A dorian": 1, "Eb lydian": -2, "C# phrygian": 3,
	} {
		k, err := ParseKey(key)
		if err != nil {
			t.Fatal(err)
		}
		if got := k.Signature(); got != sig {
			t.Errorf("%s: signature %d, want %d", key, got, sig)
		}
	}
}

// The spelling windows the interface contract gives as examples ("Spelling
// window"), and the minor keys of the common meantone keyboard practice: a
// minor key's window sits one fifth sharper than its relative major's, so it
// holds the raised fourth, sixth and seventh (G minor has C♯ for the third
// of A major, the dominant's dominant; D minor has G♯ as the split-key
// keyboards E♭ … G♯ do). Church modes keep their own diatonic set: D dorian
// and E phrygian spell as C major does.
func TestSpellingWindows(t *testing.T) {
	for key, want := range map[string]string{
		"C major":    "Eb Bb F C G D A E B F# C# G#",
		"D minor":    "Eb Bb F C G D A E B F# C# G#",
		"G major":    "Bb F C G D A E B F# C# G# D#",
		"G minor":    "Ab Eb Bb F C G D A E B F# C#",
		"A minor":    "Bb F C G D A E B F# C# G# D#",
		"C minor":    "Db Ab Eb Bb F C G D A E B F#",
		"F# minor":   "G D A E B F# C# G# D# A# E# B#", // B♯, not C, for the third of G♯ major
		"D dorian":   "Eb Bb F C G D A E B F# C# G#",
		"E phrygian": "Eb Bb F C G D A E B F# C# G#",
		"c aeolian":  "Db Ab Eb Bb F C G D A E B F#", // aeolian is the minor mode
	} {
		k, err := ParseKey(key)
		if err != nil {
			t.Fatal(err)
		}
		var names []string
		for _, n := range k.Window() {
			names = append(names, n.Name())
		}
		if got := strings.Join(names, " "); got != want {
			t.Errorf("%s window: %q, want %q", key, got, want)
		}
	}
}

func TestParseKeyIsCaseInsensitiveAndDefaultsToMajor(t *testing.T) {
	for in, want := range map[string]string{
		"g major": "G major", "G": "G major", "f# MINOR": "F# minor", "bb minor": "Bb minor",
		"E♭ dorian": "Eb dorian", "B": "B major", "Gb Ionian": "Gb major", "c aeolian": "C minor", "g minor": "G minor",
	} {
		k, err := ParseKey(in)
		if err != nil {
			t.Errorf("ParseKey(%q): %v", in, err)
			continue
		}
		if got := k.String(); got != want {
			t.Errorf("ParseKey(%q) = %s, want %s", in, got, want)
		}
	}
}

// English names a key's accidental in words, "E flat major", "F-sharp
// minor" (common practice): the same key as the sign. A small letter alone
// still asks which mode it means.
func TestAKeysAccidentalInWordsIsItsSign(t *testing.T) {
	for in, want := range map[string]string{
		"E flat major": "Eb major", "E-flat major": "Eb major", "F sharp minor": "F# minor", "B Flat": "Bb major",
		"Bflat major": "Bb major", "c-SHARP minor": "C# minor",
	} {
		if k, err := ParseKey(in); err != nil || k.String() != want {
			t.Errorf("ParseKey(%q) = %v, %v; want %s", in, k, err, want)
		}
	}
	if _, err := ParseKey("e flat"); err == nil || !strings.Contains(err.Error(), `say "Eb major" or "Eb minor"`) {
		t.Errorf(`ParseKey("e flat"): %v, want the small letter's hint`, err)
	}
	for _, in := range []string{"E flatly major", "E flat flat major", "flat major"} {
		if k, err := ParseKey(in); err == nil {
			t.Errorf("ParseKey(%q) = %v, want an error", in, k)
		}
	}
}

// A key named in German ("Es-Dur", "fis-moll"; German B is B♭ and H is B:
// common practice) is refused with its English name, not guessed at.
func TestAKeyInGermanIsNamedInEnglish(t *testing.T) {
	for in, english := range map[string]string{
		"Es-Dur": "Eb major", "es-dur": "Eb major", "fis-moll": "F# minor", "B-Dur": "Bb major", "h-moll": "B minor",
		"As Dur": "Ab major", "cis-moll": "C# minor", "his-moll": "B# minor", "D-Dur": "D major", "g moll": "G minor",
	} {
		_, err := ParseKey(in)
		if err == nil || !strings.Contains(err.Error(), `say "`+english+`"`) {
			t.Errorf("ParseKey(%q): %v, want it to say %q", in, err, english)
		}
	}
}

func TestParseKeyRejectsBadKeys(t *testing.T) {
	// "--key H" is the contract's own example of a usage error.
	for _, in := range []string{"H", "", "C major minor", "C foo", "C## major", "G# major", "Fb major", "C4 major"} {
		if k, err := ParseKey(in); err == nil {
			t.Errorf("ParseKey(%q) = %v, want an error", in, k)
		}
	}
}

// A bare small letter ("--key g") means minor in many musicians' hands and
// major in others' (common practice both ways), so it is refused with a hint
// naming both; with a mode, or as a capital, it reads as written.
func TestABareSmallLetterAsksWhichMode(t *testing.T) {
	for in, hint := range map[string]string{
		"g": `say "G major" or "G minor"`, "f#": `say "F# major" or "F# minor"`, " bb ": `say "Bb major" or "Bb minor"`,
	} {
		_, err := ParseKey(in)
		if err == nil || !strings.Contains(err.Error(), hint) {
			t.Errorf("ParseKey(%q): %v, want the hint %s", in, err, hint)
		}
	}
	for in, want := range map[string]string{"G": "G major", "g minor": "G minor", "F#": "F# major"} {
		if k, err := ParseKey(in); err != nil || k.String() != want {
			t.Errorf("ParseKey(%q) = %v, %v; want %s", in, k, err, want)
		}
	}
}

// Chord-symbol shorthand for a minor key ("F#m", "Bbm"; common practice in
// lead sheets) is refused, as the contract's key is a tonic then a mode
// word, with a hint that names the key in words.
func TestChordSymbolKeyAsksForTheModeInWords(t *testing.T) {
	for in, hint := range map[string]string{
		"F#m": `write the mode as a word: "F# minor"`, "Bbm": `write the mode as a word: "Bb minor"`, "Cm": `"C minor"`,
	} {
		_, err := ParseKey(in)
		if err == nil || !strings.Contains(err.Error(), hint) {
			t.Errorf("ParseKey(%q): %v, want the hint %s", in, err, hint)
		}
	}
}
