package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"slices"
	"strings"
	"text/tabwriter"

	"fifthline/target"
)

// minChordSeconds: a set of notes sounding together for less than this is a
// passing moment (one voice entering late), not a held chord.
const minChordSeconds = 0.3

// heldChord is a stretch of time over which the same notes sound together.
type heldChord struct {
	start, end float64
	notes      []int // indexes into the notes, as NameChord's members refer to them
	chord      target.HeardChord
}

// chordsOf finds the held chords among voice notes: between any two
// consecutive note starts or ends, the notes sounding throughout are a chord
// when they name one. A note held across a chord change belongs to both
// chords, each reading it against its own root.
func chordsOf(notes []voiceNote, tu target.Tuning, seventh float64) []heldChord {
	var cuts []float64
	for _, n := range notes {
		cuts = append(cuts, n.Start, n.End)
	}
	slices.Sort(cuts)
	cuts = slices.Compact(cuts)
	var out []heldChord
	for i := 1; i < len(cuts); i++ {
		a, b := cuts[i-1], cuts[i]
		var idx []int
		var hz []float64
		for k, n := range notes {
			if n.Start <= a && n.End >= b {
				idx = append(idx, k)
				hz = append(hz, n.Hz)
			}
		}
		if len(idx) < 2 {
			continue
		}
		if last := len(out) - 1; last >= 0 && out[last].end == a && slices.Equal(out[last].notes, idx) {
			out[last].end = b
			continue
		}
		c, ok := tu.NameChord(hz, seventh)
		if !ok {
			continue
		}
		out = append(out, heldChord{start: a, end: b, notes: idx, chord: c})
	}
	return slices.DeleteFunc(out, func(h heldChord) bool { return h.end-h.start < minChordSeconds })
}

// chordHeader is the contract's chord row, with the voice column.
func chordHeader(withFile bool) []string {
	h := []string{"start_s", "end_s", "chord", "member", "note", "hz", "cents", "just_cents", "voice"}
	if withFile {
		return append([]string{"file"}, h...)
	}
	return h
}

// records are the chord's rows, one per sounding member, lowest first.
func (h heldChord) records(path string, notes []voiceNote) []chordJSON {
	var out []chordJSON
	for _, m := range h.chord.Members {
		c := newChordJSON(path, h.start, h.end, h.chord, m)
		c.Voice = notes[h.notes[m.Index]].voice
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
