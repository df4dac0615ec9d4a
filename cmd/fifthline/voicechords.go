package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"fifthline/harmony"
	"fifthline/journal"
	"fifthline/target"
)

// chordsOf finds the held chords among voice notes (harmony.FindOneChannel), each
// member read from its voice's frames within the chord, from where its note
// settled when it enters on the chord (its segmenter's Held.Settled: past
// the attack's glide, as the note alone is read and as a player's is); a
// voice lost for a moment under the chord is bridged first (bridgeLost).
func chordsOf(notes []voiceNote, tu target.Tuning, seventh float64) []harmony.Chord {
	hs := make([]harmony.Note, len(notes))
	for i, n := range notes {
		hs[i] = n.harmonyNote()
	}
	hs, from := bridgeLost(hs)
	chords := harmony.FindOneChannel(hs, tu, seventh)
	for _, c := range chords {
		for i, k := range c.Notes {
			c.Notes[i] = from[k]
		}
	}
	return chords
}

// harmonyNote is the note as the chord finder reads it, the same for a
// file's chords and those heard live.
func (n voiceNote) harmonyNote() harmony.Note {
	return harmony.Note{Start: n.Start, End: n.End, Who: strconv.Itoa(n.voice), Note: n.Reading.Note, Frames: n.frames, Hz: n.Hz, Settled: n.Settled}
}

// lostSeconds is the longest a voice's note may go unheard under a chord
// that holds and still be the same note: one microphone under a choir's
// chorused voices loses a voice for up to 0.84 s while it sings on
// (TestVoicesOfRenderedEnsembles, "choir, four parts", measured).
const lostSeconds = 1.0

// bridgeLost joins a note to the same note heard again less than
// lostSeconds after it ended, when every other note sounding as it ended
// still sounds as it is heard again: the chord held and the voice went on
// singing, so the chord is one row, not a row each side of the gap and the
// stretch between. The joined note reads both pieces' frames. from[i] is
// the index in notes of the first piece of the i-th note returned.
func bridgeLost(notes []harmony.Note) (out []harmony.Note, from []int) {
	joined := slices.Clone(notes)
	dead := make([]bool, len(notes))             // joined to an earlier piece
	holds := func(skip int, a, b float64) bool { // another note sounding over [a, b]?
		some := false
		for k, o := range joined {
			if k == skip || dead[k] || o.Start > a || o.End < a {
				continue
			}
			if o.End < b {
				return false
			}
			some = true
		}
		return some
	}
	// Pass after pass: one bridge can make another's chord hold (the
	// choir's D4, bridged, holds over B3's gap). Only the few notes found
	// again within lostSeconds are checked against the others.
	for again := true; again; {
		again = false
		for i := range joined {
			for j := range joined {
				gap := joined[j].Start - joined[i].End
				if dead[i] || dead[j] || joined[j].Note != joined[i].Note || gap <= 0 || gap >= lostSeconds || !holds(i, joined[i].End, joined[j].Start) {
					continue
				}
				joined[i].End, joined[i].Frames = joined[j].End, mergedFrames(joined[i].Frames, joined[j].Frames)
				dead[j], again = true, true
			}
		}
	}
	for i, n := range joined {
		if !dead[i] {
			out, from = append(out, n), append(from, i)
		}
	}
	return out, from
}

// mergedFrames are two pieces' frames in time order (either may be nil:
// then the note is read from its Hz, and so is the joined one).
func mergedFrames(a, b *harmony.Track) *harmony.Track {
	if a == nil || b == nil {
		return nil
	}
	if a == b {
		return a
	}
	m := &harmony.Track{}
	for i, j := 0, 0; i < len(a.Time) || j < len(b.Time); {
		if j == len(b.Time) || (i < len(a.Time) && a.Time[i] <= b.Time[j]) {
			m.Add(a.Time[i], a.Hz[i])
			i++
		} else {
			m.Add(b.Time[j], b.Hz[j])
			j++
		}
	}
	return m
}

// logVoiceChords writes the chords' memberships to the journal, each with
// its voice (start: the take's, or zero when heard now).
func logVoiceChords(j *journalSink, source string, tu target.Tuning, chords []harmony.Chord, notes []voiceNote, start time.Time) {
	for _, c := range chords {
		j.chord(source, tu, c.Start, c.End, c.HeardChord, func(i int) (string, journal.Extra) {
			return "", journal.Extra{Voice: strconv.Itoa(notes[c.Notes[i]].voice)}
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
		c.Voice, c.Doubled = notes[h.Notes[i]].voice, &notes[h.Notes[i]].doubled
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
		head, rec := otherInWords(rw.head, rec)
		if rw.rows == 0 {
			if rw.title != "" {
				fmt.Fprintln(rw.out, rw.title)
			}
			fmt.Fprintln(rw.tab, strings.Join(tableHead(head), "\t"))
		}
		fmt.Fprintln(rw.tab, strings.Join(tableCells(head, rec), "\t"))
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
