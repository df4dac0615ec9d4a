package main

import (
	"math"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"fifthline/ensemble"
	"fifthline/report"
)

// A quartet of our own writing (C, F, G and A minor, twice over, in C
// major) whose chords stay just while the whole group sags 10 ¢ over the
// take, as a choir does over a movement. Equal-tempered frequencies at
// A4 = 440 Hz (ISO 16: 440·2^((m−69)/12) for MIDI key m); just ratios 3/2,
// 5/4, 6/5 and octaves above the root (common practice); each note a sweep
// along the sag (sox synth's ':' sweep, linear in hertz, sox(1): over a
// note's 1.3 ¢ it differs from the sag's exponential by under 0.001 ¢).
// No bleed: this is about the drift.
type driftVoice struct {
	key   int     // the spelled note's MIDI key, for its equal-tempered target
	ratio float64 // above the chord's root
}

type driftChord struct {
	root   int // MIDI key of the root, sounding in the cello
	voices [4]driftVoice
}

var driftChords = []driftChord{
	{48, [4]driftVoice{{48, 1}, {55, 1.5}, {64, 2.5}, {72, 4}}}, // C major: C3 G3 E4 C5
	{41, [4]driftVoice{{41, 1}, {60, 3}, {65, 4}, {69, 5}}},     // F major: F2 C4 F4 A4
	{43, [4]driftVoice{{43, 1}, {62, 3}, {67, 4}, {71, 5}}},     // G major: G2 D4 G4 B4
	{45, [4]driftVoice{{45, 1}, {64, 3}, {69, 4}, {72, 4.8}}},   // A minor: A2 E4 A4 C5
}

const (
	driftChordSeconds = 2.0  // each chord, then
	driftGap          = 0.15 // silence before the next
	driftTakeSeconds  = 16.0
	driftSag          = -10.0 // cents over the take
)

// sagAt is the group's pitch, in cents, at t seconds.
func sagAt(t float64) float64 { return driftSag * t / driftTakeSeconds }

// justOffset is where a just member lies against its own equal-tempered
// target, in cents: 0 for roots, −13.69 for a major third, +15.64 for a
// minor third, +1.96 for a fifth.
func justOffset(c driftChord, v driftVoice) float64 {
	return 1200 * math.Log2(equalHz(c.root)*v.ratio/equalHz(v.key))
}

// soxSaggingQuartet renders the take, one part per channel.
func soxSaggingQuartet(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	run := func(args ...string) {
		if out, err := exec.Command("sox", args...).CombinedOutput(); err != nil {
			t.Fatalf("sox %v: %v\n%s", args, err, out)
		}
	}
	f := func(x float64) string { return strconv.FormatFloat(x, 'f', 4, 64) }
	var parts []string
	for p := range 4 {
		var notes []string
		for k := range int(driftTakeSeconds / driftChordSeconds) {
			c := driftChords[k%len(driftChords)]
			start, held := float64(k)*driftChordSeconds, driftChordSeconds-driftGap
			hz := equalHz(c.root) * c.voices[p].ratio
			from, to := hz*math.Exp2(sagAt(start)/1200), hz*math.Exp2(sagAt(start+held)/1200)
			n := filepath.Join(dir, "p"+strconv.Itoa(p)+"n"+strconv.Itoa(k)+".wav")
			run("-n", "-r", "48000", "-b", "24", n, "synth", f(held), "sawtooth", f(from)+":"+f(to),
				"fade", "0.02", f(held), "0.02", "vol", "0.2", "pad", "0", f(driftGap))
			notes = append(notes, n)
		}
		part := filepath.Join(dir, "part"+strconv.Itoa(p)+".wav")
		run(append(notes, part)...)
		parts = append(parts, part)
	}
	out := filepath.Join(dir, "sagging.wav")
	run(append(append([]string{"-M"}, parts...), out)...)
	return out
}

// chordAt is the chord sounding at t seconds and the voice playing key.
func chordAt(t float64, player int) (driftChord, driftVoice) {
	c := driftChords[int(t/driftChordSeconds)%len(driftChords)]
	return c, c.voices[player]
}

var quartetPlayers = map[string]int{"vc": 0, "vla": 1, "vl2": 2, "vl1": 3}

