package main

// analyze's writers: one type per format, chosen once by the --format flag.
// CSV rows are the contract's records (session.Event.Record); JSON is built
// from record types with tags, keeping numbers numbers and empty values
// null; the table is for reading, with the tuning above it and a line per
// take below.

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"

	"fifthline/session"
	"fifthline/target"
)

// eventWriter is where analyze sends what it hears; a held-note writer
// ignores frames and a frame writer ignores notes.
type eventWriter interface {
	Frame(path string, f session.Frame)
	Note(ev session.Event) error
	Close() error
}

// newNoteWriter chooses the held-note writer for a format; whence says
// where the tuning came from, for the table's title.
func newNoteWriter(w io.Writer, format string, withFile bool, whence string) eventWriter {
	switch format {
	case "json":
		return &jsonNotes{jsonRows: jsonRows[noteJSON]{out: w}, withFile: withFile}
	case "table":
		return &tableNotes{out: w, tab: tabwriter.NewWriter(w, 0, 0, 2, ' ', 0), withFile: withFile, whence: whence}
	}
	return &csvNotes{csvRows: csvRows{w: csv.NewWriter(w), header: session.Header(withFile), flushEach: true}, withFile: withFile}
}

// csvRows writes a header before the first row (or at the close, when
// there was none, so scripts can rely on it). Held notes are flushed one by
// one, so that a reader sees each at once; frames, hundreds a second, at
// the close.
type csvRows struct {
	w         *csv.Writer
	header    []string
	started   bool
	flushEach bool
}

func (c *csvRows) row(rec []string) error {
	if !c.started {
		c.w.Write(c.header)
		c.started = true
	}
	c.w.Write(rec)
	if c.flushEach {
		c.w.Flush()
	}
	return c.w.Error()
}

func (c *csvRows) Close() error {
	if !c.started {
		c.w.Write(c.header)
	}
	c.w.Flush()
	return c.w.Error()
}

// jsonRows collects records and writes them as one array at the close.
type jsonRows[T any] struct {
	out  io.Writer
	rows []T
}

func (j *jsonRows[T]) Close() error {
	if j.rows == nil {
		j.rows = []T{}
	}
	enc := json.NewEncoder(j.out)
	enc.SetIndent("", "  ")
	return enc.Encode(j.rows)
}

// noteOnly is the half of eventWriter a held-note writer leaves empty.
type noteOnly struct{}

func (noteOnly) Frame(string, session.Frame) {}

type csvNotes struct {
	noteOnly
	csvRows
	withFile bool
}

func (c *csvNotes) Note(ev session.Event) error { return c.row(ev.Record(c.withFile)) }

// noteJSON is a held note in JSON: the CSV columns, typed, and the verdict
// in words.
type noteJSON struct {
	File         string       `json:"file,omitempty"`
	Start        json.Number  `json:"start_s"`
	End          json.Number  `json:"end_s"`
	Note         string       `json:"note"`
	Hz           json.Number  `json:"hz"`
	TargetHz     json.Number  `json:"target_hz"`
	Cents        json.Number  `json:"cents"`
	AltNote      *string      `json:"alt_note"` // null where no other spelling is offered
	AltCents     *json.Number `json:"alt_cents"`
	OnOther      bool         `json:"on_other_spelling"`
	SamePitch    bool         `json:"same_pitch"`
	Spread       json.Number  `json:"spread_cents"`
	VibratoCents json.Number  `json:"vibrato_cents"`
	VibratoHz    json.Number  `json:"vibrato_hz"`
	Verdict      string       `json:"verdict"`
}

type jsonNotes struct {
	noteOnly
	jsonRows[noteJSON]
	withFile bool
}

func (j *jsonNotes) Note(ev session.Event) error {
	j.rows = append(j.rows, newNoteJSON(ev, j.withFile))
	return nil
}

