package ui

import (
	"fmt"
	"math"
	"strings"
	"unicode/utf8"

	"github.com/mattn/go-runewidth"

	"fifthline/target"
)

// role says what a piece of text is, so the screen can style it. The text
// alone always carries the meaning; styles only add emphasis.
type role uint8

// Roles, from plain to urgent.
const (
	plainRole role = iota
	dim            // scales, labels, the last note after it ended
	lit            // the held note and its cents
	other          // the other spelling
	warn           // clipping, lost audio
)

// span is a run of text in one role.
type span struct {
	Text string
	Role role
}

// screenLine is one screen row.
type screenLine []span

// Text is the line without roles.
func (l screenLine) Text() string {
	var b strings.Builder
	for _, s := range l {
		b.WriteString(s.Text)
	}
	return b.String()
}

// Width is the line's width in screen columns.
func (l screenLine) Width() int { return runewidth.StringWidth(l.Text()) }

func plain(s string) screenLine   { return screenLine{{s, plainRole}} }
func dimLine(s string) screenLine { return screenLine{{s, dim}} }
func text(s string, r role) span  { return span{s, r} }

// centre pads s with spaces to width w, centred (truncated if wider).
func centre(s string, w int) string {
	sw := runewidth.StringWidth(s)
	if sw >= w {
		return runewidth.Truncate(s, w, "")
	}
	left := (w - sw) / 2
	return strings.Repeat(" ", left) + s + strings.Repeat(" ", w-sw-left)
}

// padRight pads or truncates s to width w.
func padRight(s string, w int) string {
	if sw := runewidth.StringWidth(s); sw < w {
		return s + strings.Repeat(" ", w-sw)
	}
	return runewidth.Truncate(s, w, "")
}

// cents formats a signed cents value with one decimal and a true minus
// sign, never "−0.0".
func cents(c float64) string { return minus(target.Signed(c, 1)) }

// wholeCents formats signed cents rounded to a whole cent, "+41", "−3",
// and "0" for anything that rounds to nothing.
func wholeCents(c float64) string { return minus(target.Signed(c, 0)) }

// minus writes a true minus sign for a leading hyphen; "-0" and "+0" read as "0".
func minus(s string) string {
	if s == "-0" || s == "+0" {
		return "0"
	}
	return strings.Replace(s, "-", "−", 1)
}

// tuningLine is the status line's first part: key, temperament, A4 and
// transposition.
func tuningLine(m *model, w int) screenLine {
	// Whole parts go from the end where the line is too wide, the key,
	// temperament and reference last: a word cut in half ("soundi") reads
	// as a fault.
	parts := tuningParts(m.Tuning)
	for len(parts) > 3 && runewidth.StringWidth(strings.Join(parts, " · ")) > w {
		parts = parts[:len(parts)-1]
	}
	return plain(strings.Join(parts, " · "))
}

// bigLines are the held note and its cents in large glyphs, centred in w
// columns: "F♯4 +41¢", in whole cents (the tenths are on the words line),
// drawn at the largest scale up to maxScale that fits (each glyph cell
// scale × scale screen cells). When even scale 1 is too wide the cents go,
// and Words carries them. Before the first note they are blank.
func bigLines(m *model, w, maxScale int) []screenLine {
	r, ok := m.Reading()
	s := ""
	if ok {
		s = r.Written.Pretty() + " " + wholeCents(r.Deviation) + "¢"
		if bigWidth(s) > w {
			s = r.Written.Pretty()
		}
		if bigWidth(s) > w {
			s = ""
		}
	}
	scale := max(1, maxScale)
	for scale > 1 && bigWidth(s)*scale > w {
		scale--
	}
	rows := big(s)
	out := make([]screenLine, 0, glyphRows*scale)
	for _, row := range rows {
		var b strings.Builder
		for _, c := range row {
			b.WriteString(strings.Repeat(string(c), scale))
		}
		for range scale {
			out = append(out, screenLine{text(centre(b.String(), w), litRole(m))})
		}
	}
	return out
}

