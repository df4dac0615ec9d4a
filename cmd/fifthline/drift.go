package main

import (
	"flag"
	"fmt"
	"math"

	"fifthline/ensemble"
	"fifthline/session"
	"fifthline/target"
)

// The group's drift on --players rows (package ensemble defines it), and
// --reference group: each note read against where the group has moved
// the reference, for groups allowed to drift together.

// driftColumn follows the held-note columns, before player and channel.
const driftColumn = "group_drift_cents"

// addReferenceFlag defines --reference; addPlayersFlag calls it.
func addReferenceFlag(fs *flag.FlagSet) {
	choiceFlag(fs, "reference", "with --players: read each note against the fixed reference (a4: --a4 and the temperament) or against the group's, moved by the group's drift (group)", "a4", "group")
}

// groupReference checks --reference: true for group, which needs players.
func groupReference(fs *flag.FlagSet, players bool) (bool, error) {
	group := fs.Lookup("reference").Value.String() == "group"
	if wasSet(fs, "reference") && !players {
		return false, usagef("--reference reads the players against each other: it needs --players")
	}
	return group, nil
}

// moved is tu with its reference moved by the group's drift.
func moved(tu target.Tuning, cents float64) target.Tuning {
	tu.A4 *= math.Exp2(cents / 1200)
	return tu
}

// withDrift is the player's note with the group's drift at it; with group
// reference the note is read again against the moved reference.
func withDrift(n ensemble.Note, tu target.Tuning, cents float64, known, group bool) playerNote {
	if known && group {
		n.Tuning = moved(tu, cents)
		n.Reading = n.Tuning.ReadAs(n.Reading.Note, n.Held.Hz) // spelled as before, its chord's spelling kept
	}
	return playerNote{Note: n, drift: cents, known: known}
}

// driftField is the drift column's text: empty where it is not known.
func (n playerNote) driftField() string {
	if !n.known {
		return ""
	}
	return target.Decimal(n.drift, 2)
}

// takeDrift reads the group's drift over one take's notes.
func takeDrift(notes []ensemble.Note, tu target.Tuning, seventh float64) ensemble.TakeDrift {
	evs := make([]session.Event, len(notes))
	for i, n := range notes {
		evs[i] = n.Event
	}
	return eventsDrift(evs, tu, seventh)
}

// eventsDrift reads the group's drift over held notes, whoever played them
// (players' or voices').
func eventsDrift(evs []session.Event, tu target.Tuning, seventh float64) ensemble.TakeDrift {
	s := make([]ensemble.Sounding, len(evs))
	for i, ev := range evs {
		s[i] = ensemble.Sounding{Start: ev.Held.Start, End: ev.Held.End, Hz: ev.Held.Hz}
	}
	return ensemble.DriftOver(s, tu, seventh)
}

// driftNotes are the take's notes with the drift at each note's middle.
func driftNotes(notes []ensemble.Note, td ensemble.TakeDrift, tu target.Tuning, group bool) []playerNote {
	out := make([]playerNote, len(notes))
	for i, n := range notes {
		c, ok := td.At((n.Held.Start + n.Held.End) / 2)
		out[i] = withDrift(n, tu, c, ok, group)
	}
	return out
}

// tableLines ends a table with lines of its own (a blank line first);
// other formats carry none.
func tableLines(e *env, format string, lines []string) error {
	if format != "table" || len(lines) == 0 {
		return nil
	}
	fmt.Fprintln(e.stdout)
	for _, l := range lines {
		if _, err := fmt.Fprintln(e.stdout, l); err != nil {
			return err
		}
	}
	return nil
}
