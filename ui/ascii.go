package ui

import (
	"os"
	"strings"
	"unicode/utf8"
)

// ASCIILocale tells whether the terminal's locale, read the way POSIX and
// tcell read it (LC_ALL, then LC_CTYPE, then LANG), names a character set
// other than UTF-8: there the meter writes ## and bb for the accidentals and
// plain ASCII for its marks, instead of signs the terminal would garble. An
// unset locale counts as UTF-8, as tcell assumes.
func ASCIILocale() bool {
	locale := os.Getenv("LC_ALL")
	if locale == "" {
		locale = os.Getenv("LC_CTYPE")
	}
	if locale == "" {
		locale = os.Getenv("LANG")
	}
	if locale == "C" || locale == "POSIX" {
		return true
	}
	locale, _, _ = strings.Cut(locale, "@")
	_, charset, ok := strings.Cut(locale, ".")
	if !ok {
		return false
	}
	charset = strings.ToLower(strings.ReplaceAll(charset, "-", ""))
	return charset != "utf8"
}

// asciiRunes are the meter's signs in ASCII. Accidentals follow the
// contract's spelling (# ## b bb); the rest keep one column each.
var asciiRunes = map[rune]string{
	'♯': "#", '♭': "b", '𝄪': "##", '𝄫': "bb", '♮': "",
	'¢': "c", '−': "-", '·': ".", '—': "-", '…': ".", '≈': "~", '±': "+-",
	'▲': "^", '▼': "v", '◂': "<", '▸': ">", '▮': "#", '▯': "-",
	'←': "<", '→': ">", '↑': "^", '↓': "v", '␣': "_",
	'◆': "*", '–': "-", '█': "#", '┤': "|", '┼': "+", '│': "|", '─': "-", '×': "x",
}

// toASCII writes s in ASCII. A sign that takes two characters (## or bb)
// swallows the space after it when there is one, so padded columns stay
// where they were; braille trace dots become '*'.
func toASCII(s string) string {
	s = strings.ReplaceAll(s, " · ", " | ") // the separator reads better as a bar than a dot
	var b strings.Builder
	skipSpace := false
	for _, r := range s {
		if skipSpace {
			skipSpace = false
			if r == ' ' {
				continue
			}
		}
		if r < utf8.RuneSelf {
			b.WriteRune(r)
			continue
		}
		rep, ok := asciiRunes[r]
		switch {
		case ok:
		case r == 0x2800:
			rep = " " // an empty braille cell
		case r > 0x2800 && r <= 0x28FF:
			rep = "*"
		default:
			rep = "?"
		}
		b.WriteString(rep)
		skipSpace = len(rep) > 1
	}
	return b.String()
}

// asciiLines rewrites every span of lines in ASCII, in place.
func asciiLines(lines []screenLine) {
	for _, l := range lines {
		for i := range l {
			l[i].Text = toASCII(l[i].Text)
		}
	}
}
