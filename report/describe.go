package report

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"fifthline/journal"
	"fifthline/target"
)

// Stats describe a set of held notes' deviations from their targets. Notes
// that sat on the other spelling are counted apart (Other) and take no part
// in anything else here: an F♯ played as G♭ is not an F♯ 40 ¢ sharp.
//
// Both deviations are root-mean-square deviations from a mean (divisor n,
// not n − 1): Scatter between the notes' cents, Spread (as in the journal and
// on the meter) of the pitch within one held note.
type Stats struct {
	Label     string  `json:"label"`               // "F#5", "F#", or "all"
	Rehearsal string  `json:"rehearsal,omitempty"` // YYYY-MM-DD, with ByRehearsal
	Fifths    int     `json:"fifths"`              // place on the line of fifths
	Count     int     `json:"count"`               // notes on this spelling
	Mean      float64 `json:"mean_cents"`
	Median    float64 `json:"median_cents"`
	Scatter   float64 `json:"scatter_cents"` // between notes: how far the notes' cents lie from their mean
	Spread    float64 `json:"spread_cents"`  // within a note: the notes' own spreads, root mean square
	// Vibrato is the mean full width (lowest to highest pitch of a cycle)
	// of the notes played with vibrato, VibratoNotes of them.
	Vibrato      float64       `json:"vibrato_cents"`
	VibratoNotes int           `json:"vibrato_notes"`
	Within       int           `json:"within"`       // notes within ±Tolerance
	Share        float64       `json:"share_within"` // Within / Count
	Tendency     string        `json:"tendency"`
	Other        OtherSpelling `json:"other_spelling"`
	Trend        Trend         `json:"trend"`
}

// OtherSpelling describes the notes that sat on the other spelling, against
// that spelling's own target.
type OtherSpelling struct {
	Label string  `json:"note,omitempty"` // the other spelling, the commonest first
	Count int     `json:"count"`
	Mean  float64 `json:"mean_cents"`
}

// describe computes Stats; altLabel names the other spelling at the level
// described (with or without octave).
func describe(label string, fifths int, rehearsal string, es []journal.Entry, opt Options, altLabel func(target.Note) string) Stats {
	s := Stats{Label: label, Rehearsal: rehearsal, Fifths: fifths}
	var cents, spreads, vibratos, other []float64
	var on []journal.Entry
	alts := map[string]int{}
	for _, e := range es {
		if e.SatOnOther() {
			other = append(other, e.AltCents)
			alts[altLabel(e.Alt)]++
			continue
		}
		on = append(on, e)
		cents = append(cents, e.Cents)
		spreads = append(spreads, e.Spread)
		if e.VibratoWidth > 0 {
			vibratos = append(vibratos, e.VibratoWidth)
		}
		if math.Abs(e.Cents) <= opt.Tolerance {
			s.Within++
		}
	}
	s.Count = len(cents)
	s.Mean, s.Scatter = MeanDeviation(cents)
	s.Median = Median(cents)
	s.Spread = RMS(spreads)
	s.Vibrato, _ = MeanDeviation(vibratos)
	s.VibratoNotes = len(vibratos)
	if s.Count > 0 {
		s.Share = float64(s.Within) / float64(s.Count)
	}
	s.Tendency = Tendency(s.Mean, s.Share, s.Count, opt.Tolerance)
	s.Other = OtherSpelling{Label: byCount(alts), Count: len(other)}
	s.Other.Mean, _ = MeanDeviation(other)
	s.Trend = trendOf(on, opt.Tolerance)
	return s
}

// MeanDeviation is the arithmetic mean and the root-mean-square deviation
// from it (the population standard deviation, divisor n; 0 for one value).
func MeanDeviation(xs []float64) (mean, deviation float64) {
	if len(xs) == 0 {
		return 0, 0
	}
	for _, x := range xs {
		mean += x
	}
	mean /= float64(len(xs))
	var ss float64
	for _, x := range xs {
		ss += (x - mean) * (x - mean)
	}
	return mean, math.Sqrt(ss / float64(len(xs)))
}

// RMS is the root mean square: per-note deviations pooled into one
// (notes of equal length weigh alike).
func RMS(xs []float64) float64 {
	if len(xs) == 0 {
		return 0
	}
	var ss float64
	for _, x := range xs {
		ss += x * x
	}
	return math.Sqrt(ss / float64(len(xs)))
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

// Tendency says in words where the notes sat, by the same tolerance as the
// share within it, so the two never contradict each other:
//
//	mean within ±tol, more than half the notes within:  "in tune"
//	mean within ±tol, half or fewer within:             "scattered about the target",
//	                                                    or "scattered, 4 ¢ sharp on average" past ±tol/2
//	mean beyond, half or fewer within:                  "sits 7 ¢ sharp" / "sits 7 ¢ flat"
//	mean beyond, more than half within:                 "mostly in tune, a few far sharp"
//
// Sharp and flat, as the meter, the drift and the chord roles say it. No
// notes: "".
func Tendency(mean, share float64, count int, tol float64) string {
	most := share > 0.5
	way := "sharp"
	if mean < 0 {
		way = "flat"
	}
	switch {
	case count == 0:
		return ""
	case math.Abs(mean) <= tol && most:
		return "in tune"
	case math.Abs(mean) < tol/2:
		return "scattered about the target"
	case math.Abs(mean) <= tol:
		return fmt.Sprintf("scattered, %.0f ¢ %s on average", math.Abs(math.Round(mean)), way)
	case most:
		return "mostly in tune, a few far " + way
	}
	return fmt.Sprintf("sits %.0f ¢ %s", math.Abs(math.Round(mean)), way)
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
