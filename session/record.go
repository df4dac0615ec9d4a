package session

import (
	"strconv"

	"fifthline/target"
)

// Columns is the header of a held-note CSV line, as the interface contract
// fixes it (start_s … alt_cents, on_other_spelling), then our additions. With
// several files a "file" column comes first.
var Columns = []string{"start_s", "end_s", "note", "hz", "target_hz", "cents", "alt_note", "alt_cents",
	"on_other_spelling", "same_pitch", "spread_cents", "vibrato_cents", "vibrato_hz"}

// Header is Columns, with "file" first when withFile.
func Header(withFile bool) []string {
	if withFile {
		return append([]string{"file"}, Columns...)
	}
	return append([]string(nil), Columns...)
}

// Record formats the event as a CSV record matching Header(withFile). Notes
// are in written pitch when the tuning transposes; frequencies are concert.
// alt_note and alt_cents are empty where no other spelling is offered.
func (ev Event) Record(withFile bool) []string {
	r := ev.Reading
	rec := make([]string, 0, len(Columns)+1)
	if withFile {
		rec = append(rec, ev.Source)
	}
	altNote, altCents := "", ""
	if r.HasAlt {
		altNote, altCents = r.AltWritten.String(), target.Decimal(r.AltDeviation, 2)
	}
	return append(rec,
		target.Decimal(ev.Start, 3), target.Decimal(ev.End, 3), r.Written.String(), target.Decimal(r.Hz, 4), target.Decimal(r.TargetHz, 4),
		target.Decimal(r.Deviation, 2), altNote, altCents, strconv.FormatBool(r.OnOther), strconv.FormatBool(r.SamePitch),
		target.Decimal(ev.Spread, 2), target.Decimal(ev.VibratoWidth, 1), target.Decimal(ev.VibratoRate, 2))
}