// The group's drift follows the sag within 1 ¢ at every note while the
// chords read just within 1.5 ¢; with --reference group each note's cents
// are against the moved reference, so only the chords' own just tuning
// remains in them (within 1 ¢), and the column says how far it moved.
func TestGroupDriftFollowsTheSagApartFromTheChords(t *testing.T) {
	t.Parallel()
	take := soxSaggingQuartet(t)
	tableSummary(t, take)
	log := filepath.Join(t.TempDir(), "rehearsal.csv")
	for _, ref := range []string{"a4", "group"} {
		code, out, stderr := runLong(t, "analyze", "--players", "vc,vla,vl2,vl1", "--reference", ref, "--log", log, take)
		if code != 0 {
			t.Fatalf("--reference %s: exit %d: %s", ref, code, stderr)
		}
		_, rows := readCSV(t, out)
		worstDrift, worstCents := 0.0, 0.0
		if len(rows) != 32 {
			t.Errorf("--reference %s: %d notes, want 32:\n%s", ref, len(rows), out)
		}
		for _, r := range rows {
			start, _ := strconv.ParseFloat(r["start_s"], 64)
			end, _ := strconv.ParseFloat(r["end_s"], 64)
			cents, _ := strconv.ParseFloat(r["cents"], 64)
			drift, err := strconv.ParseFloat(r["group_drift_cents"], 64)
			mid := (start + end) / 2
			c, v := chordAt(mid, quartetPlayers[r["player"]])
			want := justOffset(c, v)
			if ref == "a4" {
				want += sagAt(mid)
			}
			worstDrift, worstCents = max(worstDrift, math.Abs(drift-sagAt(mid))), max(worstCents, math.Abs(cents-want))
			if err != nil || math.Abs(drift-sagAt(mid)) > 1 || math.Abs(cents-want) > 1 {
				t.Errorf("--reference %s: %s %s at %.2f s: drift %q, cents %+.2f; want drift %+.2f, cents %+.2f",
					ref, r["player"], r["note"], mid, r["group_drift_cents"], cents, sagAt(mid), want)
			}
		}
		t.Logf("--reference %s: drift within %.2f ¢ of the sag, cents within %.2f ¢", ref, worstDrift, worstCents)
	}
	code, out, stderr := runLong(t, "analyze", "--players", "vc,vla,vl2,vl1", "--chords", take)
	if code != 0 {
		t.Fatalf("--chords: exit %d: %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	worst := 0.0
	for _, r := range rows {
		just, _ := strconv.ParseFloat(r["just_cents"], 64)
		worst = max(worst, math.Abs(just))
		if math.Abs(just) > 1.5 {
			t.Errorf("%s %s %s: %+.2f ¢ from just", r["start_s"], r["chord"], r["member"], just)
		}
	}
	t.Logf("chord members within %.2f ¢ of just", worst)
	if len(rows) != 32 {
		t.Errorf("%d chord members, want 32:\n%s", len(rows), out)
	}
	reportedDrift(t, log)
}

// reportedDrift: report reads the same drift back from the journal the two
// analyses wrote (two takes, as two sessions), apart from the per-note
// tables: a group_drift row per take in the CSV, under the report's own
// header, its drift_cents the sag between the first and the last chords'
// middles within 0.5 ¢, its anchor the notes' own (a4: read in the
// default temperament), and a line per take in the text.
func reportedDrift(t *testing.T, log string) {
	t.Helper()
	held := driftChordSeconds - driftGap
	want := sagAt(driftTakeSeconds-driftChordSeconds+held/2) - sagAt(held/2)
	code, out, stderr := runCLI(t, "report", "--format", "csv", log)
	if code != 0 {
		t.Fatalf("report: exit %d: %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	if strings.Join(header, ",") != strings.Join(report.CSVHeader(report.Options{}), ",") {
		t.Errorf("report header %v", header)
	}
	takes := 0
	for _, r := range rows {
		if r["level"] != report.GroupLevel {
			continue
		}
		takes++
		d, err := strconv.ParseFloat(r["drift_cents"], 64)
		if err != nil || math.Abs(d-want) > 0.5 || r["player"] != "vc+vla+vl2+vl1" || r["count"] != "32" || r["anchor"] != "a4" {
			t.Errorf("group row %v: want drift %+.2f ¢ over 32 notes", r, want)
		}
	}
	if takes != 2 {
		t.Errorf("%d group rows, want one per take (2):\n%s", takes, out)
	}
	code, out, stderr = runCLI(t, "report", log)
	if code != 0 || strings.Count(out, "(vc vla vl2 vl1): group drift") != 2 {
		t.Errorf("report: exit %d (%s), want a group line per take:\n%s", code, stderr, out)
	}
}

// tableSummary: the table's last line states the group's drift over the
// take, start to end, apart from how the chords were tuned inside (just:
// 0 ¢, within 0.5 ¢). A note's pitch is its mean, so the take's ends are
// where the sag was at the first and the last chords' middles, within
// 0.5 ¢.
func tableSummary(t *testing.T, take string) {
	t.Helper()
	code, out, stderr := runLong(t, "analyze", "--players", "vc,vla,vl2,vl1", "--format", "table", take)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	last := lines[len(lines)-1]
	m := regexp.MustCompile(`group drift ([\d.]+) ¢ flat → ([\d.]+) ¢ flat over \d+ s \(moved ([\d.]+) ¢ flat\); inside the chords, apart from it: thirds ([\d.]+) ¢, fifths ([\d.]+) ¢`).FindStringSubmatch(last)
	if m == nil || !strings.HasPrefix(last, take+": ") {
		t.Fatalf("last line %q", last)
	}
	val := func(i int) float64 { v, _ := strconv.ParseFloat(m[i], 64); return v }
	t.Log(last)
	held := driftChordSeconds - driftGap
	first, end := -sagAt(held/2), -sagAt(driftTakeSeconds-driftChordSeconds+held/2)
	if math.Abs(val(1)-first) > 0.5 || math.Abs(val(2)-end) > 0.5 || math.Abs(val(3)-(end-first)) > 0.5 || val(4) > 0.5 || val(5) > 0.5 {
		t.Errorf("summary %q: want %.1f → %.1f ¢ flat, chords just", last, first, end)
	}
}

// --reference needs --players and takes a4 or group: one line, exit 2.
func TestReferenceUsageErrors(t *testing.T) {
	take := sox(t, "stereo.wav", "-r", "48000", "-c", "2", "synth 1 sine 440")
	for _, args := range [][]string{
		{"--reference", "group", take},
		{"--players", "vc,vla", "--reference", "choir", take},
	} {
		code, out, stderr := runCLI(t, append([]string{"analyze"}, args...)...)
		checkError(t, code, 2, stderr)
		if out != "" {
			t.Errorf("%v: stdout %q", args, out)
		}
	}
}

// Live, through a four-channel interface (a PulseAudio null sink of this
// test's own, its monitor the input): listen --plain --players
// --reference group reads the group's drift as it goes, from the frames of
// the last DriftSeconds, so at a note's end it stands within 1 ¢ of where
// the sag was in the middle of those seconds (of all since the start, in
// the first); each note's cents, against the moved
// reference, keep the chord's just tuning and no more than 1.5 ¢ of the
// sag. start_s counts from the start of capture: the take's first note
// gives the offset.
func TestListenPlayersDriftLive(t *testing.T) {
	t.Parallel()
	out := playQuartetLive(t, soxSaggingQuartet(t), "--players", "vc,vla,vl2,vl1", "--reference", "group")
	_, rows := readCSV(t, out)
	if len(rows) < 28 {
		t.Fatalf("%d notes, want 32:\n%s", len(rows), out)
	}
	offset := math.Inf(1)
	for _, r := range rows {
		s, _ := strconv.ParseFloat(r["start_s"], 64)
		offset = math.Min(offset, s)
	}
	known, worstDrift, worstCents := 0, 0.0, 0.0
	for _, r := range rows {
		start, _ := strconv.ParseFloat(r["start_s"], 64)
		end, _ := strconv.ParseFloat(r["end_s"], 64)
		cents, _ := strconv.ParseFloat(r["cents"], 64)
		start, end = start-offset, end-offset
		c, v := chordAt((start+end)/2, quartetPlayers[r["player"]])
		drift, err := strconv.ParseFloat(r["group_drift_cents"], 64)
		if err != nil {
			continue // not known yet: the first chord
		}
		known++
		lagged := sagAt(end - math.Min(end, ensemble.DriftSeconds)/2)
		dd, dc := math.Abs(drift-lagged), math.Abs(cents-justOffset(c, v))
		worstDrift, worstCents = max(worstDrift, dd), max(worstCents, dc)
		if dd > 1 || dc > 1.5 {
			t.Errorf("%s %s at %.2f–%.2f s: drift %+.2f ¢, cents %+.2f; want drift %+.2f, cents %+.2f",
				r["player"], r["note"], start, end, drift, cents, lagged, justOffset(c, v))
		}
	}
	t.Logf("live: %d notes with a drift, within %.2f ¢ of the sag; cents within %.2f ¢ of the chords' just tuning", known, worstDrift, worstCents)
	if known < len(rows)-4 {
		t.Errorf("a drift with %d of %d notes, want all but the first chord's", known, len(rows))
	}
}
