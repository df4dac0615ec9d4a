package report

import (
	"math"
	"testing"
	"time"

	"fifthline/journal"
	"fifthline/target"
)

func near(a, b float64) bool { return math.Abs(a-b) < 1e-9 }

func TestMeanDeviationMedian(t *testing.T) {
	cases := []struct {
		name                    string
		xs                      []float64
		mean, deviation, median float64
	}{
		// The textbook set 2,4,4,4,5,5,7,9: mean 5, squared deviations sum to
		// 32, over n = 8 gives 4, so the root-mean-square deviation is 2;
		// median (4+5)/2 (hand-computed).
		{"textbook set", []float64{2, 4, 4, 4, 5, 5, 7, 9}, 5, 2, 4.5},
		{"one note has no scatter", []float64{-3}, -3, 0, -3},
		// 9, −1, 3: mean 11/3; deviations 16/3, −14/3, −2/3; squares sum
		// 456/9, over n = 3 gives 152/9 (hand-computed).
		{"odd count: the middle value", []float64{9, -1, 3}, 11.0 / 3, math.Sqrt(152.0 / 9), 3},
		{"nothing", nil, 0, 0, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m, d := MeanDeviation(c.xs)
			if !near(m, c.mean) || !near(d, c.deviation) || !near(Median(c.xs), c.median) {
				t.Errorf("mean %v deviation %v median %v; want %v %v %v", m, d, Median(c.xs), c.mean, c.deviation, c.median)
			}
		})
	}
	// Spreads of 3 and 4 ¢ pool to √((9+16)/2) = 3.536 (hand-computed).
	if got := RMS([]float64{3, 4}); !near(got, math.Sqrt(12.5)) {
		t.Errorf("RMS %v", got)
	}
}

func TestSlope(t *testing.T) {
	if s, ok := Slope([]float64{0, 1, 2, 3}, []float64{1, 3, 5, 7}); !ok || !near(s, 2) {
		t.Errorf("y = 2x+1: slope %v %v, want 2", s, ok)
	}
	// Points (0,0) (1,1) (2,0) (3,1): x̄ = 1.5, ȳ = 0.5, Sxy = 1, Sxx = 5,
	// slope 0.2 (hand-computed).
	if s, _ := Slope([]float64{0, 1, 2, 3}, []float64{0, 1, 0, 1}); !near(s, 0.2) {
		t.Errorf("zigzag slope %v, want 0.2", s)
	}
	if _, ok := Slope([]float64{5, 5}, []float64{1, 2}); ok {
		t.Error("slope at one instant should be unknown")
	}
}

// The tendency and the share within the tolerance are judged by the same
// tolerance, so the words never contradict the count beside them; they say
// sharp and flat (common practice), as the meter and the drift lines do.
func TestTendencyAgreesWithTheShareWithin(t *testing.T) {
	cases := []struct {
		mean, share float64
		count       int
		want        string
	}{
		{4, 1, 3, "in tune"}, // every note within ±5 ¢: in tune, though the mean is 4 ¢ up
		{-5, 0.6, 5, "in tune"},
		{0.5, 0.4, 5, "scattered about the target"},
		{1, 0.5, 2, "scattered about the target"}, // half is not most
		{-4.2, 0.2, 5, "scattered, 4 ¢ flat on average"},
		{6.2, 0.2, 5, "sits 6 ¢ sharp"},
		{-7.5, 0, 2, "sits 8 ¢ flat"},
		{9.2, 0.8, 5, "mostly in tune, a few far sharp"}, // 3, 3, 3, 3, 34: one far note pulls the mean
		{0, 0, 0, ""},
	}
	for _, c := range cases {
		if got := Tendency(c.mean, c.share, c.count, 5); got != c.want {
			t.Errorf("mean %v share %v: %q, want %q", c.mean, c.share, got, c.want)
		}
	}
}

func TestWords(t *testing.T) {
	cases := []struct{ got, want string }{
		{DriftWords(-4.2, 40, 5), "drifted 4 ¢ flat over 40 min"},
		{DriftWords(7, 90, 5), "drifted 7 ¢ sharp over 1.5 h"},
		{DriftWords(1, 0.5, 5), "steady over 30 s"},
		{TooFewForATrend, "a trend needs 6 notes or more, over 1 min or more"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("%q, want %q", c.got, c.want)
		}
	}
}

