package main

import (
	"fmt"
	"strings"
	"testing"
)

// choirScene is the one-microphone choir of TestVoicesOfRenderedEnsembles,
// which is also read on other frame grids.
const choirScene = "choir, four parts"

// frameGridShifts are the silences (seconds) prepended to a scene's
// mixture, so the estimator's frames (a hop of 4096 samples, 92.9 ms at
// 44.1 kHz) fall elsewhere on its notes: steps of about 5.3 ms, and 23 ms.
var frameGridShifts = []float64{0.0053, 0.0107, 0.016, 0.0213, 0.023}

// holdOnFrameGrid reads the scene again begun later by each of
// frameGridShifts, from the one render, and holds every reading to the
// figures in frameGridFigures; at0 is the reading on the take's own grid.
func (rs renderedScene) holdOnFrameGrid(t *testing.T, at0 figures) {
	t.Helper()
	var table strings.Builder
	fmt.Fprintf(&table, "shift_ms  missed  split  median  worst  just\n")
	row := func(shift float64, f figures) {
		fmt.Fprintf(&table, "%8.1f  %6d  %5d  %6.3f  %5.3f  %4.2f\n", 1000*shift, f.missed, f.split, f.median, f.worst, f.just)
	}
	row(0, at0)
	for _, shift := range frameGridShifts {
		got := rs.hear(t, shift)
		row(shift, got)
	}
	t.Logf("%s on other frame grids:\n%s", rs.sc.name, table.String())
}
