package report

import (
	"cmp"
	"fmt"
	"image/color"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"fifthline/journal"
	"fifthline/target"
)

// The picture: 12 × 8 inches, a sheet to pin up; PNG at PlotDPI.
const (
	PlotWidth  = 12 * vg.Inch
	PlotHeight = 8 * vg.Inch
	PlotDPI    = 150 // so the PNG is 1800 × 1200 pixels
)

// PlotFile draws the report into path, PNG or SVG by its extension.
func PlotFile(path string, entries []journal.Entry, groups []Group, opt Options) error {
	format := strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), ".")
	f, err := os.Create(path)
	if err != nil {
		return fmt.Errorf("--plot: %v", err)
	}
	if err := Plot(f, format, entries, groups, opt); err != nil {
		f.Close()
		return fmt.Errorf("--plot %s: %v", path, err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("--plot %s: %v", path, err)
	}
	return nil
}

// Plot draws three panels under a title that states the tuning: mean ±
// spread per spelled note along the line of fifths (top), cents over the
// rehearsal with each group's trend line (bottom left), and a histogram of
// all deviations (bottom right). Groups differ by marker shape as well as
// colour; the tolerance band is dashed.
func Plot(w io.Writer, format string, entries []journal.Entry, groups []Group, opt Options) error {
	var canvas vg.CanvasWriterTo
	switch format {
	case "png":
		canvas = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(PlotWidth, PlotHeight), vgimg.UseDPI(PlotDPI))}
	case "svg":
		canvas = vgsvg.New(PlotWidth, PlotHeight)
	default:
		return fmt.Errorf("format %q: png or svg", format)
	}
	dc := draw.New(canvas)
	dc.FillPolygon(color.White, []vg.Point{dc.Min, {X: dc.Max.X, Y: dc.Min.Y}, dc.Max, {X: dc.Min.X, Y: dc.Max.Y}})
	title := plotTitle(entries, groups, opt)
	titleH := 0.75 * vg.Inch
	drawTitle(dc, title, titleH)
	body := draw.Crop(dc, 0, 0, 0, -titleH)
	half := (body.Max.Y - body.Min.Y) / 2
	top := draw.Crop(body, 0, 0, half, 0)
	bottom := draw.Crop(body, 0, 0, 0, -half)
	mid := (bottom.Max.X - bottom.Min.X) * 0.58

	panels := []struct {
		make func() (*plot.Plot, error)
		at   draw.Canvas
	}{
		{func() (*plot.Plot, error) { return notesPanel(groups, opt) }, top},
		{func() (*plot.Plot, error) { return timePanel(entries, groups, opt) }, draw.Crop(bottom, 0, -(bottom.Max.X - bottom.Min.X - mid), 0, 0)},
		{func() (*plot.Plot, error) { return histogramPanel(entries, opt) }, draw.Crop(bottom, mid, 0, 0, 0)},
	}
	for _, pn := range panels {
		p, err := pn.make()
		if err != nil {
			return err
		}
		p.Draw(draw.Crop(pn.at, 0.1*vg.Inch, -0.1*vg.Inch, 0.05*vg.Inch, -0.05*vg.Inch))
	}
	_, err := canvas.WriteTo(w)
	return err
}

func plotTitle(entries []journal.Entry, groups []Group, opt Options) [2]string {
	first, last := entries[0].Time, entries[0].Time
	for _, e := range entries {
		first, last = minTime(first, e.Time), maxTime(last, e.Time)
	}
	when := first.Format("2 Jan 2006 15:04") + " – " + last.Format("15:04")
	if last.YearDay() != first.YearDay() || last.Year() != first.Year() {
		when = first.Format("2 Jan 2006") + " – " + last.Format("2 Jan 2006")
	}
	sub := fmt.Sprintf("%s · %s · tolerance ±%g ¢", plural(len(entries), "held note"), when, opt.Tolerance)
	if len(groups) == 1 {
		return [2]string{groups[0].Title(), sub}
	}
	return [2]string{fmt.Sprintf("Rehearsal report: %d players or tunings (see the legend)", len(groups)), sub}
}

func drawTitle(dc draw.Canvas, title [2]string, height vg.Length) {
	sty := plot.New().Title.TextStyle
	sty.XAlign, sty.YAlign = draw.XCenter, draw.YTop
	x := (dc.Min.X + dc.Max.X) / 2
	sty.Font.Size = 20
	dc.FillText(sty, vg.Point{X: x, Y: dc.Max.Y - 0.1*vg.Inch}, title[0])
	sty.Font.Size = 13
	dc.FillText(sty, vg.Point{X: x, Y: dc.Max.Y - height/2 - 0.05*vg.Inch}, title[1])
}

