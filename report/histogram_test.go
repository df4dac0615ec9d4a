package report

import (
	"testing"

	"gonum.org/v1/plot/plotter"
)

// The histogram counts every note in the whole cent it sat in, also when
// every note sat at the same cent (a steady player's eight notes at
// 0.00 ¢ were once drawn as no bar at all), and what lies beyond the axis
// in the bar at its end.
func TestHistogramCountsEachNoteInItsWholeCent(t *testing.T) {
	for _, c := range []struct {
		name string
		vs   plotter.Values
		want map[float64]float64 // bar's lower edge → notes
	}{
		{"eight notes at 0.00 ¢", plotter.Values{0, 0, 0, 0, 0, 0, 0, 0}, map[float64]float64{0: 8}},
		{"−0.4, +0.4, +2.5 ¢", plotter.Values{-0.4, 0.4, 2.5}, map[float64]float64{-1: 1, 0: 1, 2: 1}},
		{"beyond both ends", plotter.Values{-30, 30}, map[float64]float64{-8: 1, 7: 1}},
	} {
		bars := centBars(c.vs, -8, 1, 16)
		for _, b := range bars {
			if b.Weight != c.want[b.Min] {
				t.Errorf("%s: bar %+g…%+g ¢ counts %g notes, want %g", c.name, b.Min, b.Max, b.Weight, c.want[b.Min])
			}
		}
	}
}
