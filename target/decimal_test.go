package target

import (
	"testing"
	"time"
)

// Durations as musicians time takes and rehearsals (common practice): a
// held chord to the tenth of a second, a take in seconds, a rehearsal in
// minutes, a day's work in hours, a season in days.
func TestSpan(t *testing.T) {
	for _, c := range []struct {
		d    time.Duration
		want string
	}{
		{2500 * time.Millisecond, "2.5 s"},
		{5 * time.Second, "5 s"},
		{30 * time.Second, "30 s"},
		{80 * time.Second, "80 s"},
		{time.Minute, "1 min"},
		{40 * time.Minute, "40 min"},
		{90 * time.Minute, "1.5 h"},
		{2 * time.Hour, "2 h"},
		{14 * 24 * time.Hour, "14 days"},
	} {
		if got := Span(c.d); got != c.want {
			t.Errorf("Span(%v) = %q, want %q", c.d, got, c.want)
		}
	}
}
