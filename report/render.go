package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"fifthline/target"
)

// Title describes a group in one line: "Ann · G major · 1/4-comma meantone ·
// A4 = 415 Hz", then any transposition and declared chord; a player who
// gave no name (practising alone, without --player) is left out rather
// than named as missing.
func (g Group) Title() string {
	t := fmt.Sprintf("%s · %s · A4 = %s Hz", g.Key, g.Name, strconv.FormatFloat(g.A4, 'f', -1, 64))
	if g.Anchor == target.AnchorTonic.String() {
		t += " (tonic anchored)" // as the tuning line says it (target.Tuning.String)
	}
	if who := g.Who(); who != "" {
		t = who + " · " + t
	}
	if g.Transpose != "" {
		t += " · written for an instrument in " + g.Transpose
	}
	if g.Chord != "" {
		t += " · tuned to the chord " + g.Chord
	}
	return t
}

// Held counts the group's notes in words: "12 held notes", "12 held notes
// (2 on the other spelling)".
func (g Group) Held() string {
	s := plural(g.All.Count+g.All.Other.Count, "held note")
	if n := g.All.Other.Count; n > 0 {
		s += fmt.Sprintf(" (%d on the other spelling)", n)
	}
	return s
}

// Summary is the line under a group's title: its notes, its rehearsals if
// several, and its trend if known.
func (g Group) Summary() string {
	s := g.Held()
	n := len(g.Dates)
	if n > 1 {
		s += fmt.Sprintf(" in %d rehearsals, %s to %s", n, g.Dates[0], g.Dates[n-1])
	}
	switch {
	case g.All.Trend.Known && n > 1:
		s += "; within a rehearsal, " + g.All.Trend.Words
	case g.All.Trend.Known:
		s += "; " + g.All.Trend.Words
	}
	return s
}

// Legend says once what the table's words and columns mean.
func Legend() []string {
	return []string{
		"scatter: how far the notes lie from their mean (between notes); spread: how far the pitch moved within a note;",
		"  both are root-mean-square deviations. vibrato: full width, lowest to highest pitch, and in how many notes.",
		"Notes that sat on the other spelling are counted apart, with their mean against that spelling, and left out of the rest.",
		"trend: the least-squares line through the notes' cents over a rehearsal (over several, their common slope, so that",
		"  a better rehearsal is not taken for drift; --by rehearsal shows progress); — where " + TooFewForATrend + ".",
	}
}

