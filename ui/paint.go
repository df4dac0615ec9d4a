package ui

import (
	"github.com/gdamore/tcell/v2"
	"github.com/mattn/go-runewidth"
	"github.com/rivo/tview"
)

// painter keeps what the meter last put on the screen, so that a redraw
// hands tcell only the cells that changed. tview clears the screen and
// draws every cell on each of its draws; at the meter's frame rate that was
// most of the meter's own cost, so the periodic redraw bypasses it and
// tview's draw is left for start-up, resizes and key presses.
type painter struct {
	x, y, w, h int
	cells      []cell // w×h, row by row
}

type cell struct {
	r    rune // 0: the right half of a wide rune
	role role
}

// paint puts lines on s in the rectangle (x, y, w, h), padded with spaces.
// With full set it writes every cell (the screen was cleared, or the
// rectangle moved); otherwise only those that differ from the last paint.
func (p *painter) paint(s tcell.Screen, lines []screenLine, x, y, w, h int, full bool) {
	if w <= 0 || h <= 0 {
		return
	}
	if full || x != p.x || y != p.y || w != p.w || h != p.h {
		p.x, p.y, p.w, p.h = x, y, w, h
		p.cells = make([]cell, w*h)
		full = true
	}
	for row := range h {
		var l screenLine
		if row < len(lines) {
			l = lines[row]
		}
		col := 0
		put := func(c cell) {
			i := row*w + col
			if full || p.cells[i] != c {
				p.cells[i] = c
				if c.r != 0 {
					s.SetContent(x+col, y+row, c.r, nil, styles[c.role])
				}
			}
			col++
		}
		for _, sp := range l {
			for _, r := range sp.Text {
				rw := runewidth.RuneWidth(r)
				if col+rw > w {
					break
				}
				put(cell{r, sp.Role})
				for range rw - 1 {
					put(cell{0, sp.Role})
				}
			}
		}
		for col < w {
			put(cell{' ', plainRole})
		}
	}
}

// view is the meter's one tview primitive: a Box whose Draw paints the
// whole layout (tview has just cleared the screen), without the Box's own
// background fill.
type view struct {
	*tview.Box
	draw func(s tcell.Screen, x, y, w, h int)
}

func (v *view) Draw(s tcell.Screen) {
	x, y, w, h := v.GetRect()
	v.draw(s, x, y, w, h)
}
