package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"

	"fifthline/mts"
	"fifthline/target"
)

// keyRow is one key of the octave from C4 in the table: which spelling it
// plays and where.
type keyRow struct {
	key          int
	note         target.Note
	hz           float64
	fromEqual    float64 // from equal temperament at the declared reference
	fromA440     float64 // from equal temperament at A4 = 440 Hz, the standard's frame
	word         mts.Word
	wordInPlayed bool // the form sends per-key words (not the octave form)
}

func (kb *keyboard) rows(form string) []keyRow {
	off := kb.offsets()
	rows := make([]keyRow, 12)
	for pc := range rows {
		k := 60 + pc
		n := kb.notes[k]
		rows[pc] = keyRow{key: k, note: n, hz: kb.tu.Target(n), fromEqual: kb.tu.CentsFromEqual(n),
			fromA440: off[pc], word: kb.keys[k], wordInPlayed: form != "octave"}
	}
	return rows
}

// writeTable prints the key-to-spelling table: on stderr by default, so the
// player sees it beside the file, or on stdout with --format.
func (kb *keyboard) writeTable(e *env, format, form string) error {
	rows := kb.rows(form)
	if format == "csv" {
		return writeKeyboardCSV(e.stdout, rows)
	}
	w := e.stderr
	if format == "table" {
		w = e.stdout
	}
	fmt.Fprintf(w, "%s · every octave alike; MIDI key 60 is C4\n", kb.tu)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "key\tplays\tHz\tfrom equal\tfrom A440 equal\tMTS word\t")
	for _, r := range rows {
		word := "-"
		if r.wordInPlayed {
			word = wordHex(r.word)
		}
		fmt.Fprintf(tw, "%d\t%s\t%.3f\t%s\t%s\t%s\t\n", r.key, r.note, r.hz,
			target.FormatCents(r.fromEqual, 2), target.FormatCents(r.fromA440, 2), word)
	}
	return tw.Flush()
}

func writeKeyboardCSV(w io.Writer, rows []keyRow) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"key", "note", "hz", "cents_from_equal", "cents_from_a440_equal", "mts_word"})
	for _, r := range rows {
		word := ""
		if r.wordInPlayed {
			word = wordHex(r.word)
		}
		cw.Write([]string{strconv.Itoa(r.key), r.note.String(), target.Decimal(r.hz, 4),
			target.Decimal(r.fromEqual, 3), target.Decimal(r.fromA440, 3), word})
	}
	cw.Flush()
	return cw.Error()
}

func wordHex(w mts.Word) string {
	b := w.Bytes()
	return fmt.Sprintf("%02X %02X %02X", b[0], b[1], b[2])
}
