package report

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"
)

// Title describes a group in one line: "Ann · G major · 1/4-comma meantone ·
// A4 = 415 Hz".
func (g Group) Title() string {
	player := g.Player
	if player == "" {
		player = "(no player named)"
	}
	var a4 []string
	for _, f := range g.A4 {
		a4 = append(a4, strconv.FormatFloat(f, 'f', -1, 64))
	}
	t := fmt.Sprintf("%s · %s · %s · A4 = %s Hz", player, g.Key, g.Name, strings.Join(a4, ", "))
	if g.Transpose != "" {
		t += " · written for " + g.Transpose + " instrument"
	}
	return t
}

// WriteText writes one table per group, for people.
func WriteText(w io.Writer, groups []Group, opt Options) error {
	tol := strconv.FormatFloat(opt.Tolerance, 'f', -1, 64)
	for i, g := range groups {
		if i > 0 {
			fmt.Fprintln(w)
		}
		fmt.Fprintf(w, "%s — %s, %s\n", g.Title(), plural(g.All.Count, "note"), g.All.Trend.Words)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintf(tw, "note\tcount\tmean ¢\tmedian ¢\tspread ¢\twithin ±%s ¢\ttendency\tnearer other spelling\ttrend\n", tol)
		for _, s := range g.Notes {
			textRow(tw, s)
		}
		fmt.Fprintln(tw, "\t\t\t\t\t\t\t\t")
		for _, s := range g.Classes {
			textRow(tw, s)
		}
		textRow(tw, g.All)
		if err := tw.Flush(); err != nil {
			return err
		}
	}
	return nil
}

func textRow(w io.Writer, s Stats) {
	alt := "—"
	if s.NearerAlt > 0 {
		alt = fmt.Sprintf("%d× on %s", s.NearerAlt, s.AltLabel)
	}
	fmt.Fprintf(w, "%s\t%d\t%s\t%s\t%s\t%.0f%%\t%s\t%s\t%s\n", s.Label, s.Count, signed(s.Mean), signed(s.Median),
		fixed(s.Spread, 1), 100*s.Share, s.Tendency, alt, s.Trend.Words)
}

// csvHeader is the CSV report's header; level is note, pitch_class or all.
var csvHeader = []string{"player", "key", "temperament", "transpose", "level", "note", "fifths", "count", "mean_cents",
	"median_cents", "spread_cents", "within", "share_within", "tendency", "nearer_alt", "alt_note",
	"slope_cents_per_min", "drift_cents", "span_min", "trend"}

// WriteCSV writes one row per note, pitch class and group, for other tools.
func WriteCSV(w io.Writer, groups []Group) error {
	cw := csv.NewWriter(w)
	cw.Write(csvHeader)
	for _, g := range groups {
		row := func(level string, s Stats) {
			cw.Write([]string{g.Player, g.Key, g.Temperament, g.Transpose, level, s.Label, strconv.Itoa(s.Fifths),
				strconv.Itoa(s.Count), fixed(s.Mean, 2), fixed(s.Median, 2), fixed(s.Spread, 2),
				strconv.Itoa(s.Within), fixed(s.Share, 3), s.Tendency, strconv.Itoa(s.NearerAlt), s.AltLabel,
				fixed(s.Trend.SlopePerMinute, 4), fixed(s.Trend.Drift, 2), fixed(s.Trend.Minutes, 2), s.Trend.Words})
		}
		for _, s := range g.Notes {
			row("note", s)
		}
		for _, s := range g.Classes {
			row("pitch_class", s)
		}
		row("all", g.All)
	}
	cw.Flush()
	return cw.Error()
}

// WriteJSON writes the groups with the tolerance they were judged by.
func WriteJSON(w io.Writer, groups []Group, opt Options) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(struct {
		Tolerance float64 `json:"tolerance_cents"`
		Groups    []Group `json:"groups"`
	}{opt.Tolerance, groups})
}

// plural counts things in words: "1 note", "4 notes".
func plural(n int, thing string) string {
	if n == 1 {
		return "1 " + thing
	}
	return strconv.Itoa(n) + " " + thing + "s"
}

// fixed formats x with the given decimals, never as "-0.0".
func fixed(x float64, decimals int) string {
	s := strconv.FormatFloat(x, 'f', decimals, 64)
	if strings.Trim(s, "-0.") == "" {
		return strings.TrimPrefix(s, "-")
	}
	return s
}

// signed formats cents with a sign: "+6.1", "-3.0", "0.0".
func signed(x float64) string {
	s := fixed(x, 1)
	if s != "0.0" && !strings.HasPrefix(s, "-") {
		return "+" + s
	}
	return s
}