// words is the reading in words: which spelled note, how far and which way,
// and where the other spelling stands.
func words(m *model) screenLine {
	r, ok := m.Reading()
	if !ok {
		return dimLine("listening to " + m.Source + " — hold a note")
	}
	var l screenLine
	if !m.Holding {
		l = append(l, text("last note: ", dim))
	}
	role := litRole(m)
	note, alt := r.Written.Pretty(), r.AltWritten.Pretty()
	toward := "" // nearer the other spelling, not on it (target.Reading.OnOther)
	if r.TowardOther() {
		toward = ", toward " + alt
	}
	switch c := math.Round(r.Deviation*10) / 10; {
	case c > 0:
		l = append(l, text(fmt.Sprintf("%s is %.1f ¢ sharp%s ▲", note, c, toward), role))
	case c < 0:
		l = append(l, text(fmt.Sprintf("%s is %.1f ¢ flat%s ▼", note, -c, toward), role))
	default:
		l = append(l, text(note+" is on its target", role))
	}
	// Where the spellings share a pitch the tuning line says so once.
	switch {
	case !r.HasAlt || r.SamePitch || r.TowardOther():
	case r.OnOther:
		l = append(l, text(" · sits on "+alt+" ("+cents(r.AltDeviation)+" ¢)", other))
	default:
		l = append(l, text(" · "+alt+" would read "+cents(r.AltDeviation)+" ¢", dim))
	}
	if m.OnDrone() {
		// The canceller took the drone's partials out here, so the note
		// was read from its other partials: say so, it is a weaker reading.
		l = append(l, text(" · at a pitch the drone sounds (read with the drone taken out)", other))
	}
	return l
}

// fifthsLayout sizes the line-of-fifths rows for w columns: a side zone on
// each end for the other spelling, and twelve cells between.
func fifthsLayout(w int) (side, cell int) {
	side = 9
	cell = (w - 2*side) / 12
	if cell < 3 {
		side, cell = max(0, (w-36)/2), 3
	}
	return side, min(cell, 7)
}

// fifthsRows draws the key's window along the line of fifths: three rows of
// names, marks, and each note's offset from equal temperament. The held
// note is bracketed with its cents beneath; the other spelling stands in the
// side zone on the end of the line where it lies, with its own cents.
func fifthsRows(m *model, w int) [3]screenLine {
	side, cell := fifthsLayout(w)
	tu := m.Tuning
	win := tu.Window()
	r, ok := m.Reading()
	lit := -1
	if ok {
		for i, n := range win {
			if n.Letter == r.Note.Letter && n.Accidental == r.Note.Accidental {
				lit = i
			}
		}
	}
	var names, marks, equal screenLine
	leftName, leftMark, rightName, rightMark := "", "", "", ""
	altRole := dim
	if ok && r.HasAlt && !r.SamePitch {
		// Cents on the screen are "+41.1 ¢", as on the words line; a side
		// zone too narrow for the space keeps the sign alone.
		alt, altCents := r.AltWritten.Pretty(), cents(r.AltDeviation)+" ¢"
		if utf8.RuneCountInString(altCents) > side {
			altCents = strings.Replace(altCents, " ", "", 1)
		}
		if r.OnOther {
			alt, altRole = "["+alt+"]", other
		}
		if lo, _ := tu.Key.WindowSpan(); r.Alt.Fifths() < lo {
			leftName, leftMark = "◂ "+alt, altCents
		} else {
			rightName, rightMark = alt+" ▸", altCents
		}
	}
	names = append(names, text(padRight(leftName, side), altRole))
	marks = append(marks, text(padRight(leftMark, side), altRole))
	equal = append(equal, text(padRight("from ET", side), dim))
	offset := "%+.0f"
	if cell < 4 {
		offset = "%.0f" // no room for a plus sign between neighbours
	}
	for i, n := range win {
		name, role := tu.Transpose.Written(n).PrettyName(), plainRole
		if i == lit {
			name, role = "["+name+"]", litRole(m)
		}
		names = append(names, text(centre(name, cell), role))
		equal = append(equal, text(centre(minus(fmt.Sprintf(offset, tu.CentsFromEqual(n))), cell), dim))
	}
	// The held note's cents sit under it, spilling into the empty
	// neighbouring cells when the cells are narrow.
	row := 12 * cell
	if lit >= 0 {
		c := cents(r.Deviation)
		cw := runewidth.StringWidth(c)
		at := min(max(lit*cell+cell/2-cw/2, 0), max(row-cw, 0))
		marks = append(marks, text(strings.Repeat(" ", at), plainRole), text(c, litRole(m)), text(strings.Repeat(" ", max(row-at-cw, 0)), plainRole))
	} else {
		marks = append(marks, text(strings.Repeat(" ", row), plainRole))
	}
	names = append(names, text(padRight(rightName, side), altRole))
	marks = append(marks, text(padRight(rightMark, side), altRole))
	return [3]screenLine{names, marks, equal}
}

// litRole is how the held note shows: lit while held, dim once it ended.
func litRole(m *model) role {
	if m.Holding {
		return lit
	}
	return dim
}

