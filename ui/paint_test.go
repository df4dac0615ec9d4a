package ui

import (
	"strings"
	"testing"

	"github.com/gdamore/tcell/v2"
)

// A redraw that writes only changed cells leaves the screen exactly as a
// full repaint would: shorter lines are blanked, roles change, wide runes
// take two columns.
func TestPaintingChangesLeavesTheFullPicture(t *testing.T) {
	before := []screenLine{
		{text("F♯4 +41.1", lit), text(" sharp", dim)},
		plain("a long line that will be shortened"),
		plain("音 wide"),
	}
	after := []screenLine{
		{text("G♭4 −2.0", lit)},
		dimLine("short"),
		nil,
		plain("音音 new row"),
	}
	screen := func() tcell.SimulationScreen {
		s := tcell.NewSimulationScreen("UTF-8")
		if err := s.Init(); err != nil {
			t.Fatal(err)
		}
		s.SetSize(40, 5)
		return s
	}
	incremental, fresh := screen(), screen()
	var p, q painter
	p.paint(incremental, before, 0, 0, 40, 5, true)
	p.paint(incremental, after, 0, 0, 40, 5, false)
	q.paint(fresh, after, 0, 0, 40, 5, true)
	incremental.Show()
	fresh.Show()
	got, _, _ := incremental.GetContents()
	want, _, _ := fresh.GetContents()
	for i := range want {
		g, w := got[i], want[i]
		if string(g.Runes) != string(w.Runes) || g.Style != w.Style {
			t.Errorf("cell (%d,%d): %q %v after a change, %q %v painted fresh", i%40, i/40, string(g.Runes), g.Style, string(w.Runes), w.Style)
		}
	}
	if s := screenText(incremental); !strings.HasPrefix(s, "G♭4 −2.0 ") || strings.Contains(s, "shortened") {
		t.Errorf("screen after the change:\n%s", s)
	}
}
