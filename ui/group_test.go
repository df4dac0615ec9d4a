package ui

import (
	"math"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/mattn/go-runewidth"

	"fifthline/target"
)

// Equal-tempered pitches at A4 = 440 Hz, 440·2^(n/12) (ISO 16).
func et(semitonesFromA4 int) float64 { return 440 * math.Exp2(float64(semitonesFromA4)/12) }

var (
	e3, b3, gSharp4   = et(-17), et(-10), et(-1)
	d3, a3, etFSharp4 = et(-19), et(-12), et(-3)
)

// Handbook values: an equal-tempered major third is 400 ¢ against the just
// 5/4's 386.31 ¢, 13.69 ¢ wide; its fifth 700 ¢ against 3/2's 701.96 ¢.
const (
	etThirdOverJust = 13.69
	etFifthOverJust = -1.96
)

// keyOf is the tuning of a key in equal temperament at A4 = 440 Hz.
func keyOf(t *testing.T, key string) target.Tuning {
	t.Helper()
	tu := target.Default()
	k, err := target.ParseKey(key)
	if err != nil {
		t.Fatal(err)
	}
	tu.Key = k
	return tu
}

// groupHolding is a group meter in which each row has held its pitch (0:
// silent) for a second, a frame every 10 ms.
func groupHolding(tu target.Tuning, names []string, hz ...float64) *groupModel {
	g := newGroupModel(newModel(tu, "test tones"), names, 0)
	feedGroup(g, 0, 1, hz...)
	return g
}

// feedGroup adds frames every 10 ms from from to to seconds.
func feedGroup(g *groupModel, from, to float64, hz ...float64) {
	for t := from; t < to; t += 0.01 {
		g.AddFrame(GroupFrame{Time: t, Hz: hz, Level: -20})
	}
}

var trio = []string{"vc", "vla", "vl"}

func screenOf(g *groupModel, w, h int) string {
	var b strings.Builder
	for _, l := range groupLayout(g, w, h) {
		b.WriteString(l.Text() + "\n")
	}
	return b.String()
}

// The contract's example: in F major a G♯ sounding as the third of E major
// is spelled from the chord's root, not as the key's A♭; each member reads
// against the temperament (0 ¢ here, equal-tempered tones) and against just
// above the sounding root.
func TestGroupRowsAreSpelledFromTheChordsRootAndReadAgainstJust(t *testing.T) {
	g := groupHolding(keyOf(t, "F major"), trio, e3, b3, gSharp4)
	rows := g.readings()
	want := []struct {
		note, role string
		just       float64
	}{{"E3", "root", 0}, {"B3", "fifth", etFifthOverJust}, {"G♯4", "third", etThirdOverJust}}
	for i, w := range want {
		r := rows[i]
		if r.Note.Pretty() != w.note || r.Role != w.role || !r.InChord {
			t.Errorf("row %d: %s as %q (in chord %v), want %s as %s", i+1, r.Note.Pretty(), r.Role, r.InChord, w.note, w.role)
		}
		if math.Abs(r.Cents) > 0.01 || math.Abs(r.Just-w.just) > 0.01 {
			t.Errorf("row %d: %+.2f ¢ tempered, %+.2f ¢ just; want 0 and %+.2f", i+1, r.Cents, r.Just, w.just)
		}
	}
	if got := chordLine(g).Text(); got != "chord E major · root E3" {
		t.Errorf("chord line %q", got)
	}
}

func TestARowSwitchedOffLeavesTheChord(t *testing.T) {
	g := groupHolding(keyOf(t, "F major"), trio, e3, b3, gSharp4)
	g.Toggle(2)
	s := screenOf(g, 80, 24)
	for _, want := range []string{" 3 vl   off — 3 turns it on", "chord E open fifth", "vl off: left out of the chords"} {
		if !strings.Contains(s, want) {
			t.Errorf("no %q:\n%s", want, s)
		}
	}
	g.Toggle(2)
	if got := chordLine(g).Text(); got != "chord E major · root E3" {
		t.Errorf("switched on again: %q", got)
	}
}

