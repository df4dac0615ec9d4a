package main

import (
	"fmt"
	"path/filepath"
	"strings"
	"testing"
)

// The violin's high runs at every phase of the detector's hop. Live, a
// run's notes start wherever the stream's hops happen to fall; offline,
// the same render delayed by 0, 64, … 448 samples (sox's pad) takes each
// of eight phases of the 512-sample hop at 48 kHz. At each, analyze hears
// the sixteenths and the eighths note for note, each read within
// legatoCents of the pitch its own sound has (checkLegato: aubio's yin on
// the key rendered alone). (Measured before the detector's second reading, see
// pitchdetect/stray.go: at 4 of the 8 phases a C6 or C♯6 kept only two
// voiced frames and was lost.)
func TestAnalyzeHearsTheViolinsHighRunAtEveryHopPhase(t *testing.T) {
	t.Parallel()
	var high []legatoRun
	for _, run := range renderLegatoRuns(t) {
		if strings.HasPrefix(run.name, "violin-high-") {
			high = append(high, run)
		}
	}
	if len(high) != 2 {
		t.Fatalf("%d runs of the violin's high sixteenths, want 1", len(high))
	}
	dir := t.TempDir()
	for _, run := range high {
		for delay := 0; delay < 512; delay += 64 {
			wav := filepath.Join(dir, fmt.Sprintf("%s-delayed-%d.wav", run.name, delay))
			soxTB(t, run.wav, wav, "pad", fmt.Sprintf("%ds", delay))
			code, out, stderr := runLong(t, "analyze", wav)
			if code != 0 {
				t.Fatalf("%s delayed %d samples: exit %d: %s", run.name, delay, code, stderr)
			}
			_, rows := readCSV(t, out)
			checkLegato(t, fmt.Sprintf("analyze delayed %d samples", delay), []legatoRun{run}, rows)
		}
	}
}
