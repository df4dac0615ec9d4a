package target

import (
	"strings"
	"testing"
)

// A custom file that restates Werckmeister III's published table (Barbour
// 1951, from memory as in the well-temperament test) must tune like the
// built-in one.
const werckmeisterFile = `# Werckmeister III as a table
name = Werckmeister III, typed in
C  = 0
C# = 90.225   # a comment after a sharp
D  = 192.180
Eb = 294.135
E  = 390.225
F  = 498.045
F# = 588.270
G  = 696.090
G# = 792.180
A  = 888.270
Bb = 996.090
B  = 1092.180
`

func TestCustomTableTunesLikeItsSource(t *testing.T) {
	c, err := ParseCustom("w3.tmp", []byte(werckmeisterFile))
	if err != nil {
		t.Fatal(err)
	}
	if c.Name() != "Werckmeister III, typed in" || c.Spec() != "w3.tmp" {
		t.Errorf("name %q spec %q", c.Name(), c.Spec())
	}
	built := tuning(t, "C major", "werckmeister3", 415)
	custom := built
	custom.Temperament = c
	for _, n := range []string{"C4", "C#4", "Db4", "E4", "F#4", "Gb4", "Ab4", "A#4", "B#3", "Cb4"} {
		near(t, n, custom.TargetPitch(note(t, n)), built.TargetPitch(note(t, n)), 0.001)
	}
}

// Split keys: a table may give D♯ and E♭ pitches of their own, as on organs
// with divided sharps; ratios are accepted beside cents.
func TestCustomSplitKeysAndRatios(t *testing.T) {
	file := strings.Replace(werckmeisterFile, "Eb = 294.135", "Eb = 6/5\nD# = 270", 1)
	c, err := ParseCustom("split", []byte(file))
	if err != nil {
		t.Fatal(err)
	}
	tu := tuning(t, "C major", "equal", 440)
	tu.Temperament = c
	near(t, "C→Eb", interval(tu, "C4", "Eb4"), Cents(6.0/5), 1e-9)
	near(t, "C→D#", interval(tu, "C4", "D#4"), 270, 1e-9)
}

func TestCustomRegularFifth(t *testing.T) {
	c, err := ParseCustom("r", []byte("fifth = 696.578428\n")) // 1200·log2(5)/4
	if err != nil {
		t.Fatal(err)
	}
	tu := tuning(t, "C major", "equal", 440)
	tu.Temperament = c
	near(t, "F#→Gb", interval(tu, "F#4", "Gb4"), 41.059, 0.001) // ¼-comma: the lesser diesis 128/125 (Barbour 1951)
}

// Malformed files fail with the line that is wrong.
func TestCustomErrorsNameTheLine(t *testing.T) {
	for _, tc := range []struct{ file, want string }{
		{"C = 0\nH = 100\n", "line 2"},
		{"C = 0\nD 200\n", "line 2"},
		{"fifth = 2000\n", "line 1"},
		{"\n\nC = 1300\n", "line 3"},
		{"C = 0\nC = 1\n", "line 2: C is listed twice"},
		{"C = 0\nD = 5/0\n", "line 2"},
		{"C = 0\n", "missing"},
		{"# nothing\n", "nothing to tune by"},
		{"fifth = 697\nC = 0\n", "not both"},
		{"C = x\n", "line 1"},
	} {
		_, err := ParseCustom("f.tmp", []byte(tc.file))
		if err == nil || !strings.Contains(err.Error(), tc.want) || strings.Contains(err.Error(), "\n") {
			t.Errorf("ParseCustom(%q): %v, want one line mentioning %q", tc.file, err, tc.want)
		}
	}
}
