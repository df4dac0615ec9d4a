package main

import (
	"fmt"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
)

// Quick legato runs that nothing in the detector was tuned on, rendered
// and judged as legatoRuns (fluidsynth, FluidR3, reverb and chorus off;
// truth: each key rendered alone as long, aubio's yin over its span,
// renderedPitch): other ranges and shapes on the same five instruments, as
// sixteenths at ♩ = 100 (0.15 s) and eighths at ♩ = 120 (60/120/2 =
// 0.25 s). Wide leaps of a sixth or more, chromatic runs, arpeggios with
// no note repeated, the clarinet across its break (B♭4 to B4, throat to
// upper register), the violin low on its G string, the trumpet low (C4 to
// G4), the flute's low octave.
//
// Every note is found at the hop's phase 0. The floors (nearMedian,
// sixteenths and eighths, within legatoCents of their sound's median) are
// what was measured, the notes missed and why beside each:
//   - clarinet: the A3 sixteenth slurred from C4 reads 2.2 ¢ flat (the
//     old runs' A3 too); the first F4 and G4 eighths sound 2.6 and 3.1 ¢
//     sharp of the keys alone by aubio's own frames on the run, and are
//     read within 1 ¢ of those.
//   - flute: the first C4, after silence, reads 6.5 ¢ under aubio's frames
//     on the run (the detector's longer window over its wavering attack);
//     the F4, E♭4 and E4 eighths hold, then rise 5–10 ¢ into their
//     release, and read 5–7 ¢ above their sound's median (the rise taken
//     for an attack's glide, as a held clarinet's is rightly).
//   - oboe: the C5 sixteenth 2.0 ¢ flat; the last C4, 4.8 ¢ flat.
//   - violin: its vibrato (±12–25 ¢ from a note's first cycle) leaves a
//     quick note part of a cycle: 2–3.6 ¢ either way (the old runs' too).
//   - trumpet: its attack rises 25–45 ¢; sixteenths on a leap read 2–4 ¢
//     under the median of that rise, and the last C♯4 and C4, rising into
//     their release, 5.2 and 2.5 ¢ over. (The first C4, after silence,
//     read 3.8 ¢ over until its drift was judged from half a window into
//     it, pitchdetect/summarise.go: 184 -> 186 of 224.)
//
// Before a slurred note parted from the note before was held a note from
// 0.075 s (pitchdetect/slurnote.go) the violin's G3 on the G string and
// its D5 between G5 and G4 were lost (sixteenths); before a last note's
// drift was judged on its sound alone (pitchdetect/margin.go's
// beforeRelease) the trumpet's last C♯4 and C4 read 7.3 and 9.1 ¢ sharp
// and the oboe's last C4 eighth 2.0 ¢ flat: 182 -> 184 of 224 within
// legatoCents, 222 -> 224 found.
//
// Which misses are the detector's, at phase 0 (the 40 of 224 before the
// trumpet's first C4s): where aubio's yin on the run itself, over the same
// span of the note, reads within legatoCents of the truth, the detector's
// (23: the trumpet's 9, the violin's 9, the flute's 3, the clarinet's A3 and
// the oboe's last C4); where it lies over legatoCents from the truth and
// within legatoCents of the detector, the truth's (11: the violin's 8, the
// clarinet's first F4 and G4 and its second G4 eighths); the rest both (6:
// the violin's 3, the flute's F4 and E4 eighths, the oboe's C5). Aubio's
// yinfft on the key alone, a second outside reader, lies 1–5 ¢ from yin
// there; the two readers' mean as the truth read 2 fewer notes within
// legatoCents (the violin's 6 more, the trumpet's 9 fewer: yinfft hears
// its rising attacks sharper), so the truth stays yin's (measured).
//
// Over both sets of runs (these and
// legatoRuns), both speeds and the hop's eight phases, 654 of 3326 notes
// found read over legatoCents from their truth: the violin's 398, the
// trumpet's 128, the flute's 56, the oboe's 39, the clarinet's 33. Aubio's
// yin over the run itself (the same span of each note) reads within
// legatoCents of that truth for only 463 of the violin's 1023 notes (the
// detector 625): slurred, a quick violin note's first 60–80 ms, part of
// its vibrato's cycle, lie under the note before, where no reader of one
// pitch hears them, so most of its misses are the truth's (the key alone).
// The trumpet's are the detector's: aubio on the run 735 of 767, the
// detector 639; its attack rises some 0.2 ¢ a millisecond, so a span read
// 10 ms off is 2 ¢ off. Reading a slurred rising note at the middle of
// its span (a line through its frames there) gained 21 notes in all (the
// trumpet's 639 -> 663) but lost others, at phase 0 too (the low
// trumpet's G4s then read 2–3 ¢ sharp), and was left out (measured).
var unseenLegatoRuns = []legatoPhrase{
	{"clarinet-break", 71, []int{65, 67, 69, 70, 71, 72, 74, 72, 70, 67, 76, 72, 64, 57, 53, 60}, [2]int{15, 13}},
	{"flute-low", 73, []int{60, 64, 67, 72, 69, 65, 62, 71, 67, 63, 61, 62, 70, 66, 64, 60}, [2]int{14, 13}},
	{"oboe-chromatic", 68, []int{67, 68, 69, 70, 71, 72, 73, 74, 75, 76, 64, 72, 81, 77, 69, 60}, [2]int{14, 16}},
	{"violin-g-string", 40, []int{55, 56, 57, 58, 59, 60, 61, 62, 58, 55, 64, 60, 57, 67, 63, 59}, [2]int{11, 12}},
	{"violin-leaps", 40, []int{55, 62, 71, 79, 74, 67, 59, 64, 72, 76, 69, 60, 65, 74, 81, 77}, [2]int{10, 11}},
	{"trumpet-low", 56, []int{60, 62, 64, 65, 67, 63, 60, 67, 61, 66, 62, 65, 60, 64, 67, 61}, [2]int{14, 16}},
	{"trumpet-leaps", 56, []int{60, 69, 65, 74, 67, 76, 72, 64, 70, 62, 71, 67, 79, 72, 65, 60}, [2]int{11, 16}},
}

