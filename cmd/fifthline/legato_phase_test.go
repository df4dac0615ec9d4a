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
	for _, run := range legatoRunsNamed(t, "violin-high-", 2) {
		analyzeAtEveryHopPhase(t, run, 0)
	}
}

// The violin's sixteenths (G3–B4, vibrato from each note's start) at every
// phase of the hop, as the high runs above: every note heard, in order,
// and read within the middle 80 % of its sound's pitches (checkLegato); at
// least 9 of the 16 within legatoCents of their sound's median (measured:
// 9–13; 8–12 before a quick note slurred between two others was read
// through its slurs as well, see pitchdetect/slurspan.go; 6–10 before a
// quick note turning in its vibrato was read whole, see
// pitchdetect/glide.go's slurredFrom). (Measured before a slurred note's attack read an octave low was
// taken for its own, see pitchdetect/lowattack.go: the C5 slurred from E5
// read C4 for most of its frames, and was given out as C4 at one phase
// and lost at two.)
func TestAnalyzeHearsTheViolinsSixteenthsAtEveryHopPhase(t *testing.T) {
	t.Parallel()
	for _, run := range legatoRunsNamed(t, "violin-0.15s", 1) {
		analyzeAtEveryHopPhase(t, run, 9)
	}
}

// The flute's eighths at every phase of the hop, as the violin's high runs
// above. Their C6 (slurred from D6) rises 16 ¢ through its 0.3 s, holding
// still halfway: a note with no settled part, whose pitch is its median.
// At each phase at least 15 of the 16 notes read within legatoCents of
// their sound's median pitch (measured: 15; the D6 reads 3.7 ¢ flat of its
// median at every phase. Before a quick note slurred between two others was
// read through its slurs as well, see pitchdetect/slurspan.go: 14 or 15,
// the D6 3.9 ¢ flat, the E5 2.3–2.5 ¢ flat at four phases). (Measured
// before a note that holds still and moves on was denied a glide, see
// pitchdetect/glide.go: the C6 read 8.0–8.9 ¢ sharp of its median at six
// of the eight phases, and 13 notes were within.)
func TestAnalyzeReadsTheFlutesEighthsAtEveryHopPhase(t *testing.T) {
	t.Parallel()
	for _, run := range legatoRunsNamed(t, "flute-0.3s", 1) {
		analyzeAtEveryHopPhase(t, run, 15)
	}
}

// legatoRunsNamed gives the rendered runs whose names begin with prefix
// (an instrument's register, or a run at one speed), and fails unless
// there are n.
func legatoRunsNamed(t *testing.T, prefix string, n int) []legatoRun {
	t.Helper()
	var named []legatoRun
	for _, run := range renderLegatoRuns(t) {
		if strings.HasPrefix(run.name, prefix) {
			named = append(named, run)
		}
	}
	if len(named) != n {
		t.Fatalf("%d runs named %s…, want %d", len(named), prefix, n)
	}
	return named
}

// analyzeAtEveryHopPhase runs analyze on run delayed by 0, 64, … 448
// samples, checks each reading with checkLegato, and wants at least
// nearMedian notes within legatoCents of their sound's median at each.
func analyzeAtEveryHopPhase(t *testing.T, run legatoRun, nearMedian int) {
	t.Helper()
	dir := t.TempDir()
	for delay := 0; delay < 512; delay += hopPhaseStep {
		rows := analyzeDelayed(t, dir, run, delay)
		how := fmt.Sprintf("analyze delayed %d samples", delay)
		if near := checkLegato(t, how, []legatoRun{run}, rows); len(near) == 1 && near[0] < nearMedian {
			t.Errorf("%s %s: %d notes read within %g ¢ of their sound's median pitch, want at least %d", how, run.name, near[0], legatoCents, nearMedian)
		}
	}
}

// hopPhaseStep is the delay, in samples, between the hop phases tried.
const hopPhaseStep = 64

// analyzeDelayed is analyze's held-note rows of run delayed by delay
// samples (sox's pad), the file written in dir.
func analyzeDelayed(t *testing.T, dir string, run legatoRun, delay int) []map[string]string {
	t.Helper()
	wav := filepath.Join(dir, fmt.Sprintf("%s-delayed-%d.wav", run.name, delay))
	soxTB(t, run.wav, wav, "pad", fmt.Sprintf("%ds", delay))
	code, out, stderr := runLong(t, "analyze", wav)
	if code != 0 {
		t.Fatalf("%s delayed %d samples: exit %d: %s", run.name, delay, code, stderr)
	}
	_, rows := readCSV(t, out)
	return rows
}
