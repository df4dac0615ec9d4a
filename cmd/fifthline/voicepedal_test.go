package main

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"fifthline/capture"
	"fifthline/harmony"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// voicePedalTake is one microphone's take of a pedal: C3 held 7.4 s from
// 0.2 s while two voices above it play three chords of 1.6 s, 0.4 s apart,
// from 0.5 s: C major (E3 G3), F major (F3 A3) and C major again (G3 E4),
// the pedal going on 1.5 s past the last. Sawtooths sox synthesises at
// their equal-tempered pitches (A4 = 440 Hz, ISO 16: 440·2^(n/12)), summed
// onto one channel; our own scenario.
func voicePedalTake(t *testing.T) (mono string) {
	t.Helper()
	parts := append([][]soxNote{{{130.8128, 0.2, 7.4, 0.6}}}, overPedal([][]float64{ // C3 under
		{164.8138, 174.6141, 195.9977}, // E3 F3 G3
		{195.9977, 220.0000, 329.6276}, // G3 A3 E4
	}, 2.1)...)
	_, mono = soxParts(t, parts)
	return mono
}

// overPedal are the parts above a pedal: each part's notes (Hz) of 1.6 s,
// the first from 0.5 s, the others 0.4 s after the one before, tail
// seconds of silence after the last.
func overPedal(upper [][]float64, tail float64) [][]soxNote {
	var parts [][]soxNote
	for _, p := range upper {
		var part []soxNote
		for k, hz := range p {
			before, after := 0.4, 0.0
			if k == 0 {
				before = 0.5
			}
			if k == len(p)-1 {
				after = tail
			}
			part = append(part, soxNote{hz, before, 1.6, after})
		}
		parts = append(parts, part)
	}
	return parts
}

// pedalArgs are the flags both readings of the take share.
var pedalArgs = []string{"--key", "C major", "--temperament", "equal", "--a4", "440", "--voices", "auto", "--chords"}

// The listening path (hearVoices into liveChords, as listen --plain
// --voices --chords runs it), fed the take's file: each chord above the
// pedal is given as it ends, before the next chord's note rows and the
// pedal's own (the order of what is given, and the stream's time, not a
// clock), and the chord rows are analyze's of the same file, to the last
// digit: the same frames, each member read over its chord's own stretch.
func TestListeningGivesTheChordsAboveAHeldVoiceAsTheyEnd(t *testing.T) {
	t.Parallel()
	mono := voicePedalTake(t)
	out, file := analyzeRecords(t, mono, true)
	heard := listenToFile(t, mono, true)
	if len(file) != 9 || !slices.Equal(heard.chordRows, file) {
		t.Errorf("chord rows listening:\n%s\nfrom the file (want 9, three chords of three):\n%s", strings.Join(heard.chordRows, "\n"), out)
	}
	// Each chord before the next chord's notes and the pedal's.
	if got := pedalOrder(heard.given); got != pedalWant {
		t.Errorf("given in the order %s, want %s: %v", got, pedalWant, heard.given)
	}
	// As each ends: within Reach (a voice lost for a moment may be heard
	// again until then) and a few looks of the stream after its end, long
	// before the pedal's (7.6 s). Measured: 1.1 to 1.2 s after; 7.85 s,
	// all three, before the voices told the stream their sounding notes.
	var chordsAt []float64
	for i, g := range heard.given {
		if g == "chord" {
			chordsAt = append(chordsAt, heard.at[i])
		}
	}
	t.Logf("chords given at %.2f s of the stream", chordsAt)
	for i, at := range chordsAt {
		if end := parseF(strings.Split(file[3*i], ",")[1]); at > end+lostSeconds+0.5 {
			t.Errorf("chord %d, ending at %.2f s, given at %.2f s", i+1, end, at)
		}
	}
}

// Without --chords the note rows come as the chords they sound in are
// given, not when the pedal ends, each as analyze --voices writes it from
// the same file (spelled from its chord), the pedal's last; the pedal is
// read from its pitch so far, as the chords are without their frames.
func TestListeningGivesTheNotesAboveAHeldVoiceAsTheyEnd(t *testing.T) {
	t.Parallel()
	mono := voicePedalTake(t)
	out, file := analyzeRecords(t, mono, false)
	heard := listenToFile(t, mono, false)
	if len(file) != 7 || !slices.Equal(slices.Sorted(slices.Values(heard.noteRows)), slices.Sorted(slices.Values(file))) {
		t.Errorf("note rows listening:\n%s\nfrom the file (want 7):\n%s", strings.Join(heard.noteRows, "\n"), out)
	}
	if got := pedalOrder(heard.given); got != "0011223" {
		t.Errorf("given in the order %s, want 0011223: %v", got, heard.given)
	}
	t.Logf("notes given at %.2f s of the stream", heard.at)
	for i, row := range heard.noteRows[:len(heard.noteRows)-1] {
		if end := parseF(strings.Split(row, ",")[1]); heard.at[i] > end+lostSeconds+0.5 {
			t.Errorf("%s, ending at %.2f s, given at %.2f s", heard.given[i], end, heard.at[i])
		}
	}
}