// A lone note is no chord: spelled from the key's window, no just reading.
func TestOneNoteAloneIsReadInTheKey(t *testing.T) {
	g := groupHolding(keyOf(t, "F major"), trio, 0, 0, gSharp4)
	r := g.readings()[2]
	if r.Note.Pretty() != "A♭4" || r.InChord {
		t.Errorf("lone G♯/A♭ read as %s (in chord %v), want A♭4 from F major's window (A♭ … C♯)", r.Note.Pretty(), r.InChord)
	}
	s := screenOf(g, 80, 24)
	if !strings.Contains(s, " 1 vc   ·") || !strings.Contains(s, "no chord yet") {
		t.Errorf("silent rows or chord line:\n%s", s)
	}
}

// When the group stops, the last chord stays on the screen, dim, its notes
// still spelled from its root; the next chord pushes it into "before".
func TestTheLastChordStaysAndTheNextPushesItBefore(t *testing.T) {
	g := groupHolding(keyOf(t, "D major"), trio, e3, b3, gSharp4)
	feedGroup(g, 1, 1.5, 0, 0, 0)
	if got := chordLine(g).Text(); got != "last chord E major" {
		t.Errorf("after the chord: %q", got)
	}
	if r := g.readings()[2]; r.Note.Pretty() != "G♯4" || r.Holding || !r.InChord {
		t.Errorf("after the chord, row 3: %+v", r)
	}
	// Players never enter at one moment: the lower two's open fifth for a
	// tenth of a second before the third comes is no chord of the group's.
	feedGroup(g, 1.5, 1.6, d3, a3, 0)
	feedGroup(g, 1.6, 2.5, d3, a3, etFSharp4)
	if got := chordLine(g).Text(); got != "chord D major · root D3" {
		t.Errorf("next chord: %q", got)
	}
	if got := beforeLine(g).Text(); got != "before: E major" {
		t.Errorf("before line %q", got)
	}
}

func TestGroupDriftShowsADashUntilKnown(t *testing.T) {
	g := groupHolding(keyOf(t, "D major"), trio, d3, a3, etFSharp4)
	if got := driftLine(g).Text(); got != "group drift —" {
		t.Errorf("unknown drift: %q", got)
	}
	g.AddFrame(GroupFrame{Time: 1, Hz: []float64{d3, a3, etFSharp4}, Drift: -3.24, DriftKnown: true})
	if got := driftLine(g).Text(); got != "group drift 3.2 ¢ flat of the reference" {
		t.Errorf("known drift: %q", got)
	}
}

func TestStripPutsTheReadingBetweenFlatAndSharp(t *testing.T) {
	for _, c := range []struct {
		cents float64
		want  string
	}{
		{0, "··◆··"}, {13.7, "··│◆·"}, {-25, "◆·│··"}, {40, "··│·▸"}, {-40, "◂·│··"},
	} {
		if got := strip(c.cents, 5); got != c.want {
			t.Errorf("strip(%v) = %q, want %q", c.cents, got, c.want)
		}
	}
}

// The screen at the two sizes musicians use, four players in a D major
// chord: every line fits, every row, the chord, the drift and the status
// are there.
func TestGroupLayoutAt80x24And120x36(t *testing.T) {
	names := []string{"vc", "vla", "vl2", "vl1"}
	g := groupHolding(keyOf(t, "D major"), names, d3, a3, etFSharp4, et(5))
	for _, size := range [][2]int{{80, 24}, {120, 36}} {
		s := screenOf(g, size[0], size[1])
		lines := strings.Split(strings.TrimSuffix(s, "\n"), "\n")
		if len(lines) != size[1] {
			t.Errorf("%dx%d: %d lines", size[0], size[1], len(lines))
		}
		for _, l := range lines {
			if runewidth.StringWidth(l) > size[0] {
				t.Errorf("%dx%d: too wide: %q", size[0], size[1], l)
			}
		}
		for _, want := range []string{"D major · equal", "chord D major · root D3", "group drift —",
			" 1 vc   D3", " 2 vla  A3", " 3 vl2  F♯4", " 4 vl1  D5", "third", "+13.7 ¢", "input −20 dBFS"} {
			if !strings.Contains(s, want) {
				t.Errorf("%dx%d: no %q:\n%s", size[0], size[1], want, s)
			}
		}
		t.Logf("%dx%d:\n%s", size[0], size[1], s)
	}
}