// unseenAtEveryPhase is, for each run's sixteenths over the hop's eight
// phases (128 notes), how many were found and how many read within
// legatoCents of their sound's median: measured, floors. At one phase in
// eight the violin's A5 (its attack 27 ¢ under where it settles) slurred
// from D5, and the trumpet's G5 slurred up an octave from G4, keep 8
// frames straight on from the note before and were lost as blips under
// MinSeconds until such a run of twice MinFrames frames was held a note
// (pitchdetect/slurnote.go): 1790 -> 1792 of 1792 found (both speeds),
// 1423 within legatoCents (before: 1783, 1413; then 1790, 1421). A
// slurred note after silence judged drifting from half a window into it
// (pitchdetect/summarise.go): the trumpet's first C4s, 98 -> 104 and
// 69 -> 76; a glide left out in proportion while the hold lasts one to two
// glides, 104 -> 105.
var unseenAtEveryPhase = map[string][2]int{
	"clarinet-break-0.15s":  {128, 124},
	"flute-low-0.15s":       {128, 110},
	"oboe-chromatic-0.15s":  {128, 100},
	"violin-g-string-0.15s": {128, 81},
	"violin-leaps-0.15s":    {128, 81},
	"trumpet-low-0.15s":     {128, 105},
	"trumpet-leaps-0.15s":   {128, 76},
}

// unseenSeconds: sixteenths at ♩ = 100 and eighths at ♩ = 120.
var unseenSeconds = [2]float64{0.15, 0.25}

// renderUnseenLegatoRuns renders the unseen runs with their truth, once.
func renderUnseenLegatoRuns(t *testing.T) []legatoRun {
	t.Helper()
	return sharedOnce(t, "unseen legato runs", func(dir string) []legatoRun {
		return renderLegatoRunsIn(t, dir, unseenLegatoRuns, unseenSeconds)
	})
}

// legatoCount is what a reading of a run found: its notes heard in order
// (the longest common subsequence of spellings), and how many of those
// read within legatoCents of their sound's median.
type legatoCount struct{ found, near, notes int }

func (c *legatoCount) add(d legatoCount) {
	c.found, c.near, c.notes = c.found+d.found, c.near+d.near, c.notes+d.notes
}

func (c legatoCount) String() string {
	return fmt.Sprintf("found %d of %d, %d within %g ¢ of their sound's median", c.found, c.notes, c.near, legatoCents)
}

