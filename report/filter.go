package report

import (
	"fmt"
	"strings"
	"time"

	"fifthline/journal"
	"fifthline/target"
)

// Filter keeps the entries a report asks for; zero fields keep everything.
type Filter struct {
	Player string    // case-insensitive; a voice as the report heads it, "voice 2", too
	Key    string    // as --key takes it: "g major" matches "G major", "G" too
	Since  time.Time // notes at or after
}

// Apply returns the entries the filter keeps, in order.
func (f Filter) Apply(es []journal.Entry) []journal.Entry {
	want, keyErr := target.ParseKey(f.Key)
	var out []journal.Entry
	for _, e := range es {
		if f.Player != "" && !strings.EqualFold(e.Player, f.Player) && !strings.EqualFold(Who(e.Player, e.Voice), strings.Join(strings.Fields(f.Player), " ")) {
			continue
		}
		if f.Key != "" && !sameKey(e.Key, f.Key, want, keyErr) {
			continue
		}
		if !f.Since.IsZero() && e.Time.Before(f.Since) {
			continue
		}
		out = append(out, e)
	}
	return out
}

func sameKey(have, asked string, want target.Key, wantErr error) bool {
	if k, err := target.ParseKey(have); err == nil && wantErr == nil {
		return k == want
	}
	return strings.EqualFold(strings.TrimSpace(have), strings.TrimSpace(asked))
}

// ParseSince reads a --since value: an RFC 3339 time, or a date (midnight
// at its start in loc).
func ParseSince(s string, loc *time.Location) (time.Time, error) {
	s = strings.TrimSpace(s)
	if t, err := time.Parse(time.RFC3339, s); err == nil {
		return t, nil
	}
	if t, err := time.ParseInLocation("2006-01-02", s, loc); err == nil {
		return t, nil
	}
	if t, err := time.ParseInLocation("2006-01-02T15:04", s, loc); err == nil {
		return t, nil
	}
	return time.Time{}, fmt.Errorf("--since %q: give a date (2026-03-14) or an RFC 3339 time (2026-03-14T19:30:00+01:00)", s)
}