func TestTheGroupScreenInASCII(t *testing.T) {
	g := groupHolding(keyOf(t, "F major"), trio, e3, b3, gSharp4)
	g.ASCII = true
	s := screenOf(g, 80, 24)
	for i := 0; i < len(s); i++ {
		if s[i] >= utf8.RuneSelf {
			t.Fatalf("not ASCII at %q:\n%s", s[i:min(len(s), i+12)], s)
		}
	}
	if !strings.Contains(s, " 3 vl   G#4") || !strings.Contains(s, "*") {
		t.Errorf("ASCII rows:\n%s", s)
	}
}

func TestGroupHelpNamesTheRowKeys(t *testing.T) {
	g := groupHolding(keyOf(t, "F major"), trio)
	g.Help = true
	s := screenOf(g, 80, 24)
	if !strings.Contains(s, "1–3   switch that row off") || !strings.Contains(s, "temperament") {
		t.Errorf("help:\n%s", s)
	}
}

// A note's release is not its pitch: frames 6 dB or more below the note's
// loudest are left out, so the row keeps the steady part's pitch.
func TestARowReadsTheSteadyPartNotTheRelease(t *testing.T) {
	g := newGroupModel(newModel(keyOf(t, "D major"), "test tones"), []string{"vc"}, 0)
	for t := 0.0; t < 1; t += 0.01 {
		g.AddFrame(GroupFrame{Time: t, Hz: []float64{d3}, Levels: []float64{-20}})
	}
	for t := 1.0; t < 1.1; t += 0.01 { // dying away and sagging 8 ¢
		g.AddFrame(GroupFrame{Time: t, Hz: []float64{d3 * math.Exp2(-8.0/1200)}, Levels: []float64{-30}})
	}
	feedGroup(g, 1.1, 1.5, 0)
	if r := g.readings()[0]; r.Holding || math.Abs(r.Cents) > 0.01 {
		t.Errorf("after the release: holding %v, %+.2f ¢; want the steady 0 ¢", r.Holding, r.Cents)
	}
}

// A player who stops while the others hold the chord on stays in it, dim.
func TestAPlayerWhoStopsStaysInTheChord(t *testing.T) {
	g := groupHolding(keyOf(t, "F major"), trio, e3, b3, gSharp4)
	feedGroup(g, 1, 2, e3, 0, gSharp4)
	r := g.readings()[1]
	if !r.InChord || r.Role != "fifth" || r.Holding {
		t.Errorf("the resting viola: %+v", r)
	}
	feedGroup(g, 2, 3, e3, 0, 0)
	feedGroup(g, 3, 3.5, 0, 0, 0)
	if rows := g.readings(); !rows[1].InChord || !rows[2].InChord || chordLine(g).Text() != "last chord E major" {
		t.Errorf("after all stopped: %+v\n%s", rows, chordLine(g).Text())
	}
}

// Eight players still fit 80 × 24: every row and the status stay; the
// spacing and the chord's line against just give way first.
func TestEightPlayersFit80x24(t *testing.T) {
	names := []string{"b2", "b1", "t2", "t1", "a2", "a1", "s2", "s1"}
	g := groupHolding(keyOf(t, "D major"), names, d3, d3, a3, a3, etFSharp4, etFSharp4, et(5), et(5))
	s := screenOf(g, 80, 24)
	for _, want := range []string{" 1 b2   D3", " 8 s1   D5", "chord D major", "input −20 dBFS", "1–8 row off/on"} {
		if !strings.Contains(s, want) {
			t.Errorf("no %q:\n%s", want, s)
		}
	}
}

// The chord's line against just: the centre is just, ±25 ¢ to the ends, so
// an equal-tempered third (13.69 ¢ wide, handbook) stands right of centre
// by 13.69/25 of the half-width, the fifth (1.96 ¢ narrow) just left of it.
func TestTheChordAxisPlacesEachMemberByItsJustCents(t *testing.T) {
	g := groupHolding(keyOf(t, "D major"), trio, d3, a3, etFSharp4)
	lines := chordAxis(g, 61) // an axis of 49 cells, centre at 24
	axis := []rune(strings.TrimSuffix(strings.TrimPrefix(lines[1].Text(), "flat "), " sharp"))
	half := len(axis) / 2
	for _, c := range []float64{0, etFifthOverJust, etThirdOverJust} {
		if at := half + int(math.Round(c/25*float64(half))); axis[at] != '◆' {
			t.Errorf("no ◆ at %+.2f ¢ (cell %d): %q", c, at, string(axis))
		}
	}
	if !strings.Contains(lines[2].Text()+lines[3].Text(), "F♯4") {
		t.Errorf("labels: %q", lines[2:])
	}
}

