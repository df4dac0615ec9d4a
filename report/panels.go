package report

import (
	"fmt"
	"image/color"
	"math"
	"slices"
	"strconv"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"fifthline/journal"
	"fifthline/target"
)

// newPanel is a plot with the report's type sizes and light grid.
func newPanel(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text, p.X.Label.Text, p.Y.Label.Text = title, x, y
	p.Title.TextStyle.Font.Size = 13
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Size = 11
		a.Tick.Label.Font.Size = 10
	}
	p.Legend.TextStyle.Font.Size = 10
	p.Legend.Top = true
	g := plotter.NewGrid()
	g.Vertical.Color, g.Horizontal.Color = color.Gray{Y: 225}, color.Gray{Y: 225}
	p.Add(g)
	return p
}

// wholeCents ticks a cents axis at whole cents, 1, 2, 5, 10, 20 … apart so
// that there are at most 11 ticks (most+1 where most is set: a narrow
// panel's labels would run together), signed ("+5", "0", "−5").
type wholeCents struct{ most int }

func (c wholeCents) Ticks(lo, hi float64) []plot.Tick {
	most := 10.0
	if c.most > 0 {
		most = float64(c.most)
	}
	step := 1.0
	for _, s := range []float64{1, 2, 5, 10, 20, 50, 100, 200, 500, 1000} {
		if step = s; (hi-lo)/s <= most {
			break
		}
	}
	var ticks []plot.Tick
	for v := math.Ceil(lo/step) * step; v <= hi; v += step {
		ticks = append(ticks, plot.Tick{Value: v, Label: signedWhole(v)})
	}
	return ticks
}

// signedWhole labels whole cents: "+5", "0", "−5".
func signedWhole(v float64) string {
	n := int(math.Round(v))
	switch {
	case n > 0:
		return "+" + strconv.Itoa(n)
	case n < 0:
		return "−" + strconv.Itoa(-n)
	}
	return "0"
}

// wholeCounts ticks a count (or a time) axis at whole numbers.
type wholeCounts struct{}

func (wholeCounts) Ticks(lo, hi float64) []plot.Tick {
	ticks := wholeCents{}.Ticks(math.Max(0, lo), hi)
	for i := range ticks {
		ticks[i].Label = strconv.Itoa(int(math.Round(ticks[i].Value)))
	}
	return ticks
}

// band marks the target (solid) and ±tolerance (dashed) across a panel,
// horizontal, or vertical when vertical is set (from 0 to height).
func band(p *plot.Plot, tol float64, vertical bool, height float64) {
	for _, c := range []float64{-tol, 0, tol} {
		pts := plotter.XYs{{X: p.X.Min, Y: c}, {X: p.X.Max, Y: c}}
		if vertical {
			pts = plotter.XYs{{X: c, Y: 0}, {X: c, Y: height}}
		}
		l, _ := plotter.NewLine(pts)
		l.LineStyle.Color, l.LineStyle.Width = color.Gray{Y: 90}, vg.Points(1)
		if c != 0 {
			l.LineStyle.Dashes = []vg.Length{vg.Points(6), vg.Points(4)}
		}
		p.Add(l)
	}
}

// fitBand makes the y axis show the tolerance band with some room beyond,
// and raises its top so that a legend of n lines, top right, does not cover
// the data; the axis is labelled in whole cents.
func fitBand(p *plot.Plot, tol float64, n int) {
	p.Y.Min, p.Y.Max = math.Min(p.Y.Min, -1.6*tol), math.Max(p.Y.Max, 1.6*tol)
	pad := 0.08 * (p.Y.Max - p.Y.Min) // markers and labels at the extremes stay whole
	p.Y.Min, p.Y.Max = p.Y.Min-pad, p.Y.Max+pad
	p.Y.Max += (p.Y.Max - p.Y.Min) * 0.09 * float64(n)
	p.Y.Tick.Marker = wholeCents{}
}

func glyph(i int) draw.GlyphStyle {
	return draw.GlyphStyle{Color: plotutil.Color(i), Shape: plotutil.Shape(i), Radius: vg.Points(4)}
}

// meanScatter are points with symmetric error bars.
type meanScatter struct {
	plotter.XYs
	err []float64
}

func (m meanScatter) YError(i int) (float64, float64) { return m.err[i], m.err[i] }

