package ui

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/mattn/go-runewidth"

	"fifthline/target"
)

// The group screen: one row per player or voice, in the order given (the
// digit keys name rows by their place, so rows never move while the group
// plays; players are usually named low to high, and voices are), each with
// its spelled note and two readings — against the temperament and, in a
// chord, against just above the sounding root — each beside a short strip
// that puts the reading between flat and sharp. Above the rows stand the
// chord and the group's drift, below them the chords before it.

// stripCents is how far either side of its middle a strip reaches.
const stripCents = 25

// strip draws c cents on a strip w cells wide (w odd): dots either side of
// a bar for the target, a diamond at the reading, an arrow at the end it
// has passed.
func strip(c float64, w int) string {
	mid := w / 2
	cells := []rune(strings.Repeat("·", w))
	cells[mid] = '│'
	switch at := mid + int(math.Round(c/stripCents*float64(mid))); {
	case math.IsNaN(c):
	case at < 0:
		cells[0] = '◂'
	case at >= w:
		cells[w-1] = '▸'
	default:
		cells[at] = '◆'
	}
	return string(cells)
}

// groupColumns are the widths of a row's columns for a body bw wide.
type groupColumns struct{ name, strip int }

func columnsFor(g *groupModel, bw int) groupColumns {
	name := 4
	for _, n := range g.Names {
		name = max(name, runewidth.StringWidth(n))
	}
	name = min(name, 8)
	// number, name, note, cents, role, just cents and the gaps between
	fixed := 2 + 1 + name + 1 + 5 + 1 + 8 + 1 + 2 + 7 + 1 + 8 + 1
	if g.Doubles || slices.ContainsFunc(g.rows, func(r groupRow) bool { return r.Doubled }) {
		fixed += 2 + len(doubledMark) // the strips give way to the mark
	}
	s := min(21, max(5, (bw-fixed)/2))
	if s%2 == 0 {
		s--
	}
	return groupColumns{name, s}
}

// groupHeader names the columns above the rows.
func groupHeader(cols groupColumns) screenLine {
	left := 2 + 1 + cols.name + 1 + 5 + 1
	tempered := padRight("temperament", 8+1+cols.strip)
	return dimLine(strings.Repeat(" ", left) + tempered + "  " + "just in the chord")
}

// groupRowLine is one row of the group.
func groupRowLine(i int, r rowReading, cols groupColumns) screenLine {
	head := fmt.Sprintf("%2d %s ", i+1, padRight(r.Name, cols.name))
	switch {
	case !r.On:
		return screenLine{text(head, dim), text(fmt.Sprintf("off — %d turns it on", i+1), dim)}
	case !r.Heard:
		return screenLine{text(head, plainRole), text("·", dim)}
	case r.Unheard:
		return screenLine{text(head, plainRole), text(unheardWords, dim)}
	}
	role := lit
	if !r.Holding {
		role = dim
	}
	l := screenLine{
		text(head, plainRole),
		text(padRight(r.Note.Pretty(), 5)+" ", role),
		text(fmt.Sprintf("%6s ¢ ", cents(r.Cents)), role),
		text(strip(r.Cents, cols.strip), role),
		text("  ", plainRole),
	}
	if !r.InChord {
		l = append(l, text(padRight("—", 7), dim))
	} else {
		l = append(l,
			text(padRight(r.Role, 7)+" ", role),
			text(fmt.Sprintf("%6s ¢ ", cents(r.Just)), role),
			text(strip(r.Just, cols.strip), role))
	}
	if r.Doubled {
		l = append(l, text("  "+doubledMark, role))
	}
	return l
}

// unheardWords fill the row of a voice not heard while others sound.
const unheardWords = "not heard"

// doubledMark ends the row of a voice with another an octave above it.
const doubledMark = "doubled"

// chordLine names the chord the group holds, or held last.
func chordLine(g *groupModel) screenLine {
	c, _, ok := g.name(g.chord)
	switch {
	case ok && g.sounding:
		// "over" would name the bass (a slash chord, common practice); the
		// root whose octave just is measured from need not be the bass.
		return screenLine{text("chord ", plainRole), text(c.Root.PrettyName()+" "+c.Quality, lit), text(" · root "+c.Root.Pretty()+seventhWords(c), dim)}
	case ok:
		return screenLine{text("last chord ", dim), text(c.Root.PrettyName()+" "+c.Quality, dim)}
	}
	return dimLine("no chord yet: two or more notes held together make one")
}

// seventhWords names the just a chord's seventh is read against (" ·
// seventh against 7/4"), empty without one: which seventh is just is a
// choice (--seventh), and its row's cents mean nothing without it.
func seventhWords(c target.HeardChord) string {
	for _, m := range c.Members {
		if m.Role == "seventh" && m.Just != "" {
			return " · seventh against " + m.Just
		}
	}
	return ""
}

// driftLine is the group's drift from the reference.
func driftLine(g *groupModel) screenLine {
	if !g.DriftKnown {
		return dimLine("group drift —")
	}
	way := "sharp"
	if g.Drift < 0 {
		way = "flat"
	}
	if math.Round(g.Drift*10) == 0 {
		return plain("group drift 0.0 ¢: on the reference")
	}
	return plain(fmt.Sprintf("group drift %.1f ¢ %s of the reference", math.Abs(g.Drift), way))
}

// beforeLine names the chords before the current one, oldest first.
func beforeLine(g *groupModel) screenLine {
	var names []string
	for _, hz := range g.before {
		if c, _, ok := g.name(hz); ok {
			names = append(names, c.Root.PrettyName()+" "+c.Quality)
		}
	}
	if len(names) == 0 {
		return dimLine("")
	}
	return dimLine("before: " + strings.Join(names, " → "))
}

