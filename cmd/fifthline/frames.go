package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"

	"fifthline/session"
)

// frameColumns is the frame track's header: the contract's time_s, hz,
// confidence, then ours.
var frameColumns = []string{"time_s", "hz", "confidence", "voiced", "level_dbfs", "note", "cents"}

// frameWriter prints the frame track; hz (and the reading) are empty when
// there is no pitch.
type frameWriter struct {
	format   string
	withFile bool
	csv      *csv.Writer
	out      io.Writer
	json     []map[string]any
	started  bool
	err      error // the table's first failed write
}

func newFrameWriter(w io.Writer, format string, withFile bool) *frameWriter {
	return &frameWriter{format: format, withFile: withFile, csv: csv.NewWriter(w), out: w}
}

func (fw *frameWriter) header() []string {
	if fw.withFile {
		return append([]string{"file"}, frameColumns...)
	}
	return frameColumns
}

func (fw *frameWriter) Frame(path string, f session.Frame) {
	rec := []string{strconv.FormatFloat(f.Time, 'f', 4, 64), "", strconv.FormatFloat(f.Confidence, 'f', 3, 64),
		strconv.FormatBool(f.Voiced), strconv.FormatFloat(f.Level, 'f', 1, 64), "", ""}
	if f.Voiced {
		rec[1] = strconv.FormatFloat(f.Hz, 'f', 4, 64)
		rec[5] = f.Reading.Written.String()
		rec[6] = strconv.FormatFloat(f.Reading.Deviation, 'f', 2, 64)
	}
	if fw.withFile {
		rec = append([]string{path}, rec...)
	}
	switch fw.format {
	case "json":
		fw.json = append(fw.json, jsonObject(fw.header(), rec))
	case "table":
		if !fw.started {
			fw.row("time", "Hz", "conf", "note", "cents")
			fw.started = true
		}
		if fw.withFile {
			rec = rec[1:]
		}
		fw.row(rec[0], rec[1], rec[2], rec[5], rec[6])
	default:
		if !fw.started {
			fw.csv.Write(fw.header())
			fw.started = true
		}
		fw.csv.Write(rec)
	}
}

// row writes one table row, keeping the first error for Note and Close.
func (fw *frameWriter) row(cols ...any) {
	if _, err := fmt.Fprintf(fw.out, "%8s %10s %5s  %-5s %7s\n", cols...); err != nil && fw.err == nil {
		fw.err = err
	}
}

func (fw *frameWriter) Note(session.Event) error {
	if fw.err != nil {
		return fw.err
	}
	return fw.csv.Error()
}

func (fw *frameWriter) Close() error {
	switch fw.format {
	case "json":
		if fw.json == nil {
			fw.json = []map[string]any{}
		}
		return json.NewEncoder(fw.out).Encode(fw.json)
	case "table":
		return fw.err
	}
	if !fw.started {
		fw.csv.Write(fw.header())
	}
	fw.csv.Flush()
	return fw.csv.Error()
}
