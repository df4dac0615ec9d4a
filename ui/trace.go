package ui

import (
	"fmt"
	"math"
	"strings"
)

// traceRange is the trace's reach either side of the target, in cents.
const traceRange = 50.0

// traceAxis is the width of the cents labels left of the trace, and
// traceWords that of the "sharp"/"flat" words right of it.
const (
	traceAxis  = 6
	traceWords = 6
)

// Braille cells give each screen cell two time columns and four pitch rows
// of dots. dotBits[row][col] is the bit of that dot (Unicode braille
// patterns, U+2800 block: dots 1-2-3-7 down the left, 4-5-6-8 the right).
var dotBits = [4][2]rune{{0x01, 0x08}, {0x02, 0x10}, {0x04, 0x20}, {0x40, 0x80}}

// trace draws the last TraceSeconds of pitch as dots, rows lines high and w
// columns wide: time runs left to right to now, sharp is up, flat down,
// ±TraceRange cents from the held note's target (or, between notes, from the
// nearest window note's). Points beyond the range sit on its edge.
func trace(m *model, w, rows int) []screenLine {
	plot := w - traceAxis - traceWords
	if rows < 1 || plot < 4 {
		return nil
	}
	bins := 2 * plot
	dots := 4 * rows
	level := m.traceLevels(bins, dots)
	grid := make([][]rune, rows)
	for y := range grid {
		grid[y] = make([]rune, plot)
	}
	for b, d := range level {
		if d >= 0 {
			grid[d/4][b/2] |= dotBits[d%4][b%2]
		}
	}
	zero := dots / 2 / 4 // the row holding the 0 ¢ line
	out := make([]screenLine, rows)
	for y := range rows {
		var b strings.Builder
		for _, c := range grid[y] {
			switch {
			case c != 0:
				b.WriteRune(0x2800 + c)
			case y == zero:
				b.WriteRune('·')
			default:
				b.WriteByte(' ')
			}
		}
		axis, words := "     │", ""
		switch y {
		case 0:
			axis, words = " +50 ┤", " sharp"
		case zero:
			axis = "   0 ┼"
		case rows - 1:
			axis, words = " −50 ┤", " flat"
		}
		out[y] = screenLine{text(axis, dim), text(b.String(), lit), text(words, dim)}
	}
	return out
}

// traceLevels averages the trace into bins time columns and returns each
// bin's dot row (0 at +TraceRange), or -1 where nothing was voiced. Each
// bin is measured from the target of its latest point: the held note's
// while one was held (keeping a note's trace continuous past ±50 ¢),
// otherwise the note nearest the point's own pitch.
func (m *model) traceLevels(bins, dots int) []int {
	m.classifyTrace()
	level := make([]int, bins)
	sum := make([]float64, bins)
	n := make([]int, bins)
	target := make([]float64, bins)
	t0 := m.Now - traceSeconds
	for _, p := range m.trace {
		if p.hz <= 0 {
			continue
		}
		b := min(max(int((p.t-t0)/traceSeconds*float64(bins)), 0), bins-1)
		sum[b] += math.Log2(p.hz)
		n[b]++
		target[b] = p.target
	}
	for b := range level {
		level[b] = -1
		if n[b] == 0 {
			continue
		}
		c := 1200 * (sum[b]/float64(n[b]) - math.Log2(target[b]))
		d := int(math.Floor((traceRange - c) / (2 * traceRange) * float64(dots)))
		level[b] = min(max(d, 0), dots-1)
	}
	return level
}

// classifyTrace finds the target of every voiced trace point not yet
// classified in the current tuning (all of them after a key changes it), so
// a redraw classifies only the frames that came since the last.
func (m *model) classifyTrace() {
	tu := m.Tuning
	spec := ""
	if tu.Temperament != nil {
		spec = tu.Temperament.Spec()
	}
	if fp := fmt.Sprintf("%v|%s|%v|%v|%p|%v", tu.Key, spec, tu.A4, tu.Anchor, tu.Chord, tu.Transpose); fp != m.tracedFor {
		m.tracedFor = fp
		for i := range m.trace {
			m.trace[i].target = 0
		}
	}
	for i, p := range m.trace {
		if p.hz <= 0 || p.target > 0 {
			continue
		}
		toward := p.hz
		if p.ref > 0 {
			toward = p.ref
		}
		m.trace[i].target = tu.Classify(toward).TargetHz
	}
}
