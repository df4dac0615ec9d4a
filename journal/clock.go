package journal

import (
	"time"

	"fifthline/session"
)

// runClock places each run of start_s (one file, one capture) on the
// journal's wall clock. A new run begins when the source changes or end_s
// goes back (notes are written as they end; players heard together overlap,
// so a start before the last end is no new run); it starts where the last
// run ended, or at the wall time it really began if that is later (live
// capture), so files analysed in a row lie end to end and live notes keep
// their real time.
type runClock struct {
	started      bool
	source       string
	base, maxEnd float64
}

func (c *runClock) offset(ev session.Event, wallElapsed float64) float64 {
	if !c.started || ev.Source != c.source || ev.End < c.maxEnd-1 {
		next := c.base + c.maxEnd
		if !c.started {
			next = 0
		}
		c.base = max(next, wallElapsed-ev.End)
		c.started, c.source, c.maxEnd = true, ev.Source, 0
	}
	c.maxEnd = max(c.maxEnd, ev.End)
	return c.base
}

// heardAt places a note whose end was heard at heard (zero: now) on the
// journal's clock (see runClock).
func (w *Writer) heardAt(ev session.Event, heard time.Time) func() time.Time {
	return func() time.Time {
		at := heard
		if at.IsZero() {
			at = w.meta.Now()
		}
		run := w.run.offset(ev, at.Sub(w.opened).Seconds())
		return w.opened.Add(seconds(run + ev.Start))
	}
}

// WriteHeard appends one held note heard live whose end was heard at heard
// but which is written later, held back until the chords it sounds in are
// known: it is placed on the clock as of when it was heard, so the wait
// moves neither it nor the notes after it. A zero heard is WriteExtra's
// now.
func (w *Writer) WriteHeard(ev session.Event, x Extra, heard time.Time) error {
	return w.write(ev, x, w.heardAt(ev, heard))
}
