package ui

import "strings"

// glyphRows is the height of the large glyphs.
const glyphRows = 5

// font is our own block font, five rows high: '#' is a filled cell. It
// covers what the meter writes large: note letters, accidentals, octave
// digits and signed cents.
var font = map[rune][glyphRows]string{
	'A': {".##.", "#..#", "####", "#..#", "#..#"},
	'B': {"###.", "#..#", "###.", "#..#", "###."},
	'C': {".###", "#...", "#...", "#...", ".###"},
	'D': {"###.", "#..#", "#..#", "#..#", "###."},
	'E': {"####", "#...", "###.", "#...", "####"},
	'F': {"####", "#...", "###.", "#...", "#..."},
	'G': {".###", "#...", "#.##", "#..#", ".###"},
	'0': {".##.", "#..#", "#..#", "#..#", ".##."},
	'1': {"..#.", ".##.", "..#.", "..#.", ".###"},
	'2': {"###.", "...#", ".##.", "#...", "####"},
	'3': {"###.", "...#", ".##.", "...#", "###."},
	'4': {"#..#", "#..#", "####", "...#", "...#"},
	'5': {"####", "#...", "###.", "...#", "###."},
	'6': {".##.", "#...", "###.", "#..#", ".##."},
	'7': {"####", "...#", "..#.", ".#..", ".#.."},
	'8': {".##.", "#..#", ".##.", "#..#", ".##."},
	'9': {".##.", "#..#", ".###", "...#", ".##."},
	'♯': {".#.#", "####", ".#.#", "####", ".#.#"},
	'♭': {"#...", "#...", "###.", "#..#", "###."},
	'𝄪': {"#..#", ".##.", ".##.", "#..#", "...."},
	'𝄫': {"#.#..", "#.#..", "#####", "#####", "#####"},
	'+': {"...", ".#.", "###", ".#.", "..."},
	'−': {"...", "...", "###", "...", "..."},
	'-': {"...", "...", "###", "...", "..."},
	'.': {".", ".", ".", ".", "#"},
	'¢': {"..#.", ".###", "#.#.", ".###", ".#.."},
	' ': {"..", "..", "..", "..", ".."},
}

// ink turns a glyph pattern into screen cells.
var ink = strings.NewReplacer(".", " ", "#", "█")

// big renders text in the block font, one string per row, glyphs one
// column apart. Runes the font lacks are skipped.
func big(text string) [glyphRows]string {
	var rows [glyphRows]strings.Builder
	first := true
	for _, r := range text {
		g, ok := font[r]
		if !ok {
			continue
		}
		for i := range rows {
			if !first {
				rows[i].WriteByte(' ')
			}
			rows[i].WriteString(ink.Replace(g[i]))
		}
		first = false
	}
	var out [glyphRows]string
	for i := range rows {
		out[i] = rows[i].String()
	}
	return out
}

// bigWidth is how many columns Big(text) takes.
func bigWidth(text string) int {
	w, n := 0, 0
	for _, r := range text {
		if g, ok := font[r]; ok {
			w += len(g[0])
			n++
		}
	}
	if n > 1 {
		w += n - 1
	}
	return w
}
