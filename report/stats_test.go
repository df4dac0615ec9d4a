package report

import (
	"math"
	"testing"
	"time"

	"fifthline/journal"
	"fifthline/target"
)

func near(a, b float64) bool { return math.Abs(a-b) < 1e-9 }

func TestMeanSpreadMedian(t *testing.T) {
	cases := []struct {
		name                 string
		xs                   []float64
		mean, spread, median float64
	}{
		// The textbook set 2,4,4,4,5,5,7,9: mean 5, squared deviations sum to
		// 32, so the sample standard deviation is √(32/7) = 2.13809; median
		// (4+5)/2 (hand-computed).
		{"textbook set", []float64{2, 4, 4, 4, 5, 5, 7, 9}, 5, math.Sqrt(32.0 / 7), 4.5},
		{"one note has no spread", []float64{-3}, -3, 0, -3},
		// 9, −1, 3: mean 11/3; deviations 16/3, −14/3, −2/3; squares sum
		// 456/9 = 152/3, over n−1 = 2 gives 76/3 (hand-computed).
		{"odd count: the middle value", []float64{9, -1, 3}, 11.0 / 3, math.Sqrt(76.0 / 3), 3},
		{"nothing", nil, 0, 0, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m, s := MeanSpread(c.xs)
			if !near(m, c.mean) || !near(s, c.spread) || !near(Median(c.xs), c.median) {
				t.Errorf("mean %v spread %v median %v; want %v %v %v", m, s, Median(c.xs), c.mean, c.spread, c.median)
			}
		})
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

func TestWords(t *testing.T) {
	cases := []struct{ got, want string }{
		{Tendency(6.2, 5), "sits 6 ¢ high"},
		{Tendency(-3, 5), "sits 3 ¢ low"},
		{Tendency(2.4, 5), "on target"},
		{Tendency(-2.5, 5), "sits 3 ¢ low"}, // half the tolerance is no longer on target
		{Tendency(0.4, 0.5), "sits 0 ¢ high"},
		{DriftWords(-4.2, 40, 5), "drifted 4 ¢ flat over 40 min"},
		{DriftWords(7, 90, 5), "drifted 7 ¢ sharp over 1.5 h"},
		{DriftWords(1, 0.5, 5), "steady over 30 s"},
		{Span(2 * time.Hour), "2 h"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("%q, want %q", c.got, c.want)
		}
	}
}

// entry is a journal line: a note at minute m with given cents and, for
// nearer-alt checks, cents against the other spelling.
func entry(player, note string, minute, cents, altCents float64, alt string) journal.Entry {
	n, _ := target.ParseNote(note)
	a, _ := target.ParseNote(alt)
	return journal.Entry{
		Time:   time.Date(2026, 3, 14, 19, 0, 0, 0, time.UTC).Add(time.Duration(minute * float64(time.Minute))),
		Player: player, Key: "G major", Temperament: "meantone:1/4", A4: 415,
		Note: n, Alt: a, HasAlt: alt != "", Cents: cents, AltCents: altCents,
	}
}

// sampleEntries: Ann's three F♯4s drifting up, a B♭3, an F♯5 that sat on
// G♭5; Ben's one C4, with no player named.
func sampleEntries() []journal.Entry {
	return []journal.Entry{
		entry("Ann", "F#4", 0, 4, 45, "Gb4"),
		entry("Ann", "F#4", 10, 6, 47, "Gb4"),
		entry("Ann", "F#4", 20, 8, 49, "Gb4"),
		entry("Ann", "Bb3", 5, -3, -44, "A#3"),
		entry("Ann", "F#5", 15, 38, -3, "Gb5"), // sat on G♭5, 41 ¢ (quarter-comma diesis) above F♯5
		entry("", "C4", 0, 1, 1, "B#3"),
	}
}

func TestSummarize(t *testing.T) {
	groups := Summarize(sampleEntries(), Options{Tolerance: 5})
	if len(groups) != 2 || groups[0].Player != "Ann" || groups[1].Player != "" {
		t.Fatalf("groups %+v", groups)
	}
	ann := groups[0]
	if ann.Name != "1/4-comma meantone" || len(ann.A4) != 1 || ann.A4[0] != 415 {
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
	// F♯4 at 4, 6, 8 ¢ over minutes 0, 10, 20: mean 6, median 6, sample
	// spread √((4+0+4)/2) = 2, one of three within ±5 ¢, slope 0.2 ¢/min,
	// so 4 ¢ sharp over 20 min (hand-computed).
	fs := ann.Notes[1]
	if fs.Count != 3 || !near(fs.Mean, 6) || !near(fs.Median, 6) || !near(fs.Spread, 2) || fs.Within != 1 ||
		!near(fs.Share, 1.0/3) || fs.Tendency != "sits 6 ¢ high" || fs.NearerAlt != 0 ||
		!near(fs.Trend.SlopePerMinute, 0.2) || !near(fs.Trend.Drift, 4) || fs.Trend.Words != "drifted 4 ¢ sharp over 20 min" {
		t.Errorf("F#4 %+v", fs)
	}
	if f5 := ann.Notes[2]; f5.NearerAlt != 1 || f5.AltLabel != "Gb5" || f5.Trend.Known {
		t.Errorf("F#5 %+v", f5)
	}
	// The pitch class F♯ gathers F♯4 and F♯5: 4, 6, 8, 38 → mean 14.
	if len(ann.Classes) != 2 || ann.Classes[1].Label != "F#" || ann.Classes[1].Count != 4 || !near(ann.Classes[1].Mean, 14) ||
		ann.Classes[1].AltLabel != "Gb" {
		t.Errorf("classes %+v", ann.Classes)
	}
	// All five: 4+6+8−3+38 = 53, mean 10.6; within ±5: 4 and −3.
	if all := ann.All; all.Count != 5 || !near(all.Mean, 10.6) || all.Within != 2 || all.Label != "all" {
		t.Errorf("all %+v", all)
	}
	if other := groups[1]; other.All.Tendency != "on target" || other.All.Trend.Words != "too few notes for a trend" {
		t.Errorf("second group %+v", other.All)
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
	es := []journal.Entry{entry("Ann", "C4", 0, 0, 0, "B#3"), entry("ben", "C4", 30, 0, 0, "B#3")}
	es[1].Key = "D minor"
	since, err := ParseSince("2026-03-14T19:10:00Z", time.UTC)
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		f    Filter
		want int
	}{
		{"nothing asked", Filter{}, 2},
		{"player, any case", Filter{Player: "BEN"}, 1},
		{"key as --key takes it", Filter{Key: "G"}, 1},
		{"key spelled out", Filter{Key: "d minor"}, 1},
		{"since", Filter{Since: since}, 1},
		{"nobody", Filter{Player: "Cleo"}, 0},
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

func TestATransposingPartIsItsOwnGroup(t *testing.T) {
	concert, clarinet := entry("Ann", "D4", 0, 1, 1, "C##4"), entry("Ann", "E4", 1, 2, 2, "Fb4")
	clarinet.Transpose = "Bb" // written E4 sounds D4 on a B♭ clarinet
	groups := Summarize([]journal.Entry{concert, clarinet}, Options{Tolerance: 5})
	if len(groups) != 2 || groups[1].Title() != "Ann · G major · 1/4-comma meantone · A4 = 415 Hz · written for Bb instrument" {
		t.Errorf("groups %d, second titled %q", len(groups), groups[len(groups)-1].Title())
	}
}