// at is 19:00 on 14 March 2026 in Central European Time, plus minutes.
func at(minute float64) time.Time {
	return time.Date(2026, 3, 14, 19, 0, 0, 0, time.FixedZone("CET", 3600)).Add(time.Duration(minute * float64(time.Minute)))
}

// entry is a journal line: a note at minute m with given cents and cents
// against the other spelling, from a journal older than on_other_spelling,
// so whether it sat on that spelling is decided by the contract's rule.
func entry(player, note string, minute, cents, altCents float64, alt string) journal.Entry {
	n, _ := target.ParseNote(note)
	a, _ := target.ParseNote(alt)
	return journal.Entry{
		Time: at(minute), Player: player, Key: "G major", Temperament: "meantone:1/4", A4: 415,
		Note: n, Alt: a, HasAlt: true, Cents: cents, AltCents: altCents,
		Spread: 2,
	}
}

// In ¼-comma meantone G♭ lies 41.06 ¢ above F♯ (the lesser diesis 128/125,
// handbook value): a note c ¢ from F♯ is c − 41.06 from G♭.
const diesis = 41.06

// sampleEntries: Ann's three F♯4s, a B♭3, an F♯5 at +2 ¢ and one played as
// G♭5; Ben's one C4, with no player named.
func sampleEntries() []journal.Entry {
	return []journal.Entry{
		entry("Ann", "F#4", 0, 4, 4-diesis, "Gb4"),
		entry("Ann", "F#4", 10, 6, 6-diesis, "Gb4"),
		entry("Ann", "F#4", 20, 8, 8-diesis, "Gb4"),
		entry("Ann", "Bb3", 5, -3, diesis-3, "A#3"),
		entry("Ann", "F#5", 12, 2, 2-diesis, "Gb5"),
		entry("Ann", "F#5", 15, 41, 41-diesis, "Gb5"), // sat on G♭5, 0.06 ¢ below it
		entry("", "C4", 0, 1, 1, "B#3"),
	}
}

func TestSummarize(t *testing.T) {
	groups := Summarize(sampleEntries(), Options{Tolerance: 5})
	if len(groups) != 2 || groups[0].Player != "Ann" || groups[1].Player != "" {
		t.Fatalf("groups %+v", groups)
	}
	ann := groups[0]
	if ann.Name != "1/4-comma meantone" || ann.A4 != 415 {
		t.Errorf("tuning %q %v", ann.Name, ann.A4)
	}
	var order []string
	for _, s := range ann.Notes {
		order = append(order, s.Label)
	}
	// Along the line of fifths B♭ (−2) before F♯ (+6); F♯4 before F♯5.
	if got := join(order); got != "Bb3 F#4 F#5" {
		t.Errorf("note order %q", got)
	}
	// F♯4 at 4, 6, 8 ¢: mean 6, median 6, scatter √((4+0+4)/3) = 1.633,
	// one of three within ±5 ¢, most beyond: sits 6 ¢ sharp; three notes are
	// too few for a trend (hand-computed).
	fs := ann.Notes[1]
	if fs.Count != 3 || !near(fs.Mean, 6) || !near(fs.Median, 6) || !near(fs.Scatter, math.Sqrt(8.0/3)) || fs.Within != 1 ||
		!near(fs.Share, 1.0/3) || fs.Tendency != "sits 6 ¢ sharp" || fs.Other.Count != 0 || fs.Trend.Known || fs.Trend.Words != "" ||
		!near(fs.Spread, 2) {
		t.Errorf("F#4 %+v", fs)
	}
	// The F♯5 at +2 ¢ stays +2 ¢: the one played as G♭5 is counted apart,
	// with its own −0.06 ¢ against G♭5 (not averaged into "+21.5 ¢").
	if f5 := ann.Notes[2]; f5.Count != 1 || !near(f5.Mean, 2) || f5.Tendency != "in tune" ||
		f5.Other.Count != 1 || f5.Other.Label != "Gb5" || math.Abs(f5.Other.Mean+0.06) > 1e-9 {
		t.Errorf("F#5 %+v", f5)
	}
	// All octaves: F♯ gathers F♯4 and F♯5 on their spelling: 4, 6, 8, 2 →
	// mean 5, one on G♭.
	if c := ann.Classes[1]; len(ann.Classes) != 2 || c.Label != "F#" || c.Count != 4 || !near(c.Mean, 5) ||
		c.Other.Label != "Gb" || c.Other.Count != 1 {
		t.Errorf("classes %+v", ann.Classes)
	}
	// All: 4+6+8−3+2 = 17 over 5, mean 3.4; within ±5: 4, −3, 2.
	if all := ann.All; all.Count != 5 || !near(all.Mean, 3.4) || all.Within != 3 || all.Label != "all" || all.Other.Count != 1 {
		t.Errorf("all %+v", all)
	}
	if other := groups[1]; other.All.Tendency != "in tune" || other.All.Trend.Known {
		t.Errorf("second group %+v", other.All)
	}
}

