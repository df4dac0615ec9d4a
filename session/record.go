package session

import (
	"strconv"
)

// Columns is the header of a held-note CSV line, as the interface contract
// fixes it (start_s … alt_cents), then our additions. With several files a
// "file" column comes first.
var Columns = []string{"start_s", "end_s", "note", "hz", "target_hz", "cents", "alt_note", "alt_cents",
	"same_pitch", "spread_cents", "vibrato_cents", "vibrato_hz"}

// Header is Columns, with "file" first when withFile.
func Header(withFile bool) []string {
	if withFile {
		return append([]string{"file"}, Columns...)
	}
	return append([]string(nil), Columns...)
}

// Record formats the event as a CSV record matching Header(withFile). Notes
// are in written pitch when the tuning transposes; frequencies are concert.
func (ev Event) Record(withFile bool) []string {
	r := ev.Reading
	rec := make([]string, 0, len(Columns)+1)
	if withFile {
		rec = append(rec, ev.Source)
	}
	return append(rec,
		Decimal(ev.Start, 3), Decimal(ev.End, 3), r.Written.String(), Decimal(r.Hz, 4), Decimal(r.TargetHz, 4),
		Decimal(r.Cents, 2), r.AltWritten.String(), Decimal(r.AltCents, 2), strconv.FormatBool(r.SamePitch),
		Decimal(ev.Spread, 2), Decimal(ev.VibratoWidth, 1), Decimal(ev.VibratoRate, 2))
}

// Decimal formats x with the given decimals, never as "-0.00".
func Decimal(x float64, decimals int) string {
	s := strconv.FormatFloat(x, 'f', decimals, 64)
	if s[0] == '-' {
		if z, err := strconv.ParseFloat(s, 64); err == nil && z == 0 {
			return s[1:]
		}
	}
	return s
}
