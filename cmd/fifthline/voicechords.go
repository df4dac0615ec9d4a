package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"fifthline/harmony"
	"fifthline/target"
)

// chordsOf finds the held chords among voice notes (harmony.Find), each
// member read from its voice's frames within the chord.
func chordsOf(notes []voiceNote, tu target.Tuning, seventh float64) []harmony.Chord {
	hs := make([]harmony.Note, len(notes))
	for i, n := range notes {
		hs[i] = harmony.Note{Start: n.Start, End: n.End, Who: strconv.Itoa(n.voice), Note: n.Reading.Note, Frames: n.frames, Hz: n.Hz}
	}
	return harmony.Find(hs, tu, seventh)
}

// logVoiceChords writes the chords' memberships to the journal, each with
// its voice (start: the take's, or zero when heard now).
func logVoiceChords(j *journalSink, source string, tu target.Tuning, chords []harmony.Chord, notes []voiceNote, start time.Time) {
	for _, c := range chords {
		j.chord(source, tu, c.Start, c.End, c.HeardChord, func(i int) (string, string) {
			return "", strconv.Itoa(notes[c.Notes[i]].voice)
		}, start)
	}
}

// chordHeader is the contract's chord row, with the voice column.
func chordHeader(withFile bool) []string {
	h := []string{"start_s", "end_s", "chord", "member", "note", "hz", "cents", "just_cents", "voice"}
	if withFile {
		return append([]string{"file"}, h...)
	}
	return h
}

// voiceChordRecords are the chord's rows, one per sounding member, lowest
// first.
func voiceChordRecords(h harmony.Chord, path string, notes []voiceNote) []chordJSON {
	var out []chordJSON
	for i, m := range h.Members {
		c := newChordJSON(path, h.Start, h.End, h.HeardChord, m)
		c.Voice = notes[h.Notes[i]].voice
		out = append(out, c)
	}
	return out
}

// rowWriter writes rows under a header as CSV (each row flushed), a JSON
// array, or an aligned table.
type rowWriter struct {
	format, title string
	head          []string
	out           io.Writer
	csv           *csv.Writer
	tab           *tabwriter.Writer
	json          []any
	rows          int
}

func newRowWriter(w io.Writer, format string, head []string) *rowWriter {
	return &rowWriter{format: format, head: head, out: w, csv: csv.NewWriter(w), tab: tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)}
}

// write adds a row: rec for CSV and the table, obj (a record type with
// JSON tags) for JSON.
func (rw *rowWriter) write(rec []string, obj any) {
	switch rw.format {
	case "json":
		rw.json = append(rw.json, obj)
	case "table":
		if rw.rows == 0 {
			if rw.title != "" {
				fmt.Fprintln(rw.out, rw.title)
			}
			fmt.Fprintln(rw.tab, strings.Join(rw.head, "\t"))
		}
		fmt.Fprintln(rw.tab, strings.Join(rec, "\t"))
	default:
		if rw.rows == 0 {
			rw.csv.Write(rw.head)
		}
		rw.csv.Write(rec)
		rw.csv.Flush()
	}
	rw.rows++
}

// close ends the output; with no rows, CSV still gives its header.
func (rw *rowWriter) close() error {
	switch rw.format {
	case "json":
		if rw.json == nil {
			rw.json = []any{}
		}
		enc := json.NewEncoder(rw.out)
		enc.SetIndent("", "  ")
		return enc.Encode(rw.json)
	case "table":
		if rw.rows == 0 {
			_, err := fmt.Fprintln(rw.out, "no held notes")
			return err
		}
		return rw.tab.Flush()
	}
	if rw.rows == 0 {
		rw.csv.Write(rw.head)
	}
	rw.csv.Flush()
	return rw.csv.Error()
}