// A trend needs TrendNotes notes; a one-off note far off makes none, and a
// rehearsal played higher than the last is not drift.
func TestTrendWithinRehearsals(t *testing.T) {
	var es []journal.Entry
	// Rehearsal 1 (14 March): 0, 1, 2 ¢ at minutes 0, 10, 20; rehearsal 2
	// (21 March): 10, 11, 12 ¢ at minutes 0, 10, 20. Within each the slope is
	// 0.1 ¢/min, so over the 20-minute rehearsals 2 ¢ sharp; a line through
	// all six against calendar time would call the week's 10 ¢ a drift
	// (hand-computed).
	for r, base := range []float64{0, 10} {
		for i := range 3 {
			e := entry("Ann", "A4", float64(r*7*24*60+i*10), base+float64(i), 0, "G##4")
			e.HasAlt = false // A4 is offered no other spelling
			es = append(es, e)
		}
	}
	tr := trendOf(es, 5)
	if !tr.Known || !near(tr.SlopePerMinute, 0.1) || !near(tr.Minutes, 20) || !near(tr.Drift, 2) || tr.Words != "steady over 20 min" {
		t.Errorf("trend %+v", tr)
	}
	if tr := trendOf(es[:5], 5); tr.Known || tr.Words != "" {
		t.Errorf("five notes: %+v", tr)
	}
}

// A chord declared with --chord tunes its members just: those readings are
// their own group, as are a transposing part's, another reference pitch's
// and another anchor's (the contract's --a4 row: with --anchor tonic, G4
// rather than A4 sits where equal temperament puts it, which moves every
// target of ¼-comma meantone in G major).
func TestChordTranspositionAndReferenceAreTheirOwnGroups(t *testing.T) {
	plain, chord, clarinet := entry("Ann", "D4", 0, 1, 1, "C##4"), entry("Ann", "D4", 1, 3, 3, "C##4"), entry("Ann", "E4", 2, 2, 2, "Fb4")
	chord.Chord = "D major"
	clarinet.Transpose = "Bb" // written E4 sounds D4 on a B♭ clarinet
	at440 := entry("Ann", "D4", 3, 0, 0, "C##4")
	at440.A4 = 440
	tonic := entry("Ann", "D4", 4, 0, 0, "C##4")
	plain.Anchor, tonic.Anchor = "a4", "tonic"
	groups := Summarize([]journal.Entry{plain, chord, clarinet, at440, tonic}, Options{Tolerance: 5})
	want := []string{
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz",
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz · tuned to the chord D major",
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz · written for an instrument in Bb",
		"Ann · G major · 1/4-comma meantone · A4 = 440 Hz",
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz (tonic anchored)",
	}
	if len(groups) != len(want) {
		t.Fatalf("%d groups", len(groups))
	}
	for i, g := range groups {
		if g.Title() != want[i] || g.All.Count != 1 {
			t.Errorf("group %d: %q, %d notes", i, g.Title(), g.All.Count)
		}
	}
}