// analyzeRecords is analyze --voices auto of the take in pedalArgs' tuning
// (with --chords if chords): its output, and its rows as CSV records.
func analyzeRecords(t *testing.T, path string, chords bool) (out string, records []string) {
	t.Helper()
	args := pedalArgs
	if !chords {
		args = slices.DeleteFunc(slices.Clone(args), func(a string) bool { return a == "--chords" })
	}
	code, out, stderr := runCLI(t, append(append([]string{"analyze"}, args...), path)...)
	if code != 0 {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	records = strings.Split(strings.TrimSpace(out), "\n")[1:]
	for i := range records {
		records[i] = strings.TrimSpace(records[i])
	}
	return out, records
}

// heardFile is what the listening path gave, reading a file.
type heardFile struct {
	given               []string  // "chord" or "note N voice V", in the order given
	at                  []float64 // the stream's time each was given at
	chordRows, noteRows []string  // as CSV records
}

// listenToFile runs the listening path of listen --plain --voices auto
// (with --chords if chords) over a file, in the key of C major, equal
// temperament, A4 = 440 Hz.
func listenToFile(t *testing.T, path string, chords bool) heardFile {
	t.Helper()
	var h heardFile
	var now float64 // the stream's time, the latest frame's
	vo := voiceOptions{max: 4, chords: chords, seventh: target.DefaultSeventh}
	var emit func(harmony.Chord, []int, []bool, target.Tuning) error
	if chords {
		emit = func(c harmony.Chord, voices []int, doubled []bool, _ target.Tuning) error {
			h.given, h.at = append(h.given, "chord"), append(h.at, now)
			for _, r := range voiceChordRows(c, voices, doubled) {
				h.chordRows = append(h.chordRows, strings.Join(r.record(false), ","))
			}
			return nil
		}
	}
	live := vo.liveChords(session.NewTunings(target.Default()), emit, func(n voiceNote) error {
		h.given, h.at = append(h.given, "note "+n.Reading.Note.String()+" voice "+strconv.Itoa(n.voice)), append(h.at, now)
		h.noteRows = append(h.noteRows, strings.Join(n.record(false), ","))
		return nil
	})
	moment := vo.onMoment
	vo.onMoment = func(at, earliest float64, open []openVoice) {
		now = at
		moment(at, earliest, open)
	}
	w, err := capture.OpenWAVChannel(path, 1)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	if err := hearVoices(context.Background(), w, path, fixed(target.Default()), vo, func(float64) {}, live.note); err != nil {
		t.Fatal(err)
	}
	now = math.Inf(1)
	if err := live.ready(math.Inf(1), math.Inf(1), nil); err != nil {
		t.Fatal(err)
	}
	return h
}

// pedalWant is the order of the take's note rows and chords as each chord
// is given as it ends: two notes (one voice's digit each), then their
// chord (c), three times, and last the pedal.
const pedalWant = "00c11c22c3"

// pedalOrder writes what was given as pedalWant writes it: each row of the
// take's notes as the number of its chord (3: the pedal, ? for any other),
// a chord as c; a chord's several memberships written in a row are one c.
func pedalOrder(given []string) string {
	group := map[string]byte{"note E3 voice 2": '0', "note G3 voice 3": '0', "note F3 voice 2": '1', "note A3 voice 3": '1',
		"note G3 voice 2": '2', "note E4 voice 3": '2', "note C3 voice 1": '3'}
	var b strings.Builder
	for i, g := range given {
		switch {
		case g == "chord" && (i == 0 || given[i-1] != "chord"):
			b.WriteByte('c')
		case g == "chord":
		case group[g] != 0:
			b.WriteByte(group[g])
		default:
			b.WriteByte('?')
		}
	}
	return b.String()
}

// The same through a one-channel null sink of the test's own, listen
// --plain --voices auto --chords: the chord rows are analyze's, the same
// chords, members, spellings and voices, the cents within 0.5 ¢ (the
// voices tracked on another frame grid: TestListenPlainVoicesSpellNotesFromTheirChordAsAnalyzeDoes),
// and the journal has each chord's memberships before the next chord's
// note rows and the pedal's.
func TestListenPlainVoicesGiveTheChordsAboveAPedalAsTheyEnd(t *testing.T) {
	t.Parallel()
	mono := voicePedalTake(t)
	out, _ := analyzeRecords(t, mono, true)
	journal := filepath.Join(t.TempDir(), "journal.csv")
	_, env, play := privateMic(t)
	wait, proc := startPlainProcess(t, env, append(pedalArgs, "--log", journal, "--duration", "60s")...)
	play(mono)
	live := interruptPlain(t, proc, wait)
	sameChordRows(t, live, out, []string{"voice", "doubled"}, 9, 0.5)
	data, err := os.ReadFile(journal)
	if err != nil {
		t.Fatal(err)
	}
	var given []string
	for _, r := range readRows(t, string(data)) {
		if r["heard_chord"] != "" {
			given = append(given, "chord")
		} else {
			given = append(given, "note "+r["note"]+" voice "+r["voice"])
		}
	}
	if got := pedalOrder(given); got != pedalWant {
		t.Errorf("journaled in the order %s, want %s:\n%s", got, pedalWant, data)
	}
}

// A voice lost for a moment under a pedal is bridged while the pedal still
// sounds, as the file analysis bridges it (bridgeLost: the pedal is the
// note that holds over the gap), and the chords come before the pedal
// ends. Our own scenario: C3 held 0–6 s; E4 over it 0.3–1.0 s and, lost
// for 0.5 s, 1.5–2.2 s; then G4 2.6–4.0 s. Equal temperament from A4 =
// 440 Hz (ISO 16); each note read at its Hz.
func TestLiveChordsBridgeAVoiceLostOverAPedal(t *testing.T) {
	tu := target.Default()
	const c3, pedalEnd = 130.8128, 6.0
	var notes []voiceNote
	for _, n := range []struct {
		voice        int
		hz, from, to float64
	}{{1, c3, 0, pedalEnd}, {2, 329.6276, 0.3, 1.0}, {2, 329.6276, 1.5, 2.2}, {2, 391.9954, 2.6, 4.0}} {
		notes = append(notes, voiceNote{Event: session.Event{Held: pitchdetect.Held{Start: n.from, End: n.to, Hz: n.hz}, Reading: tu.Classify(n.hz), Tuning: tu}, voice: n.voice})
	}
	var want []string
	for _, c := range chordsOf(slices.Clone(notes), tu, target.DefaultSeventh) {
		want = append(want, c.Name()+"@"+target.Decimal(c.Start, 2)+"–"+target.Decimal(c.End, 2))
	}
	var got []string
	var givenAt []float64
	var now float64
	vo := voiceOptions{chords: true, seventh: target.DefaultSeventh}
	live := vo.liveChords(session.NewTunings(tu), func(c harmony.Chord, _ []int, _ []bool, _ target.Tuning) error {
		got, givenAt = append(got, c.Name()+"@"+target.Decimal(c.Start, 2)+"–"+target.Decimal(c.End, 2)), append(givenAt, now)
		return nil
	}, func(voiceNote) error { return nil })
	added := make([]bool, len(notes))
	for step := 0; step <= 700; step++ {
		now = float64(step) / 100
		earliest := now
		var open []openVoice
		for k, n := range notes {
			switch {
			case !added[k] && n.End < now:
				live.note(n)
				added[k] = true
			case k == 0 && !added[k] && now >= n.Start+0.2: // sure by now
				open = append(open, openVoice{voice: 1, start: n.Start, through: now, hz: n.Hz})
			case !added[k] && n.Start <= now:
				earliest = min(earliest, n.Start)
			}
		}
		live.ready(now, earliest, open)
	}
	live.ready(math.Inf(1), math.Inf(1), nil)
	if len(want) != 2 || !slices.Equal(got, want) {
		t.Errorf("live %v, from the file %v (want 2: E4 bridged over its gap, then G4)", got, want)
	}
	t.Logf("chords given at %v s", givenAt)
	if len(givenAt) == 2 && givenAt[1] >= pedalEnd {
		t.Errorf("chords given at %v s, the pedal ending at %.1f s", givenAt, pedalEnd)
	}
}

// sameChordRows checks the chord rows written live against the file's of
// the same take: the same chords, members, spellings and whose (cols), in
// the same order, want of them; their cents and just_cents within tol.
func sameChordRows(t *testing.T, live, file string, cols []string, want int, tol float64) {
	t.Helper()
	key := func(r map[string]string) string {
		k := []string{r["chord"], r["member"], r["note"]}
		for _, c := range cols {
			k = append(k, r[c])
		}
		return strings.Join(k, " ")
	}
	got, from := readRows(t, live), readRows(t, file)
	if len(from) != want || !slices.EqualFunc(got, from, func(a, b map[string]string) bool { return key(a) == key(b) }) {
		t.Fatalf("chord rows live:\n%s\nfrom the file (want %d):\n%s", live, want, file)
	}
	worst := 0.0
	for i, f := range from {
		for _, col := range []string{"cents", "just_cents"} {
			worst = max(worst, math.Abs(parseF(got[i][col])-parseF(f[col])))
		}
	}
	t.Logf("cents and just_cents live against the file: at most %.3f ¢ apart", worst)
	if worst > tol {
		t.Errorf("live readings up to %.3f ¢ from the file's:\n%s\n%s", worst, live, file)
	}
}