// newPanel is a plot with the report's type sizes and light grid.
func newPanel(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text, p.X.Label.Text, p.Y.Label.Text = title, x, y
	p.Title.TextStyle.Font.Size = 14
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Size = 12
		a.Tick.Label.Font.Size = 11
	}
	p.Legend.TextStyle.Font.Size = 11
	p.Legend.Top = true
	g := plotter.NewGrid()
	g.Vertical.Color, g.Horizontal.Color = color.Gray{Y: 225}, color.Gray{Y: 225}
	p.Add(g)
	return p
}

// band marks the target (solid) and ±tolerance (dashed) across a panel,
// horizontal, or vertical when vertical is set (from 0 to height).
func band(p *plot.Plot, tol float64, vertical bool, height float64) {
	for _, c := range []float64{-tol, 0, tol} {
		var l *plotter.Line
		if vertical {
			l, _ = plotter.NewLine(plotter.XYs{{X: c, Y: 0}, {X: c, Y: height}})
		} else {
			f := plotter.NewFunction(func(float64) float64 { return c })
			f.LineStyle.Color, f.LineStyle.Width = color.Gray{Y: 90}, vg.Points(1)
			if c != 0 {
				f.LineStyle.Dashes = []vg.Length{vg.Points(6), vg.Points(4)}
			}
			p.Add(f)
			continue
		}
		l.LineStyle.Color, l.LineStyle.Width = color.Gray{Y: 90}, vg.Points(1)
		if c != 0 {
			l.LineStyle.Dashes = []vg.Length{vg.Points(6), vg.Points(4)}
		}
		p.Add(l)
	}
}

// fitBand makes the y axis show the tolerance band with some room beyond,
// and raises its top so that a legend of n lines, top right, does not cover
// the data.
func fitBand(p *plot.Plot, tol float64, n int) {
	p.Y.Min, p.Y.Max = math.Min(p.Y.Min, -1.6*tol), math.Max(p.Y.Max, 1.6*tol)
	pad := 0.06 * (p.Y.Max - p.Y.Min) // markers at the extremes stay whole
	p.Y.Min, p.Y.Max = p.Y.Min-pad, p.Y.Max+pad
	if n > 1 {
		p.Y.Max += (p.Y.Max - p.Y.Min) * 0.07 * float64(n)
	}
}

func glyph(i int) draw.GlyphStyle {
	return draw.GlyphStyle{Color: plotutil.Color(i), Shape: plotutil.Shape(i), Radius: vg.Points(4.5)}
}

// meanSpread are points with symmetric error bars.
type meanSpread struct {
	plotter.XYs
	err []float64
}

func (m meanSpread) YError(i int) (float64, float64) { return m.err[i], m.err[i] }

func notesPanel(groups []Group, opt Options) (*plot.Plot, error) {
	p := newPanel("Mean ± spread per spelled note, along the line of fifths (n = notes held)",
		"spelled note (written pitch), flat side ← → sharp side", "cents from target")
	labels := noteAxis(groups)
	p.NominalX(labels...)
	band(p, opt.Tolerance, false, 0)
	for gi, g := range groups {
		offset := (float64(gi) - float64(len(groups)-1)/2) * 0.2
		var m meanSpread
		var counts plotter.XYLabels
		for _, s := range g.Notes {
			x := float64(slices.Index(labels, s.Label)) + offset
			m.XYs = append(m.XYs, plotter.XY{X: x, Y: s.Mean})
			m.err = append(m.err, s.Spread)
			counts.XYs = append(counts.XYs, plotter.XY{X: x, Y: s.Mean + s.Spread})
			counts.Labels = append(counts.Labels, countLabel(s))
		}
		bars, err := plotter.NewYErrorBars(m)
		if err != nil {
			return nil, err
		}
		bars.LineStyle.Color, bars.LineStyle.Width = plotutil.Color(gi), vg.Points(1.5)
		pts, _ := plotter.NewScatter(m.XYs)
		pts.GlyphStyle = glyph(gi)
		n, _ := plotter.NewLabels(counts)
		for i := range n.TextStyle {
			n.TextStyle[i].Font.Size = 9
			n.TextStyle[i].XAlign = draw.XCenter
		}
		n.Offset = vg.Point{Y: vg.Points(4)}
		p.Add(bars, pts, n)
		if len(groups) > 1 {
			p.Legend.Add(g.Title(), pts)
		}
	}
	fitBand(p, opt.Tolerance, len(groups))
	p.X.Min, p.X.Max = -0.6, float64(len(labels))-0.4
	return p, nil
}

