package report

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"fifthline/journal"
	"fifthline/target"
)

// Options tune the summary.
type Options struct {
	// Tolerance in cents: a note within ±Tolerance of its target counts as
	// in tune, and a mean or a drift under half of it as on target / steady.
	Tolerance float64
}

// Group is one player in one key and temperament (and transposition: a
// B♭ part's written notes are not a concert part's).
type Group struct {
	Player      string    `json:"player"`
	Key         string    `json:"key"`
	Temperament string    `json:"temperament"`         // the spec, e.g. meantone:1/4
	Transpose   string    `json:"transpose,omitempty"` // the instrument's --transpose; notes are then written pitch
	Name        string    `json:"temperament_name"`
	A4          []float64 `json:"a4"`            // the reference pitches used, in order of first use
	Notes       []Stats   `json:"notes"`         // per spelled note with octave, along the line of fifths
	Classes     []Stats   `json:"pitch_classes"` // per spelled note without octave
	All         Stats     `json:"all"`
}

// Stats describe a set of held notes' deviations from their targets.
type Stats struct {
	Label     string  `json:"label"`  // "F#5", "F#", or "all"
	Fifths    int     `json:"fifths"` // place on the line of fifths
	Count     int     `json:"count"`
	Mean      float64 `json:"mean_cents"`
	Median    float64 `json:"median_cents"`
	Spread    float64 `json:"spread_cents"` // sample standard deviation; 0 for one note
	Within    int     `json:"within"`       // notes within ±Tolerance
	Share     float64 `json:"share_within"` // Within / Count
	Tendency  string  `json:"tendency"`
	NearerAlt int     `json:"nearer_alt"`         // notes that sat nearer the other spelling
	AltLabel  string  `json:"alt_note,omitempty"` // that spelling, the commonest one
	Trend     Trend   `json:"trend"`
}

// Trend is the least-squares line through cents against time.
type Trend struct {
	SlopePerMinute float64 `json:"slope_cents_per_min"`
	Minutes        float64 `json:"span_min"`    // first to last note
	Drift          float64 `json:"drift_cents"` // slope × span: the change over the rehearsal
	Known          bool    `json:"known"`       // three notes or more, spread over time
	Words          string  `json:"words"`
}

// Summarize groups the entries by player, key, temperament and
// transposition (in order of
// first appearance) and describes each group per note, per pitch class and
// as a whole.
func Summarize(entries []journal.Entry, opt Options) []Group {
	type groupKey struct{ player, key, temperament, transpose string }
	var order []groupKey
	members := map[groupKey][]journal.Entry{}
	for _, e := range entries {
		k := groupKey{e.Player, e.Key, e.Temperament, e.Transpose}
		if _, ok := members[k]; !ok {
			order = append(order, k)
		}
		members[k] = append(members[k], e)
	}
	groups := make([]Group, 0, len(order))
	for _, k := range order {
		es := members[k]
		g := Group{Player: k.player, Key: k.key, Temperament: k.temperament, Transpose: k.transpose, Name: temperamentName(k.temperament)}
		for _, e := range es {
			if !slices.Contains(g.A4, e.A4) {
				g.A4 = append(g.A4, e.A4)
			}
		}
		g.Notes = byLabel(es, opt, func(n target.Note) string { return n.String() })
		g.Classes = byLabel(es, opt, target.Note.Name)
		g.All = describe("all", 0, es, opt, target.Note.Name)
		groups = append(groups, g)
	}
	return groups
}

// Holds reports whether the entry belongs to the group.
func (g Group) Holds(e journal.Entry) bool {
	return e.Player == g.Player && e.Key == g.Key && e.Temperament == g.Temperament && e.Transpose == g.Transpose
}

// byLabel describes the entries per label of their note, ordered along the
// line of fifths and then by octave.
func byLabel(es []journal.Entry, opt Options, label func(target.Note) string) []Stats {
	sets := map[string][]journal.Entry{}
	first := map[string]target.Note{}
	for _, e := range es {
		l := label(e.Note)
		if _, ok := sets[l]; !ok {
			first[l] = e.Note
		}
		sets[l] = append(sets[l], e)
	}
	labels := make([]string, 0, len(sets))
	for l := range sets {
		labels = append(labels, l)
	}
	slices.SortFunc(labels, func(a, b string) int {
		na, nb := first[a], first[b]
		return cmp.Or(cmp.Compare(na.Fifths(), nb.Fifths()), cmp.Compare(na.Octave, nb.Octave))
	})
	out := make([]Stats, 0, len(labels))
	for _, l := range labels {
		out = append(out, describe(l, first[l].Fifths(), sets[l], opt, label))
	}
	return out
}

