package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"

	"fifthline/session"
	"fifthline/target"
)

// frameColumns is the frame track's header: the contract's time_s, hz,
// confidence, then ours.
var frameColumns = []string{"time_s", "hz", "confidence", "voiced", "level_dbfs", "note", "cents"}

// newFrameWriter chooses the frame-track writer for a format; hz (and the
// reading) are empty, or null, when there is no pitch. title heads the table.
func newFrameWriter(w io.Writer, format string, withFile bool, title string) eventWriter {
	switch format {
	case "json":
		return &jsonFrames{jsonRows: jsonRows[frameJSON]{out: w}, withFile: withFile}
	case "table":
		return &tableFrames{out: w, title: title}
	}
	header := frameColumns
	if withFile {
		header = append([]string{"file"}, frameColumns...)
	}
	return &csvFrames{csvRows: csvRows{w: csv.NewWriter(w), header: header}, withFile: withFile}
}

// frameOnly is the half of eventWriter a frame writer leaves empty; it
// hands back the first failed write when the session asks at a note.
type frameOnly struct{ err error }

func (f *frameOnly) Note(session.Event) error { return f.err }

func (f *frameOnly) keep(err error) {
	if err != nil && f.err == nil {
		f.err = err
	}
}

type csvFrames struct {
	frameOnly
	csvRows
	withFile bool
}

func (c *csvFrames) Frame(path string, f session.Frame) {
	rec := []string{strconv.FormatFloat(f.Time, 'f', 4, 64), "", strconv.FormatFloat(f.Confidence, 'f', 3, 64),
		strconv.FormatBool(f.Voiced), strconv.FormatFloat(f.Level, 'f', 1, 64), "", ""}
	if f.Voiced {
		rec[1] = strconv.FormatFloat(f.Hz, 'f', 4, 64)
		rec[5] = f.Reading.Written.String()
		rec[6] = target.Decimal(f.Reading.Deviation, 2)
	}
	if c.withFile {
		rec = append([]string{path}, rec...)
	}
	c.keep(c.row(rec))
}

// frameJSON is one frame in JSON; hz, note and cents are null without a pitch.
type frameJSON struct {
	File       string       `json:"file,omitempty"`
	Time       json.Number  `json:"time_s"`
	Hz         *json.Number `json:"hz"`
	Confidence json.Number  `json:"confidence"`
	Voiced     bool         `json:"voiced"`
	Level      json.Number  `json:"level_dbfs"`
	Note       *string      `json:"note"`
	Cents      *json.Number `json:"cents"`
}

type jsonFrames struct {
	frameOnly
	jsonRows[frameJSON]
	withFile bool
}

func (j *jsonFrames) Frame(path string, f session.Frame) {
	rec := frameJSON{Time: number(f.Time, 4), Confidence: number(f.Confidence, 3), Voiced: f.Voiced, Level: number(f.Level, 1)}
	if j.withFile {
		rec.File = path
	}
	if f.Voiced {
		hz, cents, note := number(f.Hz, 4), number(f.Reading.Deviation, 2), f.Reading.Written.String()
		rec.Hz, rec.Cents, rec.Note = &hz, &cents, &note
	}
	j.rows = append(j.rows, rec)
}

type tableFrames struct {
	frameOnly
	out     io.Writer
	title   string
	started bool
}

func (t *tableFrames) Frame(_ string, f session.Frame) {
	if !t.started {
		_, err := fmt.Fprintln(t.out, t.title)
		t.keep(err)
		t.row("time", "Hz", "conf", "note", "cents")
		t.started = true
	}
	hz, note, cents := "", "", ""
	if f.Voiced {
		hz, note, cents = strconv.FormatFloat(f.Hz, 'f', 4, 64), f.Reading.Written.String(), target.Decimal(f.Reading.Deviation, 2)
	}
	t.row(strconv.FormatFloat(f.Time, 'f', 4, 64), hz, strconv.FormatFloat(f.Confidence, 'f', 3, 64), note, cents)
}

func (t *tableFrames) row(cols ...any) {
	_, err := fmt.Fprintf(t.out, "%8s %10s %5s  %-5s %7s\n", cols...)
	t.keep(err)
}

func (t *tableFrames) Close() error { return t.err }
