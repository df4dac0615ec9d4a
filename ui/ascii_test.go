package ui

import (
	"strings"
	"testing"
	"unicode/utf8"

	"fifthline/target"
)

// Where the terminal's locale is not UTF-8 the meter writes the contract's
// ASCII accidentals (# ## b bb, /work/shared/interface.md "Spelled notes")
// and nothing outside ASCII, and every line still fits the screen.
func TestTheASCIIScreenUsesTheContractsAccidentals(t *testing.T) {
	tu := quarterComma(t)
	k, err := target.ParseKey("C# major") // seven sharps: its window reaches the double sharps
	if err != nil {
		t.Fatal(err)
	}
	tu.Key = k
	for _, hz := range []float64{fSharp4, gFlat4} {
		m := holding(tu, hz)
		m.ASCII = true
		var screen strings.Builder
		for _, l := range layout(m, 80, 24) {
			if w := utf8.RuneCountInString(l.Text()); w > 80 {
				t.Errorf("line of %d columns: %q", w, l.Text())
			}
			screen.WriteString(l.Text() + "\n")
		}
		s := screen.String()
		for i := 0; i < len(s); i++ {
			if s[i] >= utf8.RuneSelf {
				t.Fatalf("non-ASCII byte %#x in:\n%s", s[i], s)
			}
		}
		if !strings.Contains(s, "F##") || !strings.Contains(s, "C# major | 1/4-comma meantone") {
			t.Errorf("no ## accidentals:\n%s", s)
		}
	}
}

// The locale is read as POSIX and tcell read it: LC_ALL, then LC_CTYPE,
// then LANG; "C" and "POSIX" are ASCII, a named character set other than
// UTF-8 is too, and an unset locale counts as UTF-8 (tcell's assumption).
func TestTheLocaleDecidesASCII(t *testing.T) {
	for _, c := range []struct {
		all, ctype, lang string
		ascii            bool
	}{
		{"", "", "", false},
		{"", "", "en_GB.UTF-8", false},
		{"", "", "de_DE.utf8", false},
		{"C", "", "en_GB.UTF-8", true},
		{"", "POSIX", "", true},
		{"", "", "en_US.ISO-8859-1", true},
		{"", "fr_FR.ISO-8859-15@euro", "en_GB.UTF-8", true},
		{"", "", "en_GB", false},
	} {
		t.Setenv("LC_ALL", c.all)
		t.Setenv("LC_CTYPE", c.ctype)
		t.Setenv("LANG", c.lang)
		if got := ASCIILocale(); got != c.ascii {
			t.Errorf("LC_ALL=%q LC_CTYPE=%q LANG=%q: ASCII %v", c.all, c.ctype, c.lang, got)
		}
	}
}