// countLabel is the note's count, and how many sat on the other spelling:
// "n 12", "n 5, 2 on Gb4".
func countLabel(s Stats) string {
	if s.NearerAlt > 0 {
		return fmt.Sprintf("n %d, %d on %s", s.Count, s.NearerAlt, s.AltLabel)
	}
	return fmt.Sprintf("n %d", s.Count)
}

// noteAxis is every spelled note in the groups, along the line of fifths.
func noteAxis(groups []Group) []string {
	var all []Stats
	for _, g := range groups {
		for _, s := range g.Notes {
			if !slices.ContainsFunc(all, func(a Stats) bool { return a.Label == s.Label }) {
				all = append(all, s)
			}
		}
	}
	slices.SortStableFunc(all, func(a, b Stats) int {
		return cmp.Or(cmp.Compare(a.Fifths, b.Fifths), cmp.Compare(octaveOf(a.Label), octaveOf(b.Label)))
	})
	labels := make([]string, len(all))
	for i, s := range all {
		labels[i] = s.Label
	}
	return labels
}

func octaveOf(label string) int {
	n, _ := target.ParseNote(label)
	return n.Octave
}

func timePanel(entries []journal.Entry, groups []Group, opt Options) (*plot.Plot, error) {
	t0, t1 := entries[0].Time, entries[0].Time
	for _, e := range entries {
		t0, t1 = minTime(t0, e.Time), maxTime(t1, e.Time)
	}
	unit, perUnit := timeUnit(t1.Sub(t0))
	p := newPanel("Deviation over the rehearsal, with each trend line", unit+" since the first note", "cents from target")
	band(p, opt.Tolerance, false, 0)
	for gi, g := range groups {
		var xys plotter.XYs
		mx := 0.0 // mean time, minutes: the trend line passes through (mx, mean)
		for _, e := range entries {
			if g.Holds(e) {
				m := e.Time.Sub(t0).Minutes()
				xys = append(xys, plotter.XY{X: m / perUnit, Y: e.Cents})
				mx += m
			}
		}
		mx /= float64(len(xys))
		pts, err := plotter.NewScatter(xys)
		if err != nil {
			return nil, err
		}
		pts.GlyphStyle = glyph(gi)
		pts.GlyphStyle.Radius = vg.Points(3)
		p.Add(pts)
		if tr := g.All.Trend; tr.Known {
			first := slices.MinFunc(xys, func(a, b plotter.XY) int { return cmp.Compare(a.X, b.X) }).X * perUnit
			at := func(m float64) plotter.XY {
				return plotter.XY{X: m / perUnit, Y: g.All.Mean + tr.SlopePerMinute*(m-mx)}
			}
			line, _ := plotter.NewLine(plotter.XYs{at(first), at(first + tr.Minutes)})
			line.LineStyle.Color, line.LineStyle.Width = plotutil.Color(gi), vg.Points(2)
			line.LineStyle.Dashes = plotutil.Dashes(gi)
			p.Add(line)
			if len(groups) == 1 {
				p.Legend.Add("trend: "+tr.Words, line)
			}
		}
	}
	fitBand(p, opt.Tolerance, 2)
	return p, nil
}

// timeUnit picks the time axis's unit for a span: its name and its length
// in minutes.
func timeUnit(span time.Duration) (string, float64) {
	switch {
	case span < 2*time.Minute:
		return "seconds", 1.0 / 60
	case span < 3*time.Hour:
		return "minutes", 1
	}
	return "hours", 60
}

func histogramPanel(entries []journal.Entry, opt Options) (*plot.Plot, error) {
	p := newPanel("How far the notes sat (all notes)", "cents from target", "notes")
	vs := make(plotter.Values, len(entries))
	for i, e := range entries {
		vs[i] = e.Cents
	}
	lo, hi := plotter.Range(vs)
	bins := int(math.Min(40, math.Max(8, math.Ceil((hi-lo)/2)))) // about 2 ¢ a bar
	h, err := plotter.NewHist(vs, bins)
	if err != nil {
		return nil, err
	}
	h.FillColor = color.Gray{Y: 160}
	h.LineStyle.Width = vg.Points(0.5)
	tallest := 0.0
	for _, b := range h.Bins {
		tallest = math.Max(tallest, b.Weight)
	}
	p.Add(h)
	band(p, opt.Tolerance, true, tallest)
	p.X.Min, p.X.Max = math.Min(p.X.Min, -1.6*opt.Tolerance), math.Max(p.X.Max, 1.6*opt.Tolerance)
	return p, nil
}

func minTime(a, b time.Time) time.Time {
	if b.Before(a) {
		return b
	}
	return a
}

func maxTime(a, b time.Time) time.Time {
	if b.After(a) {
		return b
	}
	return a
}