// notesPanel: each spelled note's mean ± scatter over all the group's notes
// (es, whatever the rehearsal), its count and any notes on the other
// spelling written under its name, so no label sits on the data.
func notesPanel(es []journal.Entry, opt Options) (*plot.Plot, error) {
	axis := "spelled note, along the line of fifths"
	if slices.ContainsFunc(es, func(e journal.Entry) bool { return e.Transpose != "" }) {
		axis = "spelled note (written pitch), along the line of fifths" // a transposing instrument's
	}
	p := newPanel("Mean ± scatter per spelled note", axis, "cents from target")
	var m meanScatter
	var labels []string
	for _, s := range byLabel(es, Options{Tolerance: opt.Tolerance}, target.Note.String, target.Note.String) {
		label := s.Label + "\n" + plural(s.Count, "note")
		if s.Other.Count > 0 {
			label += fmt.Sprintf("\n%d more on %s", s.Other.Count, s.Other.Label)
		}
		labels = append(labels, label)
		if s.Count > 0 {
			m.XYs = append(m.XYs, plotter.XY{X: float64(len(labels) - 1), Y: s.Mean})
			m.err = append(m.err, s.Scatter)
		}
	}
	if err := m.draw(p, labels, opt.Tolerance); err != nil {
		return nil, err
	}
	return p, nil
}

// draw lays the labels along the x axis, the means with their error bars
// over them, and the tolerance band about 0.
func (m meanScatter) draw(p *plot.Plot, labels []string, tol float64) error {
	p.NominalX(labels...)
	p.X.Min, p.X.Max = -0.6, float64(len(labels))-0.4
	defer func() {
		fitBand(p, tol, 0)
		band(p, tol, false, 0)
	}()
	if len(m.XYs) == 0 {
		return nil
	}
	bars, err := plotter.NewYErrorBars(m)
	if err != nil {
		return err
	}
	bars.LineStyle.Color, bars.LineStyle.Width = plotutil.Color(0), vg.Points(1.5)
	pts, _ := plotter.NewScatter(m.XYs)
	pts.GlyphStyle = glyph(0)
	p.Add(bars, pts)
	return nil
}

// emptyPanel stands where a group has no notes on their own spelling.
func emptyPanel(title string) *plot.Plot {
	p := newPanel(title, "", "")
	p.X.Label.Text = "(no notes on their own spelling)"
	p.HideAxes()
	return p
}

func timePanel(g Group, es []journal.Entry, opt Options) (*plot.Plot, error) {
	const title = "Cents during the rehearsal, with the trend line"
	if len(es) == 0 {
		return emptyPanel(title), nil
	}
	minutes := sinceRehearsalStart(es)
	unit, perUnit := timeUnit(time.Duration(slices.Max(minutes) * float64(time.Minute)))
	since := unit + " since the rehearsal's first note"
	if Rehearsal(slices.MinFunc(es, byTime)) != Rehearsal(slices.MaxFunc(es, byTime)) {
		since = unit + " since each rehearsal's first note"
	}
	p := newPanel(title, since, "cents from target")
	xys := make(plotter.XYs, len(es))
	for i, e := range es {
		xys[i] = plotter.XY{X: minutes[i] / perUnit, Y: e.Cents}
	}
	mx, _ := MeanDeviation(minutes) // the trend line passes through (mx, mean)
	pts, err := plotter.NewScatter(xys)
	if err != nil {
		return nil, err
	}
	pts.GlyphStyle = glyph(0)
	pts.GlyphStyle.Radius = vg.Points(3)
	p.Add(pts)
	if tr := g.All.Trend; tr.Known {
		at := func(m float64) plotter.XY {
			return plotter.XY{X: m / perUnit, Y: g.All.Mean + tr.SlopePerMinute*(m-mx)}
		}
		line, _ := plotter.NewLine(plotter.XYs{at(0), at(tr.Minutes)})
		line.LineStyle.Color, line.LineStyle.Width = plotutil.Color(1), vg.Points(2)
		p.Add(line)
		p.Legend.Add("trend: "+tr.Words, line)
	} else {
		p.Title.Text = fmt.Sprintf("Cents during the rehearsal (a trend needs %d notes)", TrendNotes)
	}
	p.X.Min, p.X.Max = math.Min(p.X.Min, 0), math.Max(p.X.Max, 1)
	pad := 0.03 * (p.X.Max - p.X.Min) // markers at the ends stay whole
	p.X.Min, p.X.Max = p.X.Min-pad, p.X.Max+pad
	if p.X.Max-p.X.Min >= 2 {
		p.X.Tick.Marker = wholeCounts{}
	}
	legend := 0
	if g.All.Trend.Known {
		legend = 1
	}
	fitBand(p, opt.Tolerance, legend)
	band(p, opt.Tolerance, false, 0)
	return p, nil
}

