package journal

import (
	"math"
	"path/filepath"
	"testing"
	"time"

	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// clock is a pinned, steppable time source for Meta.Now.
type clock struct{ t time.Time }

func (c *clock) now() time.Time { return c.t }

var opening = time.Date(2026, 3, 14, 19, 30, 0, 0, time.FixedZone("CET", 3600))

// written opens a journal at a fresh path, hands it to write, closes it
// and reads back want entries, failing on any warning.
func written(t *testing.T, meta Meta, want int, write func(*Writer) error) []Entry {
	t.Helper()
	path := filepath.Join(t.TempDir(), "j.csv")
	w, err := Open(path, meta)
	if err != nil {
		t.Fatal(err)
	}
	if err := write(w); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	es, warns, err := ReadFile(path)
	if err != nil || len(warns) != 0 || len(es) != want {
		t.Fatalf("%d entries, %q, %v", len(es), warns, err)
	}
	return es
}

// heldAt makes a held note at a pitch given in cents from A4 = 440 Hz (ISO 16),
// read in C major, equal temperament.
func heldAt(centsFromA4, start, end float64, source string) session.Event {
	tu := target.Default()
	hz := 440 * math.Exp2(centsFromA4/1200) // the definition of the cent (common practice)
	return session.Event{
		Source:  source,
		Held:    pitchdetect.Held{Start: start, End: end, Hz: hz, Spread: 1.5, VibratoWidth: 0, Frames: 40},
		Reading: tu.Classify(hz),
		Tuning:  tu,
	}
}
