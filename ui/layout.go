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
func layout(m *model, w, h int) (out []screenLine) {
	if w <= 0 || h <= 0 {
		return nil
	}
	bw := min(w, maxBody)
	if m.ASCII {
		defer func() { asciiLines(out) }()
	}
	if m.Help {
		return frame(helpLines(), w, bw, h)
	}
	fifths := fifthsRows(m, bw)
	gap := func(keep int) section { return section{[]screenLine{nil}, keep, false} }
	parts := []section{
		{[]screenLine{tuningLine(m)}, 10, false},
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
	parts = fit(parts, h)
	total := 0
	for _, p := range parts {
		total += len(p.lines)
	}
	var body []screenLine
	for _, p := range parts {
		if p.grow && total < h {
			p.lines = trace(m, bw, min(minTraceRows+h-total, maxTraceRows))
		}
		body = append(body, p.lines...)
	}
	return frame(body, w, bw, h)
}

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
