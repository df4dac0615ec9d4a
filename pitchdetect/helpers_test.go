package pitchdetect

import (
	"math"
	"sort"
	"testing"

	"fifthline/internal/testsignal"
)

// run feeds x through a default detector at rate and returns its estimates.
func run(t testing.TB, rate float64, x []float64) []Estimate {
	t.Helper()
	d, err := New(rate, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	return d.Feed(testsignal.Float32(x), nil)
}

// errorStats summarises |cents| of voiced estimates against truth hz.
type errorStats struct {
	voiced, frames   int
	median, p90, max float64
	gross            int // voiced frames more than 50 cents off
}

func measure(est []Estimate, hz float64) errorStats {
	var errs []float64
	s := errorStats{frames: len(est)}
	for _, e := range est {
		if !e.Voiced {
			continue
		}
		c := math.Abs(testsignal.Cents(e.Hz, hz))
		if c > 50 {
			s.gross++
		}
		errs = append(errs, c)
	}
	s.voiced = len(errs)
	if len(errs) == 0 {
		s.median, s.p90, s.max = math.Inf(1), math.Inf(1), math.Inf(1)
		return s
	}
	sort.Float64s(errs)
	s.median = errs[len(errs)/2]
	s.p90 = errs[len(errs)*9/10]
	s.max = errs[len(errs)-1]
	return s
}

// segment runs the estimates through a Segmenter matched to the detector.
func segment(est []Estimate, rate float64) []Held {
	d, _ := New(rate, 0, 0)
	return segmentWith(d.NewSegmenter(), est)
}

// segmentWith runs the estimates through s, its last note flushed.
func segmentWith(s *Segmenter, est []Estimate) []Held {
	var notes []Held
	for _, e := range est {
		if h, ok := s.Push(e); ok {
			notes = append(notes, h)
		}
	}
	if h, ok := s.Flush(); ok {
		notes = append(notes, h)
	}
	return notes
}
