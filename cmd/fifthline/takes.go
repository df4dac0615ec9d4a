package main

// What analyze says about a whole take: a one-line summary under the table,
// and a warning when the notes suggest that the declared tuning is not the
// one the take was played in.

import (
	"fmt"
	"math"
	"sort"

	"fifthline/session"
	"fifthline/target"
)

// inTuneCents is how near its target a note counts as in tune, here and as
// report's default --tolerance.
const inTuneCents = 5

// takeSummary is one line about a take's held notes: "11 of 12 notes within
// ±5 ¢; 1 on the other spelling; drifted 3 ¢ flat".
func takeSummary(evs []session.Event) string {
	if len(evs) == 0 {
		return "no held notes"
	}
	within, other := 0, 0
	var spelled []session.Event // those read on their own spelling, for the drift
	for _, ev := range evs {
		switch r := ev.Reading; {
		case r.OnOther:
			other++
		default:
			spelled = append(spelled, ev)
			if math.Abs(r.Deviation) <= inTuneCents {
				within++
			}
		}
	}
	s := fmt.Sprintf("%d of %d %s within ±%d ¢; %d on the other spelling", within, len(evs), plural(len(evs), "note"), inTuneCents, other)
	if d, ok := drift(spelled); ok {
		switch c := math.Round(d); {
		case c > 0:
			s += fmt.Sprintf("; drifted %.0f ¢ sharp", c)
		case c < 0:
			s += fmt.Sprintf("; drifted %.0f ¢ flat", -c)
		default:
			s += "; no drift"
		}
	}
	return s
}

// drift is the mean cents of the later half of the notes less that of the
// earlier half; it needs four notes.
func drift(evs []session.Event) (float64, bool) {
	if len(evs) < 4 {
		return 0, false
	}
	evs = append([]session.Event(nil), evs...)
	sort.SliceStable(evs, func(i, j int) bool { return evs[i].Start < evs[j].Start })
	half := len(evs) / 2
	mean := func(es []session.Event) float64 {
		sum := 0.0
		for _, e := range es {
			sum += e.Reading.Deviation
		}
		return sum / float64(len(es))
	}
	return mean(evs[len(evs)-half:]) - mean(evs[:half]), true
}

func plural(n int, word string) string {
	if n == 1 {
		return word
	}
	return word + "s"
}

// Thresholds for telling a forgotten or wrong tuning from ordinary playing:
// enough notes to judge, a steady offset larger than intonation usually
// strays, and most notes agreeing on it.
const (
	judgeNotes   = 4
	offsetCents  = 10
	steadyShare  = 0.75
	fitShareNeed = 0.75
)

// tuningWarning says, in one line, when a take's notes do not fit the
// declared tuning and which key and reference fit them; "" when they fit.
// Where no key was given (keyGiven false) and the fit moved the reference,
// the key that fits as well at the reference in force is named too: the
// key is the likelier thing forgotten.
func tuningWarning(name string, tu target.Tuning, evs []session.Event, keyGiven bool) string {
	hz := make([]float64, len(evs))
	for i, ev := range evs {
		hz[i] = ev.Reading.Hz
	}
	c := tu.CheckTake(hz)
	if c.Notes < judgeNotes {
		return ""
	}
	var what string
	switch {
	case 2*c.OutOfScale > c.Notes:
		what = fmt.Sprintf("%d of %d notes lie outside %s", c.OutOfScale, c.Notes, tu.Key)
	case math.Abs(c.Offset) >= offsetCents && float64(c.Steady) >= steadyShare*float64(c.Notes):
		dir := "sharp"
		if c.Offset < 0 {
			dir = "flat"
		}
		what = fmt.Sprintf("the notes sit a steady %.1f ¢ %s of their targets at A4 = %g Hz", math.Abs(c.Offset), dir, tu.A4)
	default:
		return ""
	}
	fit := "no other key or reference fits them better"
	if c.BestFits > c.Fits && float64(c.BestFits) >= fitShareNeed*float64(c.Notes) {
		fit = fmt.Sprintf("these notes fit %s at A4 ≈ %.1f Hz", c.Best.Key, c.Best.A4)
		if c.HasAtA4 && !keyGiven {
			fit += fmt.Sprintf(", or %s at A4 ≈ %.1f Hz", c.AtA4.Key, c.AtA4.A4)
		}
	}
	return fmt.Sprintf("warning: %s: %s; %s (is the tuning right? see fifthline help tuning)", name, what, fit)
}