// groupHint is the keys, or the last key's effect.
func groupHint(g *groupModel) screenLine {
	if l := hintLine(g.model); g.Message != "" && g.Now-g.messageAt < messageSeconds || g.Finished {
		return l
	}
	return dimLine(fmt.Sprintf("1–%d row off/on · ←→ tonic · m mode · t temperament · ↑↓ A4 · ? help · q quit", len(g.rows)))
}

// groupHelp is the help overlay of the group meter.
func groupHelp(g *groupModel) []screenLine {
	out := []screenLine{plain("fifthline group meter — keys"), plain("")}
	out = append(out, plain(fmt.Sprintf("  1–%d   switch that row off (out of the chords) or on again", len(g.rows))))
	for _, b := range bindings {
		if b.Label != "" {
			out = append(out, plain(fmt.Sprintf("  %-5s %s", b.Label, b.What)))
		}
	}
	return append(out,
		plain("  ? h   this help (Esc closes it)"),
		plain("  q     quit"),
		plain(""),
		dimLine("Each row: the note held (spelled from the chord's root in a chord), its"),
		dimLine("cents against the temperament, and in a chord its part (root, third, …)"),
		dimLine("and its cents against just above the root the group sounds; "+doubledMark+":"),
		dimLine("another voice an octave above it, which one microphone cannot part."),
		dimLine("The strips run ±25 ¢: │ is the target, ◆ the reading, ◂ ▸ beyond."),
		dimLine("Group drift: how far the whole group has moved from the reference."),
	)
}

// groupLayout is the group screen for w × h cells, like layout: on short
// screens the spacing and the chords before go first, the rows last.
func groupLayout(g *groupModel, w, h int) []screenLine {
	var help func() []screenLine
	if g.Help {
		help = func() []screenLine { return groupHelp(g) }
	}
	return compose(w, h, g.ASCII, help, func(bw int) []section {
		cols := columnsFor(g, bw)
		var rows []screenLine
		spaced := h >= 16+2*len(g.rows) // room for a line between rows
		for i, r := range g.readings() {
			if spaced && i > 0 {
				rows = append(rows, nil)
			}
			rows = append(rows, groupRowLine(i, r, cols))
		}
		return []section{
			{[]screenLine{tuningLine(g.model, bw)}, 10, false},
			gap(2),
			{[]screenLine{chordLine(g)}, 9, false},
			{[]screenLine{driftLine(g)}, 8, false},
			gap(2),
			{[]screenLine{groupHeader(cols)}, 5, false},
			{rows, 10, false},
			gap(2),
			{chordAxis(g, bw), 3, false},
			gap(2),
			{[]screenLine{beforeLine(g)}, 4, false},
			{[]screenLine{nil}, 1, true}, // takes the rows left over: the status stands at the foot
			{[]screenLine{groupInputLine(g.model)}, 9, false},
			{[]screenLine{journalLine(g.model)}, 7, false},
			{[]screenLine{groupHint(g)}, 6, false},
		}
	}, func(_, spare int) []screenLine { return make([]screenLine, 1+spare) })
}

// groupInputLine is the input's level and state followed by what is heard
// (the one-player meter names it while no note is held; the group's rows
// leave no room for that).
func groupInputLine(m *model) screenLine {
	l := inputLine(m)
	if m.Source != "" {
		l = append(l, text(" · "+m.Source, dim))
	}
	return l
}

// chordAxis lays the chord's members on one line by their cents against
// just above its root, so the group sees at once who sits wide and who
// narrow of the pure chord: a diamond on the line for each, its note
// beneath (a label that would overlap the one before drops a line).
func chordAxis(g *groupModel, bw int) []screenLine {
	c, _, ok := g.name(g.chord)
	if !ok {
		return nil
	}
	role := lit
	if !g.sounding {
		role = dim
	}
	w := bw - len("flat  sharp")
	if w%2 == 0 {
		w--
	}
	axis := []rune(strings.Repeat("─", w))
	axis[w/2] = '┼'
	labels := make([][]rune, len(c.Members))
	ends := make([]int, len(c.Members)) // each label line's first free column
	// Left to right, so that each label goes on the first line with room.
	members := slices.SortedFunc(slices.Values(c.Members), func(a, b target.HeardMember) int { return cmp.Compare(a.JustCents, b.JustCents) })
	for _, m := range members {
		at := w/2 + int(math.Round(m.JustCents/stripCents*float64(w/2)))
		mark := '◆'
		if at < 0 || at >= w {
			at, mark = min(max(at, 0), w-1), map[bool]rune{true: '◂', false: '▸'}[at < 0]
		}
		axis[at] = mark
		label := []rune(m.Note.Pretty())
		from := min(max(at-len(label)/2, 0), w-len(label))
		for i := range labels {
			if from >= ends[i] {
				if labels[i] == nil {
					labels[i] = []rune(strings.Repeat(" ", w))
				}
				copy(labels[i][from:], label)
				ends[i] = from + len(label) + 1
				break
			}
		}
	}
	out := []screenLine{
		dimLine(centre(fmt.Sprintf("the chord against just above its root, ±%d ¢", stripCents), bw)),
		{text("flat ", dim), text(string(axis), role), text(" sharp", dim)},
	}
	for _, l := range labels {
		if l != nil {
			out = append(out, screenLine{text("     "+strings.TrimRight(string(l), " "), role)})
		}
	}
	return out
}
