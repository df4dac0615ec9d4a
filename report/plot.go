package report

import (
	"fmt"
	"image/color"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"fifthline/journal"
)

// The picture: 12 inches wide, a sheet to pin up, with a title and one row
// of panels per player and tuning (at most PlotRows); PNG at PlotDPI.
const (
	PlotWidth  = 12 * vg.Inch
	PlotTitle  = 0.8 * vg.Inch
	PlotRow    = 3.6 * vg.Inch
	PlotRows   = 12
	PlotDPI    = 150 // so the PNG is 1800 pixels wide
	panelInset = 0.08 * vg.Inch
)

// PlotHeight is the picture's height for this many groups.
func PlotHeight(groups int) vg.Length {
	return PlotTitle + PlotRow*vg.Length(max(1, min(groups, PlotRows)))
}

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

// Plot draws, under a title, one row of three panels per group (player and
// tuning), never pooling groups: mean ± scatter per spelled note along the
// line of fifths, with each note's count under its name; then cents over
// the rehearsal with the trend line, or, with ByRehearsal, each note's mean
// per rehearsal; then a histogram of the notes' cents. Notes on the other
// spelling are counted under their note and left out of the panels' points.
// The tolerance band is dashed; cents are labelled in whole cents.
func Plot(w io.Writer, format string, entries []journal.Entry, groups []Group, opt Options) error {
	if len(groups) == 0 {
		return fmt.Errorf("no notes to draw")
	}
	width, height := PlotWidth, PlotHeight(len(groups))
	var canvas vg.CanvasWriterTo
	switch format {
	case "png":
		canvas = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(PlotDPI))}
	case "svg":
		canvas = vgsvg.New(width, height)
	default:
		return fmt.Errorf("format %q: png or svg", format)
	}
	dc := draw.New(canvas)
	dc.FillPolygon(color.White, []vg.Point{dc.Min, {X: dc.Max.X, Y: dc.Min.Y}, dc.Max, {X: dc.Min.X, Y: dc.Max.Y}})
	drawTitle(dc, plotTitle(entries, groups, opt))
	shown := groups[:min(len(groups), PlotRows)]
	for i, g := range shown {
		top := dc.Max.Y - PlotTitle - PlotRow*vg.Length(i)
		row := draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{Min: vg.Point{X: dc.Min.X, Y: top - PlotRow}, Max: vg.Point{X: dc.Max.X, Y: top}}}
		if len(groups) > 1 {
			drawRowTitle(row, g)
			row = draw.Crop(row, 0, 0, 0, -rowTitle)
		}
		all := entriesOf(g, entries)
		mine := onSpelling(all)
		second := func() (*plot.Plot, error) { return timePanel(g, mine, opt) }
		if opt.ByRehearsal {
			second = func() (*plot.Plot, error) { return rehearsalPanel(g, opt) }
		}
		panels := []panelSpec{
			{func() (*plot.Plot, error) { return notesPanel(all, opt) }, 0.42},
			{second, 0.36},
			{func() (*plot.Plot, error) { return histogramPanel(mine, opt) }, 0.22},
		}
		if len(g.Roles) > 0 { // the chord roles beside the notes
			for i, share := range []float64{0.29, 0.33, 0.16} {
				panels[i].share = share
			}
			panels = append(panels, panelSpec{func() (*plot.Plot, error) { return rolesPanel(g, opt) }, 0.22})
		}
		x := row.Min.X
		for _, pn := range panels {
			p, err := pn.make()
			if err != nil {
				return err
			}
			w := vg.Length(pn.share) * (row.Max.X - row.Min.X)
			at := draw.Canvas{Canvas: row.Canvas, Rectangle: vg.Rectangle{Min: vg.Point{X: x, Y: row.Min.Y}, Max: vg.Point{X: x + w, Y: row.Max.Y}}}
			p.Draw(draw.Crop(at, panelInset, -panelInset, panelInset, -panelInset))
			x += w
		}
	}
	_, err := canvas.WriteTo(w)
	return err
}

// panelSpec is one panel of a row: how to draw it and its share of the
// row's width.
type panelSpec struct {
	make  func() (*plot.Plot, error)
	share float64
}

// entriesOf is the group's notes.
func entriesOf(g Group, entries []journal.Entry) []journal.Entry {
	var out []journal.Entry
	for _, e := range entries {
		if g.Holds(e) {
			out = append(out, e)
		}
	}
	return out
}

// onSpelling is the notes that sat on their own spelling.
func onSpelling(es []journal.Entry) []journal.Entry {
	var out []journal.Entry
	for _, e := range es {
		if !e.SatOnOther() {
			out = append(out, e)
		}
	}
	return out
}

func plotTitle(entries []journal.Entry, groups []Group, opt Options) [2]string {
	first, last := slices.MinFunc(entries, byTime).Time, slices.MaxFunc(entries, byTime).Time
	when := first.Format("2 Jan 2006 15:04") + " – " + last.Format("15:04")
	if Rehearsal(journal.Entry{Time: first}) != Rehearsal(journal.Entry{Time: last}) {
		when = first.Format("2 Jan 2006") + " – " + last.Format("2 Jan 2006")
	}
	held := plural(countNotes(entries), "held note")
	if len(groups) == 1 {
		held = groups[0].Held()
	}
	sub := fmt.Sprintf("%s · %s · tolerance ±%g ¢", held, when, opt.Tolerance)
	if len(groups) > PlotRows {
		sub += fmt.Sprintf(" · the first %d of %d rows shown (use --player or --key)", PlotRows, len(groups))
	}
	if len(groups) == 1 {
		return [2]string{groups[0].Title(), sub}
	}
	// One microphone's voices are not players: a journal of both counts
	// each apart (a quartet's takes and a duet read with --voices).
	players, voices, tunings := map[string]bool{}, map[string]bool{}, map[tuningOf]bool{}
	for _, g := range groups {
		if g.Voice != "" && g.Player == "" {
			voices[g.Who()] = true
		} else {
			players[g.Who()] = true
		}
		tunings[g.tuning()] = true
	}
	who, each := plural(len(players), "player"), "player"
	switch {
	case len(players) == 0:
		who, each = plural(len(voices), "voice"), "voice"
	case len(voices) > 0:
		who, each = who+" and "+plural(len(voices), "voice"), "player or voice"
	}
	return [2]string{fmt.Sprintf("Rehearsal report: %s, %s (a row for each %s in each tuning)",
		who, plural(len(tunings), "tuning"), each), sub}
}

// rowTitle is the height of the line naming a row's player and tuning.
const rowTitle = 0.3 * vg.Inch

func drawRowTitle(row draw.Canvas, g Group) {
	sty := plot.New().Title.TextStyle
	sty.XAlign, sty.YAlign = draw.XLeft, draw.YTop
	sty.Font.Size = 15
	row.FillText(sty, vg.Point{X: row.Min.X + 0.15*vg.Inch, Y: row.Max.Y - 0.05*vg.Inch}, g.Title()+" — "+g.Held())
}

func drawTitle(dc draw.Canvas, title [2]string) {
	sty := plot.New().Title.TextStyle
	sty.XAlign, sty.YAlign = draw.XCenter, draw.YTop
	x := (dc.Min.X + dc.Max.X) / 2
	sty.Font.Size = 20
	dc.FillText(sty, vg.Point{X: x, Y: dc.Max.Y - 0.1*vg.Inch}, title[0])
	sty.Font.Size = 13
	dc.FillText(sty, vg.Point{X: x, Y: dc.Max.Y - PlotTitle/2 - 0.02*vg.Inch}, title[1])
}