func byTime(a, b journal.Entry) int { return a.Time.Compare(b.Time) }

// timeUnit picks the time axis's unit for a span: its name and its length
// in minutes.
func timeUnit(span time.Duration) (string, float64) {
	switch {
	case span < 2*time.Minute:
		return "seconds", 1.0 / 60
	case span < 3*time.Hour:
		return "minutes", 1
	case span < 72*time.Hour:
		return "hours", 60
	}
	return "days", 24 * 60
}

// rehearsalPanel: each note's mean at each rehearsal, a line per note, so a
// note that improves is seen to.
func rehearsalPanel(g Group, opt Options) (*plot.Plot, error) {
	p := newPanel("Each note's mean per rehearsal", "rehearsal", "cents from target")
	var dates []string
	for _, s := range g.Rehearsals {
		dates = append(dates, s.Rehearsal)
	}
	slices.Sort(dates)
	dates = slices.Compact(dates)
	labels := make([]string, len(dates))
	for i, d := range dates {
		if t, err := time.Parse("2006-01-02", d); err == nil {
			labels[i] = t.Format("2 Jan\n2006")
		}
	}
	p.NominalX(labels...)
	series := map[string]plotter.XYs{}
	var order []string
	for _, s := range g.Notes {
		if s.Count == 0 {
			continue
		}
		if _, ok := series[s.Label]; !ok {
			order = append(order, s.Label)
		}
		series[s.Label] = append(series[s.Label], plotter.XY{X: float64(slices.Index(dates, s.Rehearsal)), Y: s.Mean})
	}
	for i, label := range order {
		line, pts, err := plotter.NewLinePoints(series[label])
		if err != nil {
			return nil, err
		}
		line.LineStyle.Color, line.LineStyle.Width = plotutil.Color(i), vg.Points(1.5)
		pts.GlyphStyle = glyph(i)
		p.Add(line, pts)
		p.Legend.Add(label, line, pts)
	}
	p.X.Min, p.X.Max = -0.4, float64(len(dates))-0.6
	fitBand(p, opt.Tolerance, 0)
	band(p, opt.Tolerance, false, 0)
	// The legend goes right of the last rehearsal, clear of the lines and
	// the band: the data keep the left 70 % of the panel.
	p.X.Max = p.X.Min + (p.X.Max-p.X.Min)/0.7
	return p, nil
}

// centBars counts the values into n bars width cents wide from lo (the
// last bar takes what lies beyond).
func centBars(vs plotter.Values, lo, width float64, n int) []plotter.HistogramBin {
	bars := make([]plotter.HistogramBin, n)
	for i := range bars {
		bars[i].Min, bars[i].Max = lo+float64(i)*width, lo+float64(i+1)*width
	}
	for _, v := range vs {
		bars[max(0, min(n-1, int((v-lo)/width)))].Weight++
	}
	return bars
}

func histogramPanel(es []journal.Entry, opt Options) (*plot.Plot, error) {
	const title = "How far the notes sat"
	if len(es) == 0 {
		return emptyPanel(title), nil
	}
	p := newPanel(title, "cents from target", "notes")
	vs := make(plotter.Values, len(es))
	for i, e := range es {
		vs[i] = e.Cents
	}
	lo, hi := plotter.Range(vs)
	lo, hi = math.Floor(math.Min(lo, -1.6*opt.Tolerance)), math.Ceil(math.Max(hi, 1.6*opt.Tolerance))
	// Whole-cent bars, one cent wide or wider so that there are at most 40.
	width := math.Max(1, math.Ceil((hi-lo)/40))
	bins := int(math.Max(1, math.Ceil((hi-lo)/width)))
	h, err := plotter.NewHist(vs, bins)
	if err != nil {
		return nil, err
	}
	// NewHist spreads the bins over the data's own range (one bin when
	// every note sat at the same cent); lay them on whole cents instead.
	h.Bins = centBars(vs, lo, width, bins)
	tallest := 0.0
	for _, b := range h.Bins {
		tallest = max(tallest, b.Weight)
	}
	h.FillColor = color.Gray{Y: 160}
	h.LineStyle.Width = vg.Points(0.5)
	p.Add(h)
	band(p, opt.Tolerance, true, tallest)
	p.X.Min, p.X.Max = lo, hi+width
	p.Y.Min, p.Y.Max = 0, tallest*1.1
	// The histogram is the row's narrowest panel: a few labels.
	p.X.Tick.Marker, p.Y.Tick.Marker = wholeCents{most: 4}, wholeCounts{}
	return p, nil
}