// heldLine describes the held note's shape once a note is held: how long,
// how steady, and its vibrato.
func heldLine(m *model) screenLine {
	if !m.HasHeld {
		return dimLine("")
	}
	h := m.Held
	s := fmt.Sprintf("%.1f s at %.2f Hz · spread %.1f ¢", h.End-h.Start, h.Hz, h.Spread)
	if h.VibratoWidth > 0 {
		s += fmt.Sprintf(" · vibrato %.0f ¢ wide at %.1f Hz", h.VibratoWidth, h.VibratoRate)
	} else {
		s += " · no vibrato"
	}
	if !m.Holding {
		return dimLine("last note held " + s)
	}
	return plain("held " + s)
}

// silentDBFS is the level below which the input is called silent rather
// than given a number: digital silence measures about −300 dBFS, which no
// musician needs to read.
const silentDBFS = -100

// levelBar draws a level from -60 to 0 dBFS in ten cells.
func levelBar(db float64) string {
	n := 0
	if db > -60 {
		n = int(math.Ceil((db + 60) / 6))
	}
	n = max(0, min(10, n))
	return strings.Repeat("▮", n) + strings.Repeat("▯", 10-n)
}

// inputLine is the status line's second part: input level with a clipping
// warning and, only once some sound was lost, how often.
func inputLine(m *model) screenLine {
	lvl := "input silent " + levelBar(math.Inf(-1))
	switch {
	case m.Finished:
		lvl = "input ended " + levelBar(math.Inf(-1)) // said once, beside "the performance has ended"
	case m.Level > silentDBFS:
		lvl = fmt.Sprintf("input %s dBFS %s", minus(fmt.Sprintf("%.0f", m.Level)), levelBar(m.Level))
	}
	l := screenLine{text(lvl, plainRole)}
	if m.Input.Clipping {
		l = append(l, text(" CLIPPING — turn the input down", warn))
	}
	if gaps := m.Input.Overflows + m.Input.Dropped; m.Input.Known && gaps > 0 {
		l = append(l, text(" · "+GapWords(gaps), warn))
	}
	if m.Dropped > 0 {
		// Readings the screen could not keep up with: the notes and the
		// journal have them all, only the trace has holes.
		l = append(l, text(fmt.Sprintf(" · screen behind: %s not drawn", howManyReadings(m.Dropped)), dim))
	}
	return l
}

// journalLine is the journal's state: "journal: off", or how many notes it
// holds and where.
func journalLine(m *model) screenLine { return plain(m.Journal) }

// hintLine is the last key's effect, or the keys.
func hintLine(m *model) screenLine {
	if m.Message != "" && m.Now-m.messageAt < messageSeconds {
		return plain(m.Message)
	}
	if m.Finished {
		return plain("the performance has ended · q quits")
	}
	if m.HasSound {
		return dimLine("←→ tonic · m mode · t temperament · ↑↓ A4 · d drone · s target · ? help · q quit")
	}
	return dimLine("←→ tonic · m mode · t temperament · ↑↓ A4 · ? help · q quit")
}

// helpLines is the help overlay.
func helpLines() []screenLine {
	out := []screenLine{plain("fifthline meter — keys"), plain("")}
	for _, b := range bindings {
		if b.Label != "" {
			out = append(out, plain(fmt.Sprintf("  %-5s %s", b.Label, b.What)))
		}
	}
	out = append(out,
		plain("  d     drone: off → tonic → tonic and fifth → off"),
		plain("  s ␣   sound the held (or last) note's target briefly"),
		plain("  ? h   this help (Esc closes it)"),
		plain("  q     quit"),
		plain(""),
		dimLine("The middle row is the key's twelve spellings along the line of fifths."),
		dimLine("[brackets] mark the held note, its cents beneath; the other spelling,"),
		dimLine("twelve fifths away, stands past the end of the row with its own cents."),
		dimLine("\"from ET\": each note's target against equal temperament, in cents."),
		dimLine("The trace: the last 4 s, time left to right, sharp up, flat down."),
	)
	return out
}

// howManyReadings is n readings in words, "1 reading" for one.
func howManyReadings(n uint64) string {
	if n == 1 {
		return "1 reading"
	}
	return fmt.Sprintf("%d readings", n)
}

// GapWords says in a player's words how often the input lost sound: blocks
// the driver lost before we read them and blocks we threw away, behind,
// are alike to a player, a gap in what was heard.
func GapWords(gaps uint64) string {
	if gaps == 1 {
		return "1 gap in the sound (computer too busy)"
	}
	return fmt.Sprintf("%d gaps in the sound (computer too busy)", gaps)
}