// countLegato matches rows to a run's notes in order and counts them; off
// lists the notes lost or read off.
func countLegato(run legatoRun, rows []map[string]string) (c legatoCount, off []string) {
	want := make([]string, len(run.keys))
	for i, k := range run.keys {
		want[i] = spelledInC(k)
	}
	// lcs[i][j]: the longest common subsequence of want[i:] and rows[j:].
	lcs := make([][]int, len(want)+1)
	for i := range lcs {
		lcs[i] = make([]int, len(rows)+1)
	}
	for i := len(want) - 1; i >= 0; i-- {
		for j := len(rows) - 1; j >= 0; j-- {
			if want[i] == rows[j]["note"] {
				lcs[i][j] = lcs[i+1][j+1] + 1
			} else {
				lcs[i][j] = max(lcs[i+1][j], lcs[i][j+1])
			}
		}
	}
	c.notes = len(want)
	for i, j := 0, 0; i < len(want); {
		switch {
		case j < len(rows) && want[i] == rows[j]["note"] && lcs[i][j] == lcs[i+1][j+1]+1:
			hz, _ := strconv.ParseFloat(rows[j]["hz"], 64)
			dev := testsignal.Cents(hz, run.truth[i].span)
			c.found++
			if dev >= -legatoCents && dev <= legatoCents {
				c.near++
			} else {
				off = append(off, fmt.Sprintf("%s#%d %+.1f ¢", want[i], i+1, dev))
			}
			i, j = i+1, j+1
		case j < len(rows) && lcs[i][j+1] >= lcs[i+1][j]:
			off = append(off, fmt.Sprintf("extra %s", rows[j]["note"]))
			j++
		default:
			off = append(off, fmt.Sprintf("%s#%d lost", want[i], i+1))
			i++
		}
	}
	return c, off
}

func TestAnalyzeHearsUnseenQuickLegatoRuns(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var total legatoCount
	for _, run := range renderUnseenLegatoRuns(t) {
		c, off := countLegato(run, analyzeDelayed(t, dir, run, 0))
		total.add(c)
		t.Logf("%s: %s; %s", run.name, c, strings.Join(off, ", "))
		if c.found < c.notes || c.near < run.nearMedian {
			t.Errorf("%s: %s, want all found and %d within", run.name, c, run.nearMedian)
		}
	}
	t.Logf("all: %s", total)
}

// The unseen runs' sixteenths at every phase of the hop (analyzeAtEveryHopPhase's
// delays), held to unseenAtEveryPhase.
func TestAnalyzeHearsUnseenQuickLegatoRunsAtEveryHopPhase(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, run := range renderUnseenLegatoRuns(t) {
		floor, ok := unseenAtEveryPhase[run.name]
		if !ok {
			continue
		}
		var sum legatoCount
		var offs []string
		for delay := 0; delay < 512; delay += hopPhaseStep {
			c, off := countLegato(run, analyzeDelayed(t, dir, run, delay))
			sum.add(c)
			if len(off) > 0 {
				offs = append(offs, fmt.Sprintf("%d: %s", delay, strings.Join(off, ", ")))
			}
		}
		t.Logf("%s over 8 phases: %s; %s", run.name, sum, strings.Join(offs, "; "))
		if sum.found < floor[0] || sum.near < floor[1] {
			t.Errorf("%s over the hop's 8 phases: %s, was %d found, %d within", run.name, sum, floor[0], floor[1])
		}
	}
}

// The unseen runs played live, one after another, into a private virtual
// microphone and heard by `listen --plain`, as
// TestListenHearsEveryNoteOfQuickLegatoRuns: every note found (the
// readings depend on where the stream's hops fall, so only finding is
// held). Before a slurred note read straight on from the note before was
// held a note (unseenAtEveryPhase) the trumpet's G5 and the violin's A5
// could be lost live: the suite's run lost the G5 once (223 of 224,
// measured under load). Since, every note at every phase offline, and live
// 224 of 224 in its own runs and in one of two runs on the merged tree;
// the other, with five other test processes on the two cores, lost the
// violin's G5 of its leaps and heard an extra C♯2 (measured once; the
// cause not found): one note in 224 may be lost live, no more.
func TestListenHearsUnseenQuickLegatoRuns(t *testing.T) {
	t.Parallel()
	_, env, play := privateMic(t)
	runs := renderUnseenLegatoRuns(t)
	wait, proc := startPlainProcess(t, env, "--duration", "5m")
	for _, run := range runs {
		play(run.wav)
	}
	_, rows := readCSV(t, interruptPlain(t, proc, wait))
	whole := legatoRun{name: "all"}
	for _, run := range runs {
		whole.keys = append(whole.keys, run.keys...)
		whole.truth = append(whole.truth, run.truth...)
	}
	c, off := countLegato(whole, rows)
	t.Logf("listen: %s; %s", c, strings.Join(off, ", "))
	if c.found < c.notes-1 {
		t.Errorf("listen: %s, want every note found but at most one", c)
	}
}
