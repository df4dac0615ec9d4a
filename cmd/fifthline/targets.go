package main

import (
	"encoding/csv"
	"fmt"
	"strconv"
	"text/tabwriter"

	"fifthline/target"
)

func runTargets(e *env, args []string) error {
	fs := newFlags("targets")
	mf := addMusicalFlags(fs)
	format := choiceFlag(fs, "format", "what to print", "table", "csv")
	octave := fs.Int("octave", 4, "octave (scientific pitch notation) of the listed notes")
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("targets takes no file arguments (got %q)", pos[0])
	}
	if *octave < 0 || *octave > 8 {
		return usagef("--octave %d is outside 0 to 8", *octave)
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	mf.say(e.stderr, tu)
	rows := targetRows(tu, *octave)
	if *format == "csv" {
		return writeTargetsCSV(e, tu, rows)
	}
	return writeTargetsTable(e, tu, mf.whence(), rows)
}

type targetRow struct {
	note, alt  target.Note
	hasAlt     bool
	hz, equal  float64
	fifths     int
	altGap     float64 // alt's target minus note's, cents
	written    target.Note
	samePitch  bool
	chordRatio string
}

func targetRows(tu target.Tuning, octave int) []targetRow {
	var rows []targetRow
	for _, n := range tu.Window() {
		n.Octave = octave
		r := tu.Classify(tu.Target(n))
		rows = append(rows, targetRow{
			note: n, alt: r.Alt, hasAlt: r.HasAlt, hz: tu.Target(n), equal: tu.CentsFromEqual(n), fifths: n.Fifths(),
			altGap: -r.AltDeviation, written: r.Written, samePitch: r.SamePitch, chordRatio: chordRatio(tu, n),
		})
	}
	return rows
}

func chordRatio(tu target.Tuning, n target.Note) string {
	if tu.Chord == nil {
		return ""
	}
	for _, m := range tu.Chord.Members() {
		if m.Note.Name() == n.Name() {
			return m.Fraction
		}
	}
	return ""
}

func writeTargetsCSV(e *env, tu target.Tuning, rows []targetRow) error {
	w := csv.NewWriter(e.stdout)
	header := []string{"note", "hz", "cents_from_equal", "fifths", "alt_note", "alt_cents"}
	if !tu.Transpose.IsConcert() {
		header = append(header, "written")
	}
	if tu.Chord != nil {
		header = append(header, "chord_ratio")
	}
	w.Write(header)
	for _, r := range rows {
		rec := []string{r.note.String(), target.Decimal(r.hz, 4), target.Decimal(r.equal, 3), strconv.Itoa(r.fifths), "", ""}
		if r.hasAlt {
			rec[4], rec[5] = r.alt.String(), target.Decimal(r.altGap, 3)
		}
		if !tu.Transpose.IsConcert() {
			rec = append(rec, r.written.String())
		}
		if tu.Chord != nil {
			rec = append(rec, r.chordRatio)
		}
		w.Write(rec)
	}
	w.Flush()
	return w.Error()
}

func writeTargetsTable(e *env, tu target.Tuning, whence string, rows []targetRow) error {
	fmt.Fprintln(e.stdout, tableTitle(tu.String(), whence))
	shared := tu.SharesPitches()
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	head := "note\tHz\tfrom equal\tfifths\tother spelling\t"
	if !tu.Transpose.IsConcert() {
		head += "written\t"
	}
	if tu.Chord != nil {
		head += "chord\t"
	}
	fmt.Fprintln(tw, head)
	for _, r := range rows {
		other := r.alt.String() + " " + target.FormatCents(r.altGap, 1)
		switch {
		case !r.hasAlt:
			other = "none"
		case r.samePitch && shared:
			other = r.alt.String() // the first line says so, once
		case r.samePitch:
			other = r.alt.String() + " same"
		}
		line := fmt.Sprintf("%s\t%.3f\t%s\t%+d\t%s\t", r.note, r.hz, target.FormatCents(r.equal, 2), r.fifths, other)
		if !tu.Transpose.IsConcert() {
			line += r.written.String() + "\t"
		}
		if tu.Chord != nil {
			line += r.chordRatio + "\t"
		}
		fmt.Fprintln(tw, line)
	}
	return tw.Flush()
}