// A voice doubled an octave above (multipitch marks it; one microphone
// cannot part the two) says so at the end of its row, and the row still
// fits 80 columns; the mark follows most of the frames of the pitch held.
func TestADoubledVoiceIsMarkedOnItsRow(t *testing.T) {
	g := newGroupModel(newModel(keyOf(t, "E major"), "test tones"), []string{"voice 1", "voice 2", "voice 3"}, 0)
	for at := 0.0; at < 1; at += 0.01 {
		g.AddFrame(GroupFrame{Time: at, Hz: []float64{e3, b3, gSharp4}, Doubled: []bool{at < 0.8, false, false}, Level: -20})
	}
	rows := g.readings()
	if !rows[0].Doubled || rows[1].Doubled || rows[2].Doubled {
		t.Errorf("doubled %v %v %v, want the first row's alone", rows[0].Doubled, rows[1].Doubled, rows[2].Doubled)
	}
	for _, l := range strings.Split(screenOf(g, 80, 24), "\n") {
		if strings.Contains(l, "voice 1") && !strings.HasSuffix(strings.TrimRight(l, " "), "doubled") {
			t.Errorf("row %q does not end marked doubled", l)
		}
		if w := runewidth.StringWidth(l); w > 80 {
			t.Errorf("line %q is %d wide", l, w)
		}
	}
}

// On one microphone's voices (Options.Doubles) the strips keep their width
// whether or not a voice is doubled at the moment: the screen does not jump
// as a voice's octave comes and goes (the same E major chord as above).
func TestTheVoicesStripsKeepTheirWidthAsAVoiceIsDoubled(t *testing.T) {
	widths := map[int]bool{}
	for _, doubled := range []bool{false, true, false} {
		g := newGroupModel(newModel(keyOf(t, "E major"), "test tones"), []string{"voice 1", "voice 2", "voice 3"}, 0)
		g.Doubles = true
		for at := 0.0; at < 1; at += 0.01 {
			g.AddFrame(GroupFrame{Time: at, Hz: []float64{e3, b3, gSharp4}, Doubled: []bool{doubled, false, false}, Level: -20})
		}
		widths[columnsFor(g, 80).strip] = true
	}
	if len(widths) != 1 {
		t.Errorf("strip widths %v, want one width with a voice doubled or not", widths)
	}
}

// A chord with a seventh names the just its seventh is read against, since
// which seventh is just is a choice (--seventh: 16/9 unless chosen, 7/4 the
// harmonic seventh; common practice): G B D F in equal temperament (ISO 16,
// A4 = 440 Hz) reads its F +3.9 ¢ against 16/9 and +31.2 ¢ against 7/4
// (996.1 and 968.8 ¢ against 1000: common practice).
func TestAChordsSeventhSaysWhichJustItIsReadAgainst(t *testing.T) {
	et := func(semis float64) float64 { return 440 * math.Exp2(semis/12) }
	g3, b3, d4, f4 := et(-14), et(-10), et(-7), et(-4)
	for _, c := range []struct {
		seventh float64
		line    string
		cents   float64
	}{{0, "chord G dominant seventh · root G3 · seventh against 16/9", 3.9}, {7.0 / 4, "chord G dominant seventh · root G3 · seventh against 7/4", 31.2}} {
		g := newGroupModel(newModel(target.Default(), "test tones"), []string{"b", "t", "a", "s"}, c.seventh)
		feedGroup(g, 0, 1, g3, b3, d4, f4)
		if got := chordLine(g).Text(); got != c.line {
			t.Errorf("chord line %q, want %q", got, c.line)
		}
		if r := g.readings()[3]; r.Role != "seventh" || math.Abs(r.Just-c.cents) > 0.05 {
			t.Errorf("the seventh's row: %+v, want %+.1f ¢ from just", r, c.cents)
		}
	}
	// A triad has no seventh to name.
	g := groupHolding(target.Default(), trio, et(-14), et(-10), et(-7))
	if got := chordLine(g).Text(); got != "chord G major · root G3" {
		t.Errorf("triad: %q", got)
	}
}
