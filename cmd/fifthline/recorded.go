package main

import (
	"errors"
	"time"

	"fifthline/capture"
)

// recordedFlag is analyze's --recorded: when the take was played, which
// places its notes in the journal.
type recordedFlag struct {
	at time.Time
	// clock is a time of day alone (--recorded 19:30): the date is the
	// file's own (bext, else its modification time), so a take analysed
	// the evening it was played needs only the hour.
	clock bool
}

// clockLayouts are the times of day --recorded accepts alone.
var clockLayouts = []string{"15:04", "15:04:05"}

// recordedLayouts are the forms --recorded accepts, in the local zone
// unless RFC 3339 gives one.
var recordedLayouts = []string{time.RFC3339Nano, "2006-01-02", "2006-01-02 15:04", "2006-01-02 15:04:05", "2006-01-02T15:04", "2006-01-02T15:04:05"}

func (r *recordedFlag) String() string {
	if r == nil || r.at.IsZero() {
		return ""
	}
	if r.clock {
		return r.at.Format("15:04:05")
	}
	return r.at.Format(time.RFC3339)
}

func (r *recordedFlag) Set(s string) error {
	for _, layout := range recordedLayouts {
		if t, err := time.ParseInLocation(layout, s, time.Local); err == nil {
			r.at, r.clock = t, false
			return nil
		}
	}
	for _, layout := range clockLayouts {
		if t, err := time.ParseInLocation(layout, s, time.Local); err == nil {
			r.at, r.clock = t, true
			return nil
		}
	}
	return errors.New(`use a date, a time, a date and time or RFC 3339: 2026-11-24, 19:30, "2026-11-24 19:30", 2026-11-24T19:30:00+01:00`)
}

// takeStart is when a recording began: --recorded, else the Broadcast Wave
// bext origination date and time, else the file's modification time (as
// the contract says; a recorder's file is last written when the take ends,
// so notes then sit up to one take's length late, on the same day).
func takeStart(flag recordedFlag, rec *capture.Recording) time.Time {
	if !flag.at.IsZero() && !flag.clock {
		return flag.at
	}
	own := rec.ModTime()
	if bc := rec.Broadcast(); bc != nil && !bc.Origination.IsZero() {
		own = bc.Origination
	}
	if flag.clock {
		y, m, d := own.In(time.Local).Date()
		return time.Date(y, m, d, flag.at.Hour(), flag.at.Minute(), flag.at.Second(), 0, time.Local)
	}
	return own
}
