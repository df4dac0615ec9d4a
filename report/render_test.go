package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"errors"
	"image"
	"image/png"
	"io"
	"regexp"
	"strings"
	"testing"
	"time"

	"fifthline/journal"
)

func sampleGroups() ([]Group, Options) {
	opt := Options{Tolerance: 5}
	return Summarize(sampleEntries(), opt), opt
}

func TestTextTable(t *testing.T) {
	groups, opt := sampleGroups()
	var b bytes.Buffer
	if err := WriteText(&b, groups, opt); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz\n6 held notes (1 on the other spelling)\n",
		"within ±5 ¢",
		"\nall octaves\n",
		"\nG major · 1/4-comma meantone · A4 = 415 Hz\n1 held note\n", // Ben's C4 with no player named: no name, no placeholder
		"vibrato: full width",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
	// Columns: note, notes, mean, median, scatter, spread, vibrato, within,
	// tendency, other spelling, trend; values as in TestSummarize.
	for _, want := range []string{
		"F#4|3|+6.0|+6.0|1.6|2.0|—|1 of 3|sits 6 ¢ sharp|—|—",
		"F#5|1|+2.0|+2.0|—|2.0|—|1 of 1|in tune|1 on Gb5 (-0.1 ¢)|—", // one note has no scatter
		"all|5|+3.4|+4.0|3.8|2.0|—|3 of 5|in tune|1 on Gb (-0.1 ¢)|—",
	} {
		if got := cells(out, want[:strings.Index(want, "|")]); got != want {
			t.Errorf("row %q, want %q", got, want)
		}
	}
	// Too few notes for a trend is said once, in the legend, not per row.
	if n := strings.Count(out, "a trend needs"); n != 1 {
		t.Errorf("'a trend needs' said %d times:\n%s", n, out)
	}
	for _, line := range strings.Split(out, "\n") {
		if strings.HasSuffix(line, " ") {
			t.Errorf("line ends in spaces: %q", line)
		}
	}
}

// cells is the first table row starting with label, its cells joined by |.
func cells(table, label string) string {
	for _, line := range strings.Split(table, "\n") {
		if strings.HasPrefix(line, label+"  ") { // cells are two spaces or more apart
			return strings.Join(regexp.MustCompile(`\s{2,}`).Split(line, -1), "|")
		}
	}
	return ""
}

func TestCSV(t *testing.T) {
	groups, opt := sampleGroups()
	var b bytes.Buffer
	if err := WriteCSV(&b, groups, opt); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(recs[0], ",") != strings.Join(csvHeader, ",") {
		t.Errorf("header %v", recs[0])
	}
	// F♯4 as in TestSummarize; no vibrato, no trend: empty, not 0.
	want := []string{
		"Ann,G major,meantone:1/4,415,,,note,F#4,6,3,6.00,6.00,1.63,2.00,,0,1,0.333,sits 6 ¢ sharp,0,,,,,20.00,,,,,,", // voice, chord_quality, member, just_ratio: empty for a player's notes; anchor: none in these entries
		"Ann,G major,meantone:1/4,415,,,note,F#5,6,1,2.00,2.00,,2.00,,0,1,1.000,in tune,1,Gb5,-0.06,,,0.00,,,,,,",
	}
	for _, w := range want {
		found := false
		for _, r := range recs {
			found = found || strings.Join(r, ",") == w
		}
		if !found {
			t.Errorf("no row %q in %v", w, recs)
		}
	}
	// Per group: its notes, its pitch classes, then one "all" row.
	if n := len(recs) - 1; n != 3+2+1+1+1+1 {
		t.Errorf("%d rows", n)
	}
}

func TestCSVByRehearsal(t *testing.T) {
	opt := Options{Tolerance: 5, ByRehearsal: true}
	es := sampleEntries()
	es[0].Time = es[0].Time.AddDate(0, 0, 7) // one F♯4 a week later
	groups := Summarize(es, opt)
	if got, want := groups[0].Summary(), "6 held notes (1 on the other spelling) in 2 rehearsals, 2026-03-14 to 2026-03-21"; got != want {
		t.Errorf("summary %q, want %q", got, want)
	}
	var b bytes.Buffer
	if err := WriteCSV(&b, groups, opt); err != nil {
		t.Fatal(err)
	}
	recs, _ := csv.NewReader(&b).ReadAll()
	if got := strings.Join(recs[0][:8], ","); got != "player,key,temperament,a4,transpose,chord,rehearsal,level" {
		t.Errorf("header starts %q", got)
	}
	var f4 []string
	for _, r := range recs {
		if r[7] == "note" && r[8] == "F#4" {
			f4 = append(f4, r[6]+" "+r[10]+" "+r[11])
		}
	}
	// 14 March: 6 and 8 ¢ → mean 7; 21 March: 4 ¢ (hand-computed).
	if join(f4) != "2026-03-14 2 7.00 2026-03-21 1 4.00" {
		t.Errorf("F#4 rows %q", f4)
	}
}

