package report

import (
	"fmt"
	"math"
	"slices"
	"time"

	"fifthline/journal"
	"fifthline/target"
)

// A trend needs this many notes, at least this far apart from first to
// last: a line through fewer says more about single notes than about the
// rehearsal.
const (
	TrendNotes = 6
	TrendSpan  = time.Minute
)

// Trend is the least-squares line through cents against time.
type Trend struct {
	SlopePerMinute float64 `json:"slope_cents_per_min"`
	Minutes        float64 `json:"span_min"`    // first to last note
	Drift          float64 `json:"drift_cents"` // slope × span: the change over the rehearsal
	Known          bool    `json:"known"`       // TrendNotes notes or more over TrendSpan or more
	Words          string  `json:"words"`       // empty when not Known
}

// TooFewForATrend says once, for a whole table, why a trend is missing.
var TooFewForATrend = fmt.Sprintf("a trend needs %d notes or more, over %s or more", TrendNotes, target.Span(TrendSpan))

// trendOf fits cents against time within a rehearsal. With several
// rehearsals, the slope is their common one (each rehearsal about its own
// mean time and mean cents), so that a rehearsal played higher than the last
// is progress, not drift; the span is the longest rehearsal's.
func trendOf(es []journal.Entry, tolerance float64) Trend {
	if len(es) == 0 {
		return Trend{}
	}
	minutes := sinceRehearsalStart(es)
	days := map[string][]int{}
	for i, e := range es {
		days[Rehearsal(e)] = append(days[Rehearsal(e)], i)
	}
	var sxy, sxx float64
	for _, idx := range days {
		xs, ys := make([]float64, len(idx)), make([]float64, len(idx))
		for j, i := range idx {
			xs[j], ys[j] = minutes[i], es[i].Cents
		}
		xy, xx := moments(xs, ys)
		sxy, sxx = sxy+xy, sxx+xx
	}
	tr := Trend{Minutes: slices.Max(minutes)}
	if sxx == 0 || len(es) < TrendNotes || tr.Minutes < TrendSpan.Minutes() {
		return tr
	}
	slope := sxy / sxx
	tr.Known, tr.SlopePerMinute, tr.Drift = true, slope, slope*tr.Minutes
	tr.Words = DriftWords(tr.Drift, tr.Minutes, tolerance)
	return tr
}

// sinceRehearsalStart is each entry's time in minutes since the first note
// of its rehearsal.
func sinceRehearsalStart(es []journal.Entry) []float64 {
	start := map[string]time.Time{}
	for _, e := range es {
		if t, ok := start[Rehearsal(e)]; !ok || e.Time.Before(t) {
			start[Rehearsal(e)] = e.Time
		}
	}
	out := make([]float64, len(es))
	for i, e := range es {
		out[i] = e.Time.Sub(start[Rehearsal(e)]).Minutes()
	}
	return out
}

// Slope is the least-squares slope of y on x; false when x does not vary.
func Slope(xs, ys []float64) (float64, bool) {
	sxy, sxx := moments(xs, ys)
	if sxx == 0 {
		return 0, false
	}
	return sxy / sxx, true
}

// moments are the sums of (x − x̄)(y − ȳ) and (x − x̄)².
func moments(xs, ys []float64) (sxy, sxx float64) {
	mx, _ := MeanDeviation(xs)
	my, _ := MeanDeviation(ys)
	for i := range xs {
		sxy += (xs[i] - mx) * (ys[i] - my)
		sxx += (xs[i] - mx) * (xs[i] - mx)
	}
	return sxy, sxx
}

// DriftWords says a change over a span in words: "steady over 40 min"
// (under half the tolerance), "drifted 4 ¢ flat over 40 min", "drifted 7 ¢
// sharp over 1.5 h".
func DriftWords(drift, minutes, tolerance float64) string {
	over := "over " + target.Span(time.Duration(minutes*float64(time.Minute)))
	switch {
	case math.Abs(drift) < tolerance/2:
		return "steady " + over
	case drift > 0:
		return fmt.Sprintf("drifted %.0f ¢ sharp %s", math.Round(drift), over)
	}
	return fmt.Sprintf("drifted %.0f ¢ flat %s", math.Round(-drift), over)
}