// WriteText writes one table per group, for people, and the legend once.
func WriteText(out io.Writer, groups []Group, opt Options) error {
	w := &trimmed{w: out}
	tol := strconv.FormatFloat(opt.Tolerance, 'f', -1, 64)
	for _, g := range groups {
		fmt.Fprintf(w, "%s\n%s\n", g.Title(), g.Summary())
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		head := []string{"note", "notes", "mean ¢", "median ¢", "scatter ¢", "spread ¢", "vibrato ¢", "within ±" + tol + " ¢",
			"tendency", "on the other spelling", "trend"}
		if opt.ByRehearsal {
			head = append(head[:1], append([]string{"rehearsal"}, head[1:]...)...)
		}
		fmt.Fprintln(tw, strings.Join(head, "\t"))
		blank := strings.Repeat("\t", len(head)-1)
		for _, s := range g.Notes {
			textRow(tw, s, opt)
		}
		fmt.Fprintln(tw, blank)
		fmt.Fprintln(tw, "all octaves"+blank)
		for _, s := range g.Classes {
			textRow(tw, s, opt)
		}
		fmt.Fprintln(tw, blank)
		for _, s := range g.Rehearsals {
			textRow(tw, s, opt)
		}
		if !opt.ByRehearsal {
			textRow(tw, g.All, opt)
		}
		if err := tw.Flush(); err != nil {
			return err
		}
		if err := writeRoles(w, g); err != nil {
			return err
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintln(w, strings.Join(Legend(), "\n"))
	return w.err
}

// trimmed drops the spaces tabwriter leaves at the ends of lines, keeping
// the first write error.
type trimmed struct {
	w       io.Writer
	pending []byte // the current line, up to its end
	err     error
}

func (t *trimmed) Write(b []byte) (int, error) {
	for _, c := range b {
		t.pending = append(t.pending, c)
		if c == '\n' {
			line := append(bytes.TrimRight(t.pending[:len(t.pending)-1], " "), '\n')
			if _, err := t.w.Write(line); err != nil && t.err == nil {
				t.err = err
			}
			t.pending = t.pending[:0]
		}
	}
	return len(b), nil
}

func textRow(w io.Writer, s Stats, opt Options) {
	cells := []string{s.Label, strconv.Itoa(s.Count), "—", "—", "—", "—", "—", "—", "—", "—", "—"}
	if s.Count > 0 {
		cells[2], cells[3], cells[5] = target.Signed(s.Mean, 1), target.Signed(s.Median, 1), target.Decimal(s.Spread, 1)
		if s.Count > 1 { // one note has no scatter
			cells[4] = target.Decimal(s.Scatter, 1)
		}
		cells[7] = fmt.Sprintf("%d of %d", s.Within, s.Count)
		cells[8] = s.Tendency
	}
	if s.VibratoNotes > 0 {
		cells[6] = fmt.Sprintf("%.0f in %d", s.Vibrato, s.VibratoNotes)
	}
	if s.Other.Count > 0 {
		cells[9] = fmt.Sprintf("%d on %s (%s ¢)", s.Other.Count, s.Other.Label, target.Signed(s.Other.Mean, 1))
	}
	if s.Trend.Known {
		cells[10] = s.Trend.Words
	}
	if opt.ByRehearsal {
		cells = append(cells[:1], append([]string{s.Rehearsal}, cells[1:]...)...)
	}
	fmt.Fprintln(w, strings.Join(cells, "\t"))
}

// csvHeader is the CSV report's header; level is note, pitch_class (all
// octaves together) or all. With ByRehearsal a rehearsal column follows
// chord.
var csvHeader = []string{"player", "key", "temperament", "a4", "transpose", "chord", "level", "note", "fifths", "count",
	"mean_cents", "median_cents", "scatter_cents", "spread_cents", "vibrato_cents", "vibrato_notes", "within",
	"share_within", "tendency", "on_other_spelling", "other_spelling", "other_spelling_mean_cents",
	"slope_cents_per_min", "drift_cents", "span_min", "trend", "voice", "chord_quality", "member", "just_ratio", "anchor"}

// CSVHeader is the CSV report's header for these options.
func CSVHeader(opt Options) []string {
	if !opt.ByRehearsal {
		return csvHeader
	}
	return append(append(append([]string(nil), csvHeader[:6]...), "rehearsal"), csvHeader[6:]...)
}

// WriteCSV writes one row per note, pitch class and group (with
// ByRehearsal, per rehearsal of each), for other tools. Values that do not
// exist — the mean of no notes, a trend of too few — are empty.
func WriteCSV(w io.Writer, groups []Group, opt Options) error {
	cw := csv.NewWriter(w)
	cw.Write(CSVHeader(opt))
	for _, g := range groups {
		row := func(level string, s Stats) {
			r := []string{g.Player, g.Key, g.Temperament, strconv.FormatFloat(g.A4, 'f', -1, 64), g.Transpose, g.Chord}
			if opt.ByRehearsal {
				r = append(r, s.Rehearsal)
			}
			r = append(r, level, s.Label, strconv.Itoa(s.Fifths), strconv.Itoa(s.Count))
			r = append(r, ifAny(s.Count, target.Decimal(s.Mean, 2), target.Decimal(s.Median, 2))...)
			r = append(r, ifAny(s.Count-1, target.Decimal(s.Scatter, 2))...)
			r = append(r, ifAny(s.Count, target.Decimal(s.Spread, 2))...)
			r = append(r, ifAny(s.VibratoNotes, target.Decimal(s.Vibrato, 1))...)
			r = append(r, strconv.Itoa(s.VibratoNotes), strconv.Itoa(s.Within))
			r = append(r, ifAny(s.Count, target.Decimal(s.Share, 3), s.Tendency)...)
			r = append(r, strconv.Itoa(s.Other.Count), s.Other.Label)
			r = append(r, ifAny(s.Other.Count, target.Decimal(s.Other.Mean, 2))...)
			known := 0
			if s.Trend.Known {
				known = 1
			}
			r = append(r, ifAny(known, target.Decimal(s.Trend.SlopePerMinute, 4), target.Decimal(s.Trend.Drift, 2))...)
			r = append(r, target.Decimal(s.Trend.Minutes, 2), s.Trend.Words, g.Voice, "", "", "", g.Anchor)
			cw.Write(r)
		}
		for _, s := range g.Notes {
			row("note", s)
		}
		for _, s := range g.Classes {
			row("pitch_class", s)
		}
		for _, s := range g.Rehearsals {
			row("all", s)
		}
		if !opt.ByRehearsal {
			row("all", g.All)
		}
		for _, r := range g.Roles {
			cw.Write(roleRecord(g, r, opt))
		}
	}
	cw.Flush()
	return cw.Error()
}

// ifAny is the values when n > 0, else as many empty strings.
func ifAny(n int, values ...string) []string {
	if n > 0 {
		return values
	}
	return make([]string, len(values))
}

// WriteJSON writes the groups with the tolerance they were judged by, and
// the group's drift over each take that has one (GroupDrifts).
func WriteJSON(w io.Writer, groups []Group, opt Options, drifts ...GroupDrift) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(struct {
		Tolerance   float64      `json:"tolerance_cents"`
		ByRehearsal bool         `json:"by_rehearsal"`
		Groups      []Group      `json:"groups"`
		GroupDrift  []GroupDrift `json:"group_drift,omitempty"`
	}{opt.Tolerance, opt.ByRehearsal, groups, drifts})
}

// plural counts things in words: "1 note", "4 notes".
func plural(n int, thing string) string {
	if n == 1 {
		return "1 " + thing
	}
	return strconv.Itoa(n) + " " + thing + "s"
}