// newNoteJSON is the event as a JSON record, with its file when withFile.
func newNoteJSON(ev session.Event, withFile bool) noteJSON {
	r := ev.Reading
	rec := noteJSON{
		Start: number(ev.Start, 3), End: number(ev.End, 3), Note: r.Written.String(),
		Hz: number(r.Hz, 4), TargetHz: number(r.TargetHz, 4), Cents: number(r.Deviation, 2),
		OnOther: r.OnOther, SamePitch: r.SamePitch,
		Spread: number(ev.Spread, 2), VibratoCents: number(ev.VibratoWidth, 1), VibratoHz: number(ev.VibratoRate, 2),
		Verdict: r.Verdict(),
	}
	if withFile {
		rec.File = ev.Source
	}
	if r.HasAlt {
		alt, altCents := r.AltWritten.String(), number(r.AltDeviation, 2)
		rec.AltNote, rec.AltCents = &alt, &altCents
	}
	return rec
}

// chordJSON is one member of a held chord in JSON, as the chord rows.
type chordJSON struct {
	File      string      `json:"file,omitempty"`
	Start     json.Number `json:"start_s"`
	End       json.Number `json:"end_s"`
	Chord     string      `json:"chord"`
	Member    string      `json:"member"`
	Note      string      `json:"note"`
	Hz        json.Number `json:"hz"`
	Cents     json.Number `json:"cents"`
	JustCents json.Number `json:"just_cents"`
	Voice     int         `json:"voice,omitempty"`
	Player    string      `json:"player,omitempty"`
	// Doubled: a voice's member with another voice an octave above it
	// (voiceNote.doubled); nil for a player's.
	Doubled *bool `json:"doubled,omitempty"`
}

// fileColumn is what a row's file column holds: the path with several
// files, nothing with one.
func fileColumn(path string, withFile bool) string {
	if withFile {
		return path
	}
	return ""
}

// record is the chord row as CSV: the voice or the player, then a voice's
// doubled.
func (c chordJSON) record(withFile bool) []string {
	who := c.Player
	if who == "" {
		who = strconv.Itoa(c.Voice)
	}
	rec := []string{string(c.Start), string(c.End), c.Chord, c.Member, c.Note, string(c.Hz), string(c.Cents), string(c.JustCents), who}
	if c.Doubled != nil {
		rec = append(rec, strconv.FormatBool(*c.Doubled))
	}
	if withFile {
		rec = append([]string{c.File}, rec...)
	}
	return rec
}

// newChordJSON is member m of chord c, held from start to end seconds.
func newChordJSON(file string, start, end float64, c target.HeardChord, m target.HeardMember) chordJSON {
	return chordJSON{File: file, Start: number(start, 3), End: number(end, 3), Chord: c.Name(), Member: m.Role,
		Note: m.Note.String(), Hz: number(m.Hz, 4), Cents: number(m.Cents, 2), JustCents: number(m.JustCents, 2)}
}

// number is x as the CSV writes it, as a JSON number.
func number(x float64, decimals int) json.Number { return json.Number(target.Decimal(x, decimals)) }

// tableNotes is the table for reading: the tuning, a row per note, then a
// summary line per take.
type tableNotes struct {
	noteOnly
	out      io.Writer
	tab      *tabwriter.Writer
	withFile bool
	whence   string
	takes    []string                   // sources in the order heard
	notes    map[string][]session.Event // by source
}

func (t *tableNotes) Note(ev session.Event) error {
	if t.notes == nil {
		fmt.Fprintln(t.out, tableTitle(ev.Tuning.String(), t.whence))
		head := "start\tend\tnote\tHz\tcents\tother spelling\t"
		if t.withFile {
			head = "file\t" + head
		}
		fmt.Fprintln(t.tab, head)
		t.notes = map[string][]session.Event{}
	}
	t.beginTake(ev.Source)
	t.notes[ev.Source] = append(t.notes[ev.Source], ev)
	r := ev.Reading
	line := fmt.Sprintf("%7.2f\t%7.2f\t%s\t%.2f\t%s\t%s\t", ev.Start, ev.End, r.Written, r.Hz, target.FormatCents(r.Deviation, 1), r.OtherWords())
	if t.withFile {
		line = ev.Source + "\t" + line
	}
	_, err := fmt.Fprintln(t.tab, line)
	return err
}

// beginTake registers a take before its notes, so that a take with none
// still gets its line ("FILE: no held notes").
func (t *tableNotes) beginTake(src string) {
	if !slices.Contains(t.takes, src) {
		t.takes = append(t.takes, src)
	}
}

