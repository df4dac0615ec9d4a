package main

import (
	"math"
	"path/filepath"
	"strings"
	"testing"
)

// listen --plain --players writes each note as analyze writes it from the
// same take: a note sounding in a chord spelled from the chord's root (G♯4
// as the third of E major in F major, interface contract, "Spelling
// window"), the same pitch alone from the key (A♭4), in the note rows and
// in the journal. The parts are E3, B3, G♯4 and E4 at their ¼-comma
// meantone targets at A4 = 415 Hz (meantoneHz: the published definition
// from the fifth), then the G♯4 alone, through a four-channel null sink of the test's own. Its
// cents: 0 against G♯4's target; −41.06 ¢ against A♭4's, the lesser
// diesis 128/125 that ¼-comma meantone puts between them (its pure major
// thirds: common practice).
func TestListenPlainSpellsNotesFromTheirChordAsAnalyzeDoes(t *testing.T) {
	t.Parallel()
	multi, _ := meantoneThird(t)
	musical := []string{"--key", "F major", "--temperament", "meantone:1/4", "--a4", "415", "--players", "vc,vla,vl2,vl1"}
	code, out, stderr := runCLI(t, append(append([]string{"analyze"}, musical...), multi)...)
	if code != 0 {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	_, file := readCSV(t, out)
	journal := filepath.Join(t.TempDir(), "journal.csv")
	live := playQuartetLive(t, multi, append(musical, "--log", journal)...)
	_, rows := readCSV(t, live)
	if len(rows) != len(file) {
		t.Fatalf("%d rows live, %d from the file:\n%s\n%s", len(rows), len(file), live, out)
	}
	worst := 0.0
	for _, f := range file {
		var r map[string]string
		for _, l := range rows {
			if l["player"] == f["player"] && math.Abs(parseF(l["start_s"])-parseF(f["start_s"])) < 0.2 {
				r = l
			}
		}
		if r == nil || r["note"] != f["note"] || r["alt_note"] != f["alt_note"] || r["on_other_spelling"] != f["on_other_spelling"] {
			t.Errorf("%s's note at %s s: live %v, from the file %v", f["player"], f["start_s"], r, f)
			continue
		}
		// The sink carries the take's samples unchanged, so the cents agree
		// to the column's 0.01 ¢ (measured: 0.000 ¢ apart); each row's own
		// cents are exact against its spelling.
		worst = max(worst, math.Abs(parseF(r["cents"])-parseF(f["cents"])))
		if own := 1200 * math.Log2(parseF(r["hz"])/parseF(r["target_hz"])); math.Abs(own-parseF(r["cents"])) > 0.01 {
			t.Errorf("%s's %s: %s ¢ written, 1200·log2(hz/target_hz) = %.3f ¢", r["player"], r["note"], r["cents"], own)
		}
	}
	t.Logf("cents live against the file: at most %.3f ¢ apart", worst)
	if worst > 0.01 {
		t.Errorf("live cents up to %.3f ¢ from the file's", worst)
	}
	var third []string
	for _, r := range rows {
		if r["player"] == "vl2" {
			third = append(third, r["note"]+" "+r["cents"])
			want := map[string]float64{"G#4": 0, "Ab4": -41.06}[r["note"]]
			if math.Abs(parseF(r["cents"])-want) > 0.5 {
				t.Errorf("vl2's %s at %s ¢, want %+.2f ¢", r["note"], r["cents"], want)
			}
		}
	}
	if len(third) != 2 || !strings.HasPrefix(third[0], "G#4 ") || !strings.HasPrefix(third[1], "Ab4 ") {
		t.Errorf("vl2 live: %v, want G#4 (the third of E major) then Ab4 (alone)", third)
	}
	data, logged := readCSVFile(t, journal)
	var notes []string
	for _, r := range logged {
		if r["player"] == "vl2" {
			notes = append(notes, r["note"]+"@"+r["channel"])
		}
	}
	if strings.Join(notes, ",") != "G#4@3,Ab4@3" {
		t.Errorf("journal has vl2's %v, want G#4 then Ab4 on channel 3\n%s", notes, data)
	}
}

// meantoneThird is the take of TestListenPlainSpellsNotesFromTheirChordAsAnalyzeDoes,
// one part a channel and the parts summed on one.
func meantoneThird(t *testing.T) (multi, mono string) {
	gs4 := meantoneHz(5, -3)
	return soxParts(t, [][]soxNote{
		{{meantoneHz(1, -2), 0.2, 1.5, 1.6}},
		{{meantoneHz(2, -2), 0.2, 1.5, 1.6}},
		{{gs4, 0.2, 1.5, 0.2}, {gs4, 0.2, 1.0, 0.2}},
		{{meantoneHz(1, -1), 0.2, 1.5, 1.6}},
	})
}

// The same with one microphone: listen --plain --voices auto writes the
// G♯4 in the chord and the A♭4 alone as analyze --voices auto writes them
// from the same sum (the parts of meantoneThird), through a null sink of
// the test's own.
func TestListenPlainVoicesSpellNotesFromTheirChordAsAnalyzeDoes(t *testing.T) {
	t.Parallel()
	_, mono := meantoneThird(t)
	musical := []string{"--key", "F major", "--temperament", "meantone:1/4", "--a4", "415", "--voices", "auto"}
	code, out, stderr := runCLI(t, append(append([]string{"analyze"}, musical...), mono)...)
	if code != 0 {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	_, env, play := privateMic(t)
	wait, proc := startPlainProcess(t, env, append(musical, "--duration", "60s")...)
	play(mono)
	live := interruptPlain(t, proc, wait)
	_, rows := readCSV(t, live)
	third := func(rows []map[string]string) (notes []string, cents []float64) {
		for _, r := range rows {
			if hz := parseF(r["hz"]); hz > 380 && hz < 395 { // G♯4 at A4 = 415 Hz: 387.86 Hz
				notes, cents = append(notes, r["note"]), append(cents, parseF(r["cents"]))
			}
		}
		return notes, cents
	}
	gotNotes, gotCents := third(rows)
	wantNotes, wantCents := third(readRows(t, out))
	if strings.Join(gotNotes, ",") != "G#4,Ab4" || strings.Join(wantNotes, ",") != "G#4,Ab4" {
		t.Fatalf("the G#4's rows live %v, from the file %v, want G#4 (in E major) then Ab4 (alone):\n%s\n%s", gotNotes, wantNotes, live, out)
	}
	// In the chord, the same cents to 0.01 ¢; alone, the lesser diesis
	// below A♭4's target (−41.06 ¢) within 0.5 ¢ both ways (measured: the
	// note alone reads 0.13 ¢ apart live and from the file, the voices
	// tracked on another frame grid).
	for i := range gotCents {
		t.Logf("%s: %+.3f ¢ live, %+.3f ¢ from the file", gotNotes[i], gotCents[i], wantCents[i])
	}
	if math.Abs(gotCents[0]-wantCents[0]) > 0.01 || math.Abs(gotCents[1]+41.06) > 0.5 || math.Abs(wantCents[1]+41.06) > 0.5 {
		t.Errorf("G#4 %+.2f ¢ live, %+.2f ¢ from the file; Ab4 %+.2f and %+.2f ¢, want −41.06 ¢", gotCents[0], wantCents[0], gotCents[1], wantCents[1])
	}
}

func readRows(t *testing.T, csv string) []map[string]string {
	t.Helper()
	_, rows := readCSV(t, csv)
	return rows
}

// A pedal: the bass holds C3 while the voices above play four chords.
// listen --plain --players --chords writes each chord as analyze writes it
// from the same take (each member read over the chord's own stretch), and
// the journal shows when: the first three chords' memberships come before
// the pedal's own note row, which is written as the pedal ends (the order
// of rows, not a clock, so the verdict holds on a busy machine). Sawtooth
// parts that sox synthesises at their equal-tempered pitches (A4 = 440 Hz,
// ISO 16), through a four-channel null sink of the test's own: the bass
// enters 0.3 s before the others, who play C major (E3 G3 C4), F major
// (F3 A3 C4), C major (G3 C4 E4) and C dominant seventh (E3 G3 B♭3).
func TestListenPlainGivesTheChordsAboveAPedalAsTheyEnd(t *testing.T) {
	t.Parallel()
	parts := append([][]soxNote{{{130.8128, 0.2, 8.2, 1.0}}}, overPedal([][]float64{
		{164.8138, 174.6141, 195.9977, 164.8138}, // E3 F3 G3 E3
		{195.9977, 220.0000, 261.6256, 195.9977}, // G3 A3 C4 G3
		{261.6256, 261.6256, 329.6276, 233.0819}, // C4 C4 E4 B♭3
	}, 1.6)...)
	multi, _ := soxParts(t, parts)
	musical := []string{"--key", "C major", "--temperament", "equal", "--a4", "440", "--players", "b,t,a,s", "--chords"}
	code, out, stderr := runCLI(t, append(append([]string{"analyze"}, musical...), multi)...)
	if code != 0 {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	journal := filepath.Join(t.TempDir(), "journal.csv")
	live := playQuartetLive(t, multi, append(musical, "--log", journal)...)
	// The same chords, members, spellings and players; the same cents to
	// within 0.05 ¢ (measured: up to 0.02 ¢ apart, where the note rows of
	// TestListenPlainSpellsNotesFromTheirChordAsAnalyzeDoes agree to
	// 0.000 ¢: analyze learns the bleed before reading, listening as it
	// reads).
	sameChordRows(t, live, out, []string{"player"}, 16, 0.05)
	data, logged := readCSVFile(t, journal)
	before := map[string]bool{} // chords (by start) whose memberships came before the pedal's row
	for _, r := range logged {
		if r["player"] == "b" && r["heard_chord"] == "" {
			break
		}
		if r["heard_chord"] != "" {
			before[r["start_s"]] = true
		}
	}
	if len(before) < 3 {
		t.Errorf("%d chords journaled before the pedal's note, want the first three:\n%s", len(before), data)
	}
}