// --by rehearsal: a row per note per rehearsal, the rehearsal being the date
// the note was played where it was played.
func TestByRehearsal(t *testing.T) {
	es := []journal.Entry{
		entry("Ann", "F#4", 0, 4, 4-diesis, "Gb4"),
		entry("Ann", "F#4", 10, 8, 8-diesis, "Gb4"),
		entry("Ann", "F#4", 7*24*60, 1, 1-diesis, "Gb4"),
		entry("Ann", "F#4", 7*24*60+5, 41.5, 0.44, "Gb4"), // on G♭4
		entry("Ann", "B3", 300, 0, 0, "Cb4"),              // 00:00 on 15 March in CET, 23:00 UTC on the 14th
	}
	groups := Summarize(es, Options{Tolerance: 5, ByRehearsal: true})
	if len(groups) != 1 {
		t.Fatalf("%d groups", len(groups))
	}
	g := groups[0]
	type row struct {
		label, rehearsal string
		count, other     int
		mean             float64
	}
	var got []row
	for _, s := range g.Notes {
		got = append(got, row{s.Label, s.Rehearsal, s.Count, s.Other.Count, s.Mean})
	}
	// B (+5 on the line of fifths) before F♯ (+6); F♯4 on 14 March: 4 and
	// 8 → 6; on 21 March: 1, and one counted apart (hand-computed).
	want := []row{{"B3", "2026-03-15", 1, 0, 0}, {"F#4", "2026-03-14", 2, 0, 6}, {"F#4", "2026-03-21", 1, 1, 1}}
	if len(got) != len(want) {
		t.Fatalf("rows %+v", got)
	}
	for i := range want {
		if got[i].label != want[i].label || got[i].rehearsal != want[i].rehearsal || got[i].count != want[i].count ||
			got[i].other != want[i].other || !near(got[i].mean, want[i].mean) {
			t.Errorf("row %d %+v, want %+v", i, got[i], want[i])
		}
	}
	var days []string
	for _, s := range g.Rehearsals {
		days = append(days, s.Rehearsal+":"+s.Label)
	}
	if join(days) != "2026-03-14:all 2026-03-15:all 2026-03-21:all" {
		t.Errorf("rehearsals %q", join(days))
	}
}

func join(ss []string) string {
	out := ""
	for i, s := range ss {
		if i > 0 {
			out += " "
		}
		out += s
	}
	return out
}

func TestFilter(t *testing.T) {
	// The third and fourth are --voices notes, one microphone's voice 2
	// (the report heads it "voice 2") and Ann's.
	es := []journal.Entry{entry("Ann", "C4", 0, 0, 0, "B#3"), entry("ben", "C4", 30, 0, 0, "B#3"), entry("", "E4", 0, 0, 0, "Fb4"), entry("Ann", "G4", 0, 0, 0, "")}
	es[1].Key = "D minor"
	es[2].Voice, es[3].Voice = "2", "3"
	since, err := ParseSince("2026-03-14T18:10:00Z", time.UTC)
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		f    Filter
		want int
	}{
		{"nothing asked", Filter{}, 4},
		{"player, any case", Filter{Player: "BEN"}, 1},
		{"key as --key takes it", Filter{Key: "G"}, 3},
		{"key spelled out", Filter{Key: "d minor"}, 1},
		{"since", Filter{Since: since}, 1},
		{"nobody", Filter{Player: "Cleo"}, 0},
		{"a voice as the report heads it", Filter{Player: "Voice  2"}, 1},
		{"a named voice", Filter{Player: "ann (voice 3)"}, 1},
		{"a player's voices with their notes", Filter{Player: "Ann"}, 2},
	}
	for _, c := range cases {
		if got := len(c.f.Apply(es)); got != c.want {
			t.Errorf("%s: kept %d, want %d", c.name, got, c.want)
		}
	}
}

func TestParseSince(t *testing.T) {
	cet := time.FixedZone("CET", 3600)
	cases := []struct {
		in   string
		want time.Time
		ok   bool
	}{
		{"2026-03-14", time.Date(2026, 3, 14, 0, 0, 0, 0, cet), true},
		{"2026-03-14T19:30", time.Date(2026, 3, 14, 19, 30, 0, 0, cet), true},
		{"2026-03-14T19:30:00Z", time.Date(2026, 3, 14, 19, 30, 0, 0, time.UTC), true},
		{"yesterday", time.Time{}, false},
	}
	for _, c := range cases {
		got, err := ParseSince(c.in, cet)
		if (err == nil) != c.ok || !got.Equal(c.want) {
			t.Errorf("%q: %v %v", c.in, got, err)
		}
	}
}