// describe computes Stats; altLabel names the other spelling at the level
// described (with or without octave).
func describe(label string, fifths int, es []journal.Entry, opt Options, altLabel func(target.Note) string) Stats {
	s := Stats{Label: label, Fifths: fifths, Count: len(es)}
	cents := make([]float64, len(es))
	alts := map[string]int{}
	for i, e := range es {
		cents[i] = e.Cents
		if math.Abs(e.Cents) <= opt.Tolerance {
			s.Within++
		}
		if e.NearerAlt() {
			s.NearerAlt++
			alts[altLabel(e.Alt)]++
		}
	}
	s.Mean, s.Spread = MeanSpread(cents)
	s.Median = Median(cents)
	if s.Count > 0 {
		s.Share = float64(s.Within) / float64(s.Count)
	}
	s.Tendency = Tendency(s.Mean, opt.Tolerance)
	s.AltLabel = byCount(alts)
	s.Trend = trendOf(es, opt.Tolerance)
	return s
}

// MeanSpread is the arithmetic mean and the sample standard deviation
// (divisor n−1; 0 for fewer than two values).
func MeanSpread(xs []float64) (mean, spread float64) {
	if len(xs) == 0 {
		return 0, 0
	}
	for _, x := range xs {
		mean += x
	}
	mean /= float64(len(xs))
	if len(xs) < 2 {
		return mean, 0
	}
	var ss float64
	for _, x := range xs {
		ss += (x - mean) * (x - mean)
	}
	return mean, math.Sqrt(ss / float64(len(xs)-1))
}

// Median is the middle value, or the mean of the two middle values.
func Median(xs []float64) float64 {
	if len(xs) == 0 {
		return 0
	}
	s := slices.Clone(xs)
	slices.Sort(s)
	m := len(s) / 2
	if len(s)%2 == 1 {
		return s[m]
	}
	return (s[m-1] + s[m]) / 2
}

// Tendency says where a mean deviation sits in words: "on target" within
// half the tolerance, else "sits 6 ¢ high" or "sits 3 ¢ low".
func Tendency(mean, tolerance float64) string {
	switch {
	case math.Abs(mean) < tolerance/2:
		return "on target"
	case mean > 0:
		return fmt.Sprintf("sits %.0f ¢ high", math.Round(mean))
	}
	return fmt.Sprintf("sits %.0f ¢ low", math.Round(-mean))
}

// Slope is the least-squares slope of y on x; false when x does not vary.
func Slope(xs, ys []float64) (float64, bool) {
	mx, _ := MeanSpread(xs)
	my, _ := MeanSpread(ys)
	var sxy, sxx float64
	for i := range xs {
		sxy += (xs[i] - mx) * (ys[i] - my)
		sxx += (xs[i] - mx) * (xs[i] - mx)
	}
	if sxx == 0 {
		return 0, false
	}
	return sxy / sxx, true
}

// trendOf fits cents against minutes since the first note.
func trendOf(es []journal.Entry, tolerance float64) Trend {
	if len(es) == 0 {
		return Trend{}
	}
	t0 := es[0].Time
	for _, e := range es {
		if e.Time.Before(t0) {
			t0 = e.Time
		}
	}
	xs, ys := make([]float64, len(es)), make([]float64, len(es))
	for i, e := range es {
		xs[i], ys[i] = e.Time.Sub(t0).Minutes(), e.Cents
	}
	tr := Trend{Minutes: slices.Max(xs)}
	slope, ok := Slope(xs, ys)
	if !ok || len(es) < 3 {
		tr.Words = "too few notes for a trend"
		return tr
	}
	tr.Known, tr.SlopePerMinute, tr.Drift = true, slope, slope*tr.Minutes
	tr.Words = DriftWords(tr.Drift, tr.Minutes, tolerance)
	return tr
}

// DriftWords says a change over a span in words: "steady over 40 min",
// "drifted 4 ¢ flat over 40 min", "drifted 7 ¢ sharp over 1.5 h".
func DriftWords(drift, minutes, tolerance float64) string {
	over := "over " + Span(time.Duration(minutes*float64(time.Minute)))
	switch {
	case math.Abs(drift) < tolerance/2:
		return "steady " + over
	case drift > 0:
		return fmt.Sprintf("drifted %.0f ¢ sharp %s", math.Round(drift), over)
	}
	return fmt.Sprintf("drifted %.0f ¢ flat %s", math.Round(-drift), over)
}

// Span formats a duration the way a rehearsal is timed: "45 s", "40 min",
// "1.5 h".
func Span(d time.Duration) string {
	switch {
	case d < time.Minute:
		return fmt.Sprintf("%.0f s", d.Seconds())
	case d < 90*time.Minute:
		return fmt.Sprintf("%.0f min", d.Minutes())
	}
	return strings.TrimSuffix(fmt.Sprintf("%.1f", d.Hours()), ".0") + " h"
}

// byCount lists the labels, commonest first, joined by "/".
func byCount(counts map[string]int) string {
	labels := make([]string, 0, len(counts))
	for l := range counts {
		labels = append(labels, l)
	}
	slices.SortFunc(labels, func(a, b string) int { return cmp.Or(counts[b]-counts[a], strings.Compare(a, b)) })
	return strings.Join(labels, "/")
}

// temperamentName is the readable name of a spec, or the spec itself (a
// custom file's path, or a spec from a newer version).
func temperamentName(spec string) string {
	if t, err := target.ParseTemperament(spec); err == nil {
		return t.Name()
	}
	return spec
}