func (t *tableNotes) Close() error {
	switch {
	case t.notes == nil && len(t.takes) == 0:
		_, err := fmt.Fprintln(t.out, "no held notes")
		return err
	case t.notes != nil:
		if err := t.tab.Flush(); err != nil {
			return err
		}
		fmt.Fprintln(t.out)
	}
	for _, src := range t.takes {
		if _, err := fmt.Fprintf(t.out, "%s: %s\n", src, takeSummary(t.notes[src])); err != nil {
			return err
		}
	}
	return nil
}

// tableWords are the CSV's column names as the table heads them: the table
// is for reading, so in a player's words, the names scripts rely on kept
// for CSV and JSON.
var tableWords = map[string]string{
	"start_s":           "start",
	"end_s":             "end",
	"hz":                "Hz",
	"target_hz":         "target Hz",
	"cents":             "cents",
	"alt_note":          "other spelling",
	"alt_cents":         "its cents",
	"on_other_spelling": "on it",
	"same_pitch":        "one pitch",
	"spread_cents":      "spread ¢",
	"vibrato_cents":     "vibrato ¢",
	"vibrato_hz":        "vibrato Hz",
	"group_drift_cents": "group drift ¢",
	"just_cents":        "from just ¢",
}

// tableCells are a record's values as the table writes them: a reading's
// cents as the one-voice table writes them ("+7.9 ¢"), cents under a head
// that names the unit signed to a tenth ("+13.7"), seconds and hertz to a
// hundredth as that table has them, a doubling as "yes" or nothing (a
// column of "false" reads as a fault), and every other value as the CSV
// has it (names, counts).
func tableCells(head, rec []string) []string {
	out := slices.Clone(rec)
	for i, h := range head {
		x, err := strconv.ParseFloat(rec[i], 64)
		switch {
		case h == "doubled":
			out[i] = map[string]string{"true": "yes", "false": ""}[rec[i]]
		case err != nil:
		case h == "cents" || h == "alt_cents":
			out[i] = target.FormatCents(x, 1)
		case h == "just_cents" || h == "group_drift_cents":
			out[i] = target.Signed(x, 1)
		case h == "spread_cents" || h == "vibrato_cents":
			out[i] = target.Decimal(x, 1)
		case h == "start_s" || h == "end_s" || h == "hz" || h == "target_hz":
			out[i] = target.Decimal(x, 2)
		}
	}
	return out
}

// otherColumns are the CSV's columns on the other spelling, which the
// table says in words in one column, as the one-voice table does.
var otherColumns = []string{"alt_note", "alt_cents", "on_other_spelling", "same_pitch"}

// otherInWords folds a note record's other-spelling columns into the
// alt_note column as Reading.OtherWords says them ("sits on Gb4 (−2.9 ¢)",
// "Gb4 would be +38.1 ¢", nothing where both spellings are one pitch); a
// record without them (a chord row) is left as it is.
func otherInWords(head, rec []string) ([]string, []string) {
	at := make([]int, len(otherColumns))
	for i, c := range otherColumns {
		if at[i] = slices.Index(head, c); at[i] < 0 {
			return head, rec
		}
	}
	cents := slices.Index(head, "cents")
	r := target.Reading{SamePitch: rec[at[3]] == "true", OnOther: rec[at[2]] == "true"}
	r.Deviation, _ = strconv.ParseFloat(rec[cents], 64)
	r.AltDeviation, _ = strconv.ParseFloat(rec[at[1]], 64)
	alt, err := target.ParseNote(rec[at[0]])
	r.HasAlt, r.AltWritten = err == nil, alt
	var h, out []string
	for i := range head {
		switch {
		case i == at[0]:
			h, out = append(h, head[i]), append(out, r.OtherWords())
		case !slices.Contains(at, i):
			h, out = append(h, head[i]), append(out, rec[i])
		}
	}
	return h, out
}

// tableHead is a header's columns in the table's words.
func tableHead(head []string) []string {
	out := make([]string, len(head))
	for i, h := range head {
		if w, ok := tableWords[h]; ok {
			out[i] = w
		} else {
			out[i] = strings.ReplaceAll(h, "_", " ")
		}
	}
	return out
}
