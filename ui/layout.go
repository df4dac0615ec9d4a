package ui

import (
	"sort"
	"strings"
)

// Trace heights: the least worth drawing and the most worth giving.
const (
	minTraceRows = 3
	maxTraceRows = 9
)

// bigScale is how large the glyphs may be drawn on a screen h rows high:
// double once there is room for their ten rows and all the rest.
func bigScale(h int) int {
	if h >= 34 {
		return 2
	}
	return 1
}

// maxBody is the widest the meter's body grows; wider screens centre it.
const maxBody = 96

type section struct {
	lines []screenLine
	keep  int  // higher is dropped later when the screen is short
	grow  bool // the trace: takes the rows left over
}

// layout is the whole screen for w × h cells: exactly h lines, each at most w
// wide once clipped. On short screens the least needed parts go first
// (spacing, the "from ET" row, the keys hint, the large glyphs), so the
// spelled note, its cents and the status stay.
func layout(m *model, w, h int) []screenLine {
	var help func() []screenLine
	if m.Help {
		help = helpLines
	}
	return compose(w, h, m.ASCII, help, func(bw int) []section {
		fifths := fifthsRows(m, bw)
		return []section{
			{[]screenLine{tuningLine(m, bw)}, 10, false},
			gap(2),
			{bigLines(m, bw, bigScale(h)), 5, false},
			{[]screenLine{words(m)}, 9, false},
			gap(2),
			{fifths[:2], 8, false},
			{fifths[2:], 3, false},
			gap(2),
			{trace(m, bw, minTraceRows), 6, true},
			{[]screenLine{heldLine(m)}, 7, false},
			gap(1),
			{[]screenLine{inputLine(m)}, 9, false},
			{[]screenLine{journalLine(m)}, 8, false},
			// The caution stands with the drone line it is about: both stay or go together.
			{append(lines(soundLine(m)), cautionLines(m, bw)...), 9, false},
			{[]screenLine{hintLine(m)}, 4, false},
		}
	}, func(bw, spare int) []screenLine { return trace(m, bw, min(minTraceRows+spare, maxTraceRows)) })
}

// compose is a screen of w × h cells: help's lines when help is set, else
// the sections parts gives for a body bw wide, fitted to h lines, the one
// that grows (if any kept) redrawn by grow with the spare rows; in ASCII
// if asked.
func compose(w, h int, ascii bool, help func() []screenLine, parts func(bw int) []section, grow func(bw, spare int) []screenLine) (out []screenLine) {
	if w <= 0 || h <= 0 {
		return nil
	}
	bw := min(w, maxBody)
	if ascii {
		defer func() { asciiLines(out) }()
	}
	if help != nil {
		return frame(help(), w, bw, h)
	}
	kept := fit(parts(bw), h)
	total := 0
	for _, p := range kept {
		total += len(p.lines)
	}
	var body []screenLine
	for _, p := range kept {
		if p.grow && total < h {
			p.lines = grow(bw, h-total)
		}
		body = append(body, p.lines...)
	}
	return frame(body, w, bw, h)
}

// gap is an empty line, kept as keep says.
func gap(keep int) section { return section{[]screenLine{nil}, keep, false} }

// lines is l as a section's lines: none for an empty line.
func lines(l screenLine) []screenLine {
	if l == nil {
		return nil
	}
	return []screenLine{l}
}

// fit drops the lowest-kept sections, last first among equals, until the
// rest fit in h lines.
func fit(parts []section, h int) []section {
	total := 0
	for _, p := range parts {
		total += len(p.lines)
	}
	order := make([]int, len(parts))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return parts[order[a]].keep < parts[order[b]].keep })
	drop := map[int]bool{}
	for _, i := range order {
		if total <= h {
			break
		}
		drop[i] = true
		total -= len(parts[i].lines)
	}
	var kept []section
	for i, p := range parts {
		if !drop[i] {
			kept = append(kept, p)
		}
	}
	return kept
}

// frame centres the body bw wide in w columns and pads it to h lines.
func frame(body []screenLine, w, bw, h int) []screenLine {
	left := (w - bw) / 2
	out := make([]screenLine, h)
	for i := range out {
		if i < len(body) && body[i] != nil {
			if left > 0 {
				out[i] = append(screenLine{text(strings.Repeat(" ", left), plainRole)}, body[i]...)
			} else {
				out[i] = body[i]
			}
		} else {
			out[i] = screenLine{}
		}
	}
	return out
}
