package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"golang.org/x/term"
)

// progress draws a one-line bar on stderr while a long file is analysed, only
// when stderr is a terminal (never into a log or a pipe).
type progress struct {
	w        io.Writer
	name     string
	total    float64
	last     time.Time
	active   bool
	lastFrac float64
}

// longFile is how long (seconds of audio) a file must be to get a bar.
const longFile = 20

func newProgress(w io.Writer, path string, seconds float64) *progress {
	p := &progress{w: w, name: filepath.Base(path), total: seconds}
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) && seconds >= longFile {
		p.active = true
	}
	return p
}

// At moves the bar to the given position in seconds, redrawing at most ten
// times a second.
func (p *progress) At(seconds float64) {
	if !p.active || time.Since(p.last) < 100*time.Millisecond {
		return
	}
	p.last = time.Now()
	frac := min(seconds/p.total, 1)
	const width = 30
	n := int(frac * width)
	fmt.Fprintf(p.w, "\r%s [%s%s] %3.0f%%", p.name, strings.Repeat("=", n), strings.Repeat(" ", width-n), 100*frac)
	p.lastFrac = frac
}

// Done clears the bar.
func (p *progress) Done() {
	if p.active {
		fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", len(p.name)+40))
	}
}