func TestJSON(t *testing.T) {
	groups, opt := sampleGroups()
	var b bytes.Buffer
	if err := WriteJSON(&b, groups, opt); err != nil {
		t.Fatal(err)
	}
	var got struct {
		Tolerance float64 `json:"tolerance_cents"`
		Groups    []Group `json:"groups"`
	}
	if err := json.Unmarshal(b.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if f5 := got.Groups[0].Notes[2]; got.Tolerance != 5 || len(got.Groups) != 2 || f5.Label != "F#5" || f5.Other.Count != 1 || f5.Mean != 2 {
		t.Errorf("%+v", got)
	}
}

func TestPlotPNGHasARowPerGroup(t *testing.T) {
	groups, opt := sampleGroups()
	// 12 in wide at 150 dpi; 0.8 in of title and 3.6 in per row.
	for _, c := range []struct {
		groups []Group
		height int
	}{{groups[:1], 660}, {groups, 1200}} {
		var b bytes.Buffer
		if err := Plot(&b, "png", sampleEntries(), c.groups, opt); err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(&b)
		if err != nil {
			t.Fatal(err)
		}
		if got := img.Bounds(); got != image.Rect(0, 0, 1800, c.height) {
			t.Errorf("image %v, want 1800×%d", got, c.height)
		}
	}
}

// The title counts players and tunings, each row names its own, and the
// notes on the other spelling are counted under their note.
func TestPlotSVGSaysWhatItShows(t *testing.T) {
	es := sampleEntries()
	chord := entry("Ann", "D4", 30, 1, 1, "C##4")
	chord.Chord = "D major"
	es = append(es, chord)
	opt := Options{Tolerance: 5}
	var b bytes.Buffer
	if err := Plot(&b, "svg", es, Summarize(es, opt), opt); err != nil {
		t.Fatal(err)
	}
	svg := b.String()
	dec := xml.NewDecoder(strings.NewReader(svg))
	root := ""
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("not XML: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok && root == "" {
			root = se.Name.Local
		}
	}
	if root != "svg" {
		t.Errorf("root element %q", root)
	}
	for _, want := range []string{
		"Rehearsal report: 2 players, 2 tunings",
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz — 6 held notes (1 on the other spelling)",
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz · tuned to the chord D major — 1 held note",
		"G major · 1/4-comma meantone · A4 = 415 Hz — 1 held note",
		"1 more on Gb5",
	} {
		if !strings.Contains(svg, xmlText(want)) {
			t.Errorf("svg lacks %q", want)
		}
	}
}

func xmlText(s string) string {
	var b bytes.Buffer
	xml.EscapeText(&b, []byte(s))
	return b.String()
}

// Cents axes are labelled in whole cents.
func TestWholeCentTicks(t *testing.T) {
	cases := []struct {
		lo, hi float64
		want   string
	}{
		{-8.3, 8.3, "−8 −6 −4 −2 0 +2 +4 +6 +8"},
		{-9.6, 47.2, "0 +10 +20 +30 +40"},
		{-2.2, 3.9, "−2 −1 0 +1 +2 +3"},
	}
	for _, c := range cases {
		var labels []string
		for _, tk := range (wholeCents{}).Ticks(c.lo, c.hi) {
			labels = append(labels, tk.Label)
		}
		if join(labels) != c.want {
			t.Errorf("%v…%v: %q, want %q", c.lo, c.hi, join(labels), c.want)
		}
	}
}

func TestPlotRefusesOtherFormats(t *testing.T) {
	groups, opt := sampleGroups()
	if err := Plot(io.Discard, "gif", sampleEntries(), groups, opt); err == nil {
		t.Error("drew a gif")
	}
}

// One microphone's voices are voices, not players, in the plot's title:
// "2 voices" for a duet read with --voices; a player named with --player
// on a voice's rows makes it a player's; a journal holding both players'
// rows and voices' rows counts each apart (8 players for 5 players and 3
// voices would misread the rehearsal).
func TestPlotTitleCountsVoicesAsVoices(t *testing.T) {
	es := []journal.Entry{{Time: time.Date(2026, 11, 24, 19, 30, 0, 0, time.UTC)}}
	voices := []Group{{Voice: "1", Key: "C major"}, {Voice: "2", Key: "C major"}}
	if got := plotTitle(es, voices, Options{Tolerance: 5})[0]; got != "Rehearsal report: 2 voices, 1 tuning (a row for each voice in each tuning)" {
		t.Errorf("voices: %q", got)
	}
	named := []Group{{Player: "vc", Voice: "1", Key: "C major"}, {Player: "vc", Voice: "2", Key: "C major"}}
	if got := plotTitle(es, named, Options{Tolerance: 5})[0]; got != "Rehearsal report: 2 players, 1 tuning (a row for each player in each tuning)" {
		t.Errorf("voices of a named player: %q", got)
	}
	both := []Group{{Player: "vc", Key: "C major"}, {Player: "vla", Key: "C major"}, {Voice: "1", Key: "C major"}}
	if got := plotTitle(es, both, Options{Tolerance: 5})[0]; got != "Rehearsal report: 2 players and 1 voice, 1 tuning (a row for each player or voice in each tuning)" {
		t.Errorf("players and voices: %q", got)
	}
}

// The notes panel calls its notes written pitch only where an instrument
// transposes (--transpose), since otherwise written and sounding pitch are
// one; a B♭ clarinet's written E4 sounds D4 (common practice).
func TestPlotSaysWrittenPitchOnlyForATransposingInstrument(t *testing.T) {
	clarinet := entry("Cl", "E4", 3, 1, 1, "Fb4")
	clarinet.Transpose = "Bb"
	for _, c := range []struct {
		es      []journal.Entry
		written bool
	}{{sampleEntries(), false}, {append(sampleEntries(), clarinet), true}} {
		opt := Options{Tolerance: 5}
		var b bytes.Buffer
		if err := Plot(&b, "svg", c.es, Summarize(c.es, opt), opt); err != nil {
			t.Fatal(err)
		}
		if got := strings.Contains(b.String(), xmlText("(written pitch)")); got != c.written {
			t.Errorf("a transposing instrument %v: says written pitch %v", c.written, got)
		}
	}
}
